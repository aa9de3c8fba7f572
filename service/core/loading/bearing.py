"""The concentrated transverse forces a member's webs and walls bear: its point forces and
its support reactions (contract: ``requirements.bearing_length``).

Each load case reduces to four numbers (:class:`BearingForces`), checked by
:mod:`service.core.sizing.checks.bearing`:

- ``force``: the largest point force (a ``force`` action, or an attached mass's weight m g),
  N, and ``offset``, the smallest distance from any point force to the nearer end of the
  member, m. Taking the largest force at the smallest offset together can only overstate a
  combination (on the safe side); for a single point load, as in every shorthand case, it is
  exact.
- ``reaction``: the largest support reaction, N (every support here is at an end of the
  member: ``service.core.loading.actions.SUPPORTS``), from the exact statics of
  :func:`service.core.loading.internal.left_end_unknowns` (R_0 at x = 0, and R_L = the total
  load - R_0 at x = L). A cantilever's fixed end counts as a bearing at its end (its built-in
  connection is taken as a seat: the safe reading).
- ``unit_reaction``: the same under a uniform 1 N/m over the span, m (the self-weight m' g
  adds m' g x this to ``reaction``; adding the two largest, maybe at different supports,
  again errs on the safe side).

Distributed loads add to the reactions only. Forces are taken by magnitude (a reversed or
upward force bears on the other flange alike).
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np

from service.core.loading.actions import (
    Action,
    attached_weight,
    combine,
    member_loading,
    uniform_load,
)
from service.core.loading.internal import left_end_unknowns


@dataclass(frozen=True)
class BearingForces:
    """The concentrated transverse forces of one load case (see the module doc).

    Attributes:
        force: the largest point force, N (0 for none).
        offset: the smallest distance from a point force to the nearer end, m (``inf`` for
            none).
        reaction: the largest support reaction, N.
        unit_reaction: the largest support reaction of 1 N/m over the span, m.
    """

    force: float
    offset: float
    reaction: float
    unit_reaction: float


NO_FORCES = BearingForces(0.0, float("inf"), 0.0, 0.0)
"""A case with no transverse force (torsion, ties, columns)."""


def largest_reaction(loading) -> np.ndarray:
    """The largest |support reaction| of each case of a :class:`MemberLoading`, N (cases,)."""
    reaction = left_end_unknowns(loading)[0]
    if loading.supports == "cantilever":
        return np.abs(reaction)
    total = loading.force_value.sum(axis=1) + (
        loading.distributed_value * (loading.distributed_end - loading.distributed_start)
    ).sum(axis=1)
    return np.maximum(np.abs(reaction), np.abs(total - reaction))


def bearing_forces(supports: str, span: float, actions: Sequence[Action]) -> BearingForces:
    """The :class:`BearingForces` of one member of ``span`` (m) on ``supports`` under
    ``actions`` (SI, :class:`~service.core.loading.actions.Action`)."""
    loading = member_loading(supports, [span], [list(actions)])
    loading = combine(loading, attached_weight(loading))
    forces = np.abs(loading.force_value[0])
    present = forces > 0.0
    force = float(forces.max(initial=0.0))
    at = loading.force_at[0][present]
    offset = float(np.minimum(at, span - at).min(initial=np.inf))
    unit = uniform_load(supports, [span], 1.0)
    return BearingForces(force, max(offset, 0.0), float(largest_reaction(loading)[0]),
                         float(largest_reaction(unit)[0]))
