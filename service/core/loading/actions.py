"""The loading of a general member, for many cases at once, as padded numpy arrays.

A member of span L (m) lies along x in [0, L]. Its ``supports`` are one of :data:`SUPPORTS`:

- ``cantilever``: fixed at x = 0, free at x = L;
- ``simply_supported``: pinned at both ends;
- ``fixed_fixed``: fixed at both ends;
- ``propped_cantilever``: fixed at x = 0, pinned at x = L.

Twist is restrained at every support (a cantilever at x = 0 only, the others at both ends),
as the contract says. ``twist_free_at_right_end`` releases the support at x = L in torsion:
a shaft in bearings, driven and held in torsion from x = 0 only (there a torque passes
whole between the points where it enters and leaves, which two restrained ends would share).

Actions (contract section "General member loading"), all SI:

- ``force``: transverse point force ``value`` (N, positive down) at ``at`` (m);
- ``distributed``: transverse load ``value`` (N/m, positive down) from ``start`` to ``end`` (m)
  (the contract's ``from`` and ``to``);
- ``torque``: point torque ``value`` (N m, about the member axis) at ``at``;
- ``axial``: axial force ``value`` (N, positive tension), the same along the whole member;
- ``mass``: non-structural point mass ``value`` (kg) at ``at``; it loads the member only
  through :func:`attached_weight` and the natural frequency.

Every action but ``mass`` may be ``steady``, ``reversed`` (fully reversed, amplitude = value)
or ``pulsating`` (from 0 to value); :func:`member_loading` builds the total, the mean or the
alternating part of the loading (:data:`CYCLIC_PARTS`).

Array shapes: ``span`` and ``axial`` are (cases,); every other field is (cases, n) with n the
largest count of that kind of action over the cases; shorter cases are padded with zero values
(at x = 0), which add nothing. One call holds one kind of supports; an engine groups its cases
by supports.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass, replace
from typing import Literal

import numpy as np

from service.core.loadcases import STANDARD_GRAVITY

SUPPORTS = ("cantilever", "simply_supported", "fixed_fixed", "propped_cantilever")
"""The support conditions of a general member (contract names)."""

Supports = Literal["cantilever", "simply_supported", "fixed_fixed", "propped_cantilever"]

ACTION_KINDS = ("force", "distributed", "torque", "axial", "mass")
"""The kinds of action (contract names)."""

CYCLIC_PARTS: dict[str, tuple[float, float]] = {
    # cyclic kind -> (mean, amplitude) as fractions of the action's value; a pulsating load
    # goes from 0 to value: mean value / 2, amplitude value / 2 (Shigley's Mechanical
    # Engineering Design, 10th ed., section 6-11, eq. 6-36: mean (max + min) / 2,
    # amplitude (max - min) / 2)
    "steady": (1.0, 0.0),
    "reversed": (0.0, 1.0),
    "pulsating": (0.5, 0.5),
}
"""Cyclic kind -> (mean fraction, amplitude fraction) of an action's value."""

Part = Literal["total", "mean", "alternating"]


@dataclass(frozen=True)
class Action:
    """One action on a member, in SI (see the module docstring for each kind).

    Attributes:
        kind: one of :data:`ACTION_KINDS`.
        value: N (force, axial), N/m (distributed), N m (torque) or kg (mass).
        at: position of a point action, m from x = 0; None for distributed and axial.
        start: start of a distributed load, m (the contract's ``from``); None otherwise.
        end: end of a distributed load, m (the contract's ``to``); None otherwise.
        cyclic: ``steady`` (default), ``reversed`` or ``pulsating``; ignored for masses.
    """

    kind: str
    value: float
    at: float | None = None
    start: float | None = None
    end: float | None = None
    cyclic: str = "steady"


@dataclass(frozen=True)
class MemberLoading:
    """The actions on many cases of one kind of supports, as padded arrays (SI).

    Attributes:
        supports: one of :data:`SUPPORTS`.
        span: L, m, shape (cases,).
        force_at: positions of point forces, m, (cases, n_force).
        force_value: point forces, N, positive down, (cases, n_force).
        distributed_start: starts of distributed loads, m, (cases, n_distributed).
        distributed_end: ends of distributed loads, m, (cases, n_distributed).
        distributed_value: intensities, N/m, positive down, (cases, n_distributed).
        torque_at: positions of point torques, m, (cases, n_torque).
        torque_value: point torques, N m, (cases, n_torque).
        axial: axial force, N, positive tension, (cases,).
        mass_at: positions of attached point masses, m, (cases, n_mass).
        mass_value: attached point masses, kg, (cases, n_mass).
        twist_free_at_right_end: True when the support at x = L does not restrain twist
            (see the module docstring); ignored for cantilevers.
    """

    supports: str
    span: np.ndarray
    force_at: np.ndarray
    force_value: np.ndarray
    distributed_start: np.ndarray
    distributed_end: np.ndarray
    distributed_value: np.ndarray
    torque_at: np.ndarray
    torque_value: np.ndarray
    axial: np.ndarray
    mass_at: np.ndarray
    mass_value: np.ndarray
    twist_free_at_right_end: bool = False

    @property
    def cases(self) -> int:
        """Number of cases (the leading axis)."""
        return self.span.shape[0]


def _padded(rows: list[list[float | None]]) -> np.ndarray:
    width = max((len(row) for row in rows), default=0)
    out = np.zeros((len(rows), width))
    for i, row in enumerate(rows):
        out[i, : len(row)] = row
    return out


def member_loading(
    supports: str,
    span: Sequence[float] | np.ndarray,
    actions: Sequence[Sequence[Action]],
    part: Part = "total",
    twist_free_at_right_end: bool = False,
) -> MemberLoading:
    """The padded arrays of ``actions[case]`` on members of ``span[case]`` (shape (cases,)).

    ``part`` picks the total loading (every action at its value), or the mean or the
    alternating part of it by :data:`CYCLIC_PARTS`. Inputs are assumed valid
    (:func:`service.core.loading.problems.member_problems` first).
    """
    span = np.asarray(span, dtype=float).reshape(-1)
    if len(actions) != span.shape[0]:
        raise ValueError("one action list per span is needed")
    column = {"total": None, "mean": 0, "alternating": 1}[part]
    rows: dict[str, list[list[float | None]]] = {   # at, start, end: set for their kinds
        key: [[] for _ in actions]
        for key in ("force_at", "force_value", "distributed_start", "distributed_end",
                    "distributed_value", "torque_at", "torque_value", "mass_at", "mass_value")
    }
    axial = np.zeros(span.shape[0])
    for case, case_actions in enumerate(actions):
        for action in case_actions:
            if action.kind == "mass":
                rows["mass_at"][case].append(action.at)
                rows["mass_value"][case].append(action.value)
                continue
            factor = 1.0 if column is None else CYCLIC_PARTS[action.cyclic][column]
            value = factor * action.value
            if action.kind == "force":
                rows["force_at"][case].append(action.at)
                rows["force_value"][case].append(value)
            elif action.kind == "distributed":
                rows["distributed_start"][case].append(action.start)
                rows["distributed_end"][case].append(action.end)
                rows["distributed_value"][case].append(value)
            elif action.kind == "torque":
                rows["torque_at"][case].append(action.at)
                rows["torque_value"][case].append(value)
            elif action.kind == "axial":
                axial[case] += value
            else:
                raise ValueError(f"unknown action kind {action.kind!r}")
    return MemberLoading(supports=supports, span=span, axial=axial,
                         twist_free_at_right_end=twist_free_at_right_end,
                         **{key: _padded(value) for key, value in rows.items()})


def _empty(cases: int) -> np.ndarray:
    return np.zeros((cases, 0))


def point_forces(supports: str, span, at, value) -> MemberLoading:
    """Point forces only: ``at`` and ``value`` (N) of shape (cases, n), ``span`` (cases,)."""
    span = np.asarray(span, dtype=float).reshape(-1)
    at, value = np.broadcast_arrays(np.asarray(at, dtype=float), np.asarray(value, dtype=float))
    cases = span.shape[0]
    return MemberLoading(
        supports, span, at.reshape(cases, -1), value.reshape(cases, -1),
        _empty(cases), _empty(cases), _empty(cases), _empty(cases), _empty(cases),
        np.zeros(cases), _empty(cases), _empty(cases),
    )


def uniform_load(supports: str, span, value) -> MemberLoading:
    """A uniform load ``value`` (N/m, shape (cases,)) over the whole span (cases,)."""
    span = np.asarray(span, dtype=float).reshape(-1)
    value = np.broadcast_to(np.asarray(value, dtype=float), span.shape)
    cases = span.shape[0]
    return MemberLoading(
        supports, span, _empty(cases), _empty(cases),
        np.zeros((cases, 1)), span[:, None].copy(), value[:, None].copy(),
        _empty(cases), _empty(cases), np.zeros(cases), _empty(cases), _empty(cases),
    )


def combine(*loadings: MemberLoading) -> MemberLoading:
    """Superposition: every action of every loading on the same members (same span, supports)."""
    first = loadings[0]
    for other in loadings[1:]:
        if (other.supports, other.twist_free_at_right_end) != (
                first.supports, first.twist_free_at_right_end) or not np.array_equal(
                other.span, first.span):
            raise ValueError("only loadings of the same members combine")

    def joined(name: str) -> np.ndarray:
        return np.concatenate([getattr(loading, name) for loading in loadings], axis=1)

    return MemberLoading(
        first.supports, first.span, joined("force_at"), joined("force_value"),
        joined("distributed_start"), joined("distributed_end"), joined("distributed_value"),
        joined("torque_at"), joined("torque_value"),
        np.sum([loading.axial for loading in loadings], axis=0),
        joined("mass_at"), joined("mass_value"), first.twist_free_at_right_end,
    )


def attached_weight(loading: MemberLoading, gravity: float = STANDARD_GRAVITY) -> MemberLoading:
    """The weights m g (N, down) of the attached masses as point forces on the same members."""
    weights = point_forces(loading.supports, loading.span, loading.mass_at,
                           loading.mass_value * gravity)
    return replace(weights, twist_free_at_right_end=loading.twist_free_at_right_end)


SHORTHAND_FORMS: dict[str, tuple[str, str]] = {
    # shorthand load case id -> (supports, where its load acts); a cantilever is fixed at x = 0
    # here, so its end load acts at x = L
    "cantilever_end_load": ("cantilever", "end"),
    "cantilever_uniform_load": ("cantilever", "uniform"),
    "simply_supported_center_load": ("simply_supported", "center"),
    "simply_supported_uniform_load": ("simply_supported", "uniform"),
    "fixed_fixed_center_load": ("fixed_fixed", "center"),
    "fixed_fixed_uniform_load": ("fixed_fixed", "uniform"),
    "torsion": ("cantilever", "torque"),
    # the axial cases: a tie in tension, a column in compression (a column's end conditions
    # are its own field; the general form carries the axial force only)
    "tie": ("simply_supported", "tension"),
    "column": ("simply_supported", "compression"),
}
"""Shorthand load case id (``service.core.loadcases``) -> (supports, load position)."""


def shorthand_actions(case_id: str, span: float, load: float = 0.0, torque: float = 0.0
                      ) -> tuple[str, list[Action]]:
    """The general form of a shorthand load case: (supports, actions) in SI.

    ``load`` is the point load or, for the uniform cases, the total load on the span, or the
    axial force of a tie or a column, given positive (N);
    ``torque`` the torque of the ``torsion`` case (N m).
    """
    supports, where = SHORTHAND_FORMS[case_id]
    if where == "end":
        return supports, [Action("force", load, at=span)]
    if where == "center":
        return supports, [Action("force", load, at=span / 2.0)]
    if where == "uniform":
        return supports, [Action("distributed", load / span, start=0.0, end=span)]
    if where in ("tension", "compression"):
        return supports, [Action("axial", load if where == "tension" else -load)]
    return supports, [Action("torque", torque, at=span)]
