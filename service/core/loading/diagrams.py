"""The diagrams of a member sampled for output (the contract's ``diagrams`` of a design).

``x`` holds ``count`` even stations plus every breakpoint twice (the limits from the left and
from the right), so a line drawn through the points shows each jump of the shear or the
torque as a vertical step (:func:`service.core.loading.internal.diagram_stations`).
Self-weight (a uniform q = m' g per design) and the flexural rigidity E I of each design
broadcast against the case axis, as in :func:`service.core.loading.critical
.critical_sections`.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from service.core.loading.actions import MemberLoading, uniform_load
from service.core.loading.internal import diagram_stations, internal_actions


@dataclass(frozen=True)
class Diagrams:
    """Lines along the member, every field (..., cases, stations), contract names and SI.

    Attributes:
        x: station positions, m.
        shear: V, N. moment: M, N m (sagging positive). torque: T, N m.
        axial: N, N (positive tension). deflection: y, m (positive down).
    """

    x: np.ndarray
    shear: np.ndarray
    moment: np.ndarray
    torque: np.ndarray
    axial: np.ndarray
    deflection: np.ndarray


def diagrams(loading: MemberLoading, flexural_rigidity, uniform=0.0, count: int = 101,
             shear_flexibility=0.0) -> Diagrams:
    """The sampled diagrams of every case (and design).

    Args:
        loading: the cases.
        flexural_rigidity: E I, N m^2, broadcasting against (cases,).
        uniform: an extra uniform load over the whole span, N/m (self-weight m' g),
            broadcasting against (cases,).
        count: even stations per member (the breakpoints come on top).
        shear_flexibility: E I / S, m^2, of sandwich members: the deflection then includes
            its shear part, as :func:`service.core.loading.segments.deflection_at`.
    """
    x, from_left = diagram_stations(loading, count)
    applied = internal_actions(loading, x, from_left)
    unit = internal_actions(uniform_load(loading.supports, loading.span, 1.0), x, from_left)
    q = np.asarray(uniform, dtype=float)[..., None]
    rigidity = np.asarray(flexural_rigidity, dtype=float)[..., None]
    phi = np.asarray(shear_flexibility, dtype=float)[..., None]
    shape = np.broadcast_shapes(q.shape, rigidity.shape, phi.shape, x.shape)
    moment = applied.moment + q * unit.moment
    # shear line M(x) - M(0) - c x; the stations start at x = 0 and end at x = L
    chord = 0.0 if loading.supports == "cantilever" else (
        (moment[..., -1:] - moment[..., :1]) / loading.span[:, None])
    shear_line = moment - moment[..., :1] - chord * x
    return Diagrams(
        x=np.broadcast_to(x, shape),
        shear=np.broadcast_to(applied.shear + q * unit.shear, shape),
        moment=np.broadcast_to(moment, shape),
        torque=np.broadcast_to(applied.torque, shape),
        axial=np.broadcast_to(applied.axial, shape),
        deflection=np.broadcast_to((applied.deflection_times_stiffness
                                    + q * unit.deflection_times_stiffness
                                    + phi * shear_line) / rigidity, shape),
    )
