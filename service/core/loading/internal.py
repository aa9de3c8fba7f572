"""Internal actions and the deflection and twist lines of a general member, exactly.

Euler-Bernoulli bending, closed form by singularity functions (Macaulay's method: W. H.
Macaulay, "A note on the deflection of beams", Messenger of Mathematics 48, 1919, from
memory; in every strength-of-materials text). With the reactions
at x = 0 written as the force R_0 (N, up) and the moment M_0 (N m, sagging positive), a
free body of [0, x] gives

    V(x)          = R_0 - v(x)
    M(x)          = M_0 + R_0 x - m(x)
    E I theta(x)  = E I theta_0 - (M_0 x + R_0 x^2 / 2 - s(x))
    E I y(x)      = E I theta_0 x - (M_0 x^2 / 2 + R_0 x^3 / 6 - d(x))

with y the deflection (m, positive down, y(0) = 0 at every support set here), theta = dy/dx,
and the load integrals, for point forces P at a and loads w over [s, e] (<z> = max(z, 0)):

    v(x) = sum P H(x - a)   + sum w (<x - s> - <x - e>)
    m(x) = sum P <x - a>    + sum w (<x - s>^2 - <x - e>^2) / 2
    s(x) = sum P <x - a>^2/2 + sum w (<x - s>^3 - <x - e>^3) / 6
    d(x) = sum P <x - a>^3/6 + sum w (<x - s>^4 - <x - e>^4) / 24

The unknowns R_0, M_0, theta_0 follow exactly from the conditions at x = L (cantilever:
M(L) = V(L) = 0; simply supported: M(0) = M(L) = 0, y(L) = 0; fixed-fixed: theta(L) =
y(L) = 0; propped cantilever: M(L) = y(L) = 0): a 2 x 2 system at most, solved in closed form
below. The results equal the superposition of Roark's Formulas for Stress and Strain, 8th ed.,
table 8.1, cases 1a-1e and 2a-2e (the tests check it against those closed forms and against an
independent beam library).

Torsion (Saint-Venant, uniform G K): the twist is restrained at every support. A cantilever
carries each torque T_i at a to its root; a member restrained at both ends splits it by
position (statically indeterminate; compatibility phi(L) = 0 with uniform G K, e.g. Gere &
Goodno, section 3.8, from memory): T_i (L - a) / L to the left end and T_i a / L to the right.
A member whose right end is free to twist (``twist_free_at_right_end``) is a cantilever in
torsion.

Sign conventions: V = dM/dx; the internal torque T(x) is the sum of the torques acting on the
part right of x (with the right-end reaction); N is positive in tension.

A point force exactly at a section makes the shear jump there; ``from_left`` chooses the limit
from the left (loads at x not yet counted) or from the right (counted, the default).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from service.core.loading.actions import MemberLoading


@dataclass(frozen=True)
class InternalActions:
    """Internal actions and lines at stations x; every field has the shape (cases, stations).

    Attributes:
        x: station positions, m.
        shear: shear force V, N (V = dM/dx).
        moment: bending moment M, N m, sagging positive (tension on the side the loads
            point to).
        torque: internal torque T, N m.
        axial: axial force N, N, positive tension.
        slope_times_stiffness: E I theta, N m^2: the slope dy/dx times E I.
        deflection_times_stiffness: E I y, N m^3: the deflection y (m, positive down) of a
            member of flexural rigidity E I = 1 N m^2; divide by E I for the deflection.
        twist_times_stiffness: G K phi, N m^2: the angle of twist phi (rad) relative to the
            section at x = 0; divide by G K for the twist.
    """

    x: np.ndarray
    shear: np.ndarray
    moment: np.ndarray
    torque: np.ndarray
    axial: np.ndarray
    slope_times_stiffness: np.ndarray
    deflection_times_stiffness: np.ndarray
    twist_times_stiffness: np.ndarray


def _load_integrals(loading: MemberLoading, x: np.ndarray, from_left: np.ndarray):
    """v, m, s, d of the module docstring at x (cases, stations): four (cases, stations)."""
    xs = x[:, :, None]
    a = loading.force_at[:, None, :]
    p = loading.force_value[:, None, :]
    lever = np.maximum(xs - a, 0.0)
    counted = (xs > a) | ((xs == a) & ~from_left[:, :, None])
    # successive products instead of powers: the same numbers, far fewer passes over memory
    p_lever = p * lever
    p_lever_2 = p_lever * lever
    start = np.maximum(xs - loading.distributed_start[:, None, :], 0.0)
    end = np.maximum(xs - loading.distributed_end[:, None, :], 0.0)
    w = loading.distributed_value[:, None, :]
    start_2, end_2 = start * start, end * end
    v = np.where(counted, p, 0.0).sum(-1) + (w * (start - end)).sum(-1)
    m = p_lever.sum(-1) + (w * (start_2 - end_2)).sum(-1) / 2.0
    s = p_lever_2.sum(-1) / 2.0 + (w * (start_2 * start - end_2 * end)).sum(-1) / 6.0
    d = (p_lever_2 * lever).sum(-1) / 6.0 + (w * (start_2 * start_2 - end_2 * end_2)).sum(-1) / 24.0
    return v, m, s, d


def left_end_unknowns(loading: MemberLoading):
    """(R_0 in N, M_0 in N m, E I theta_0 in N m^2) at x = 0, each of shape (cases,).

    Solved in closed form from the conditions at x = L listed in the module docstring.
    """
    span = loading.span
    at_end = span[:, None]
    total, m, s, d = (q[:, 0] for q in _load_integrals(
        loading, at_end, np.zeros_like(at_end, dtype=bool)))
    zero = np.zeros_like(span)
    if loading.supports == "cantilever":
        # V(L) = 0 and M(L) = 0, theta(0) = 0
        reaction = total
        return reaction, m - reaction * span, zero
    if loading.supports == "simply_supported":
        # M(0) = 0, M(L) = 0 gives R_0; y(L) = 0 gives theta_0
        reaction = m / span
        return reaction, zero, (reaction * span**3 / 6.0 - d) / span
    if loading.supports == "fixed_fixed":
        # theta(L) = 0: M_0 L + R_0 L^2 / 2 = s;  y(L) = 0: M_0 L^2 / 2 + R_0 L^3 / 6 = d
        moment = -2.0 * s / span + 6.0 * d / span**2
        reaction = 6.0 * s / span**2 - 12.0 * d / span**3
        return reaction, moment, zero
    if loading.supports == "propped_cantilever":
        # M(L) = 0: M_0 = m - R_0 L;  y(L) = 0: M_0 L^2 / 2 + R_0 L^3 / 6 = d
        reaction = 1.5 * m / span - 3.0 * d / span**3
        return reaction, m - reaction * span, zero
    raise ValueError(f"unknown supports {loading.supports!r}")


def internal_actions(loading: MemberLoading, x, from_left=False) -> InternalActions:
    """Internal actions and lines of every case at stations ``x`` (m).

    Args:
        loading: the cases (see :class:`MemberLoading`), ``cases`` of them.
        x: positions in [0, L], shape (stations,) shared by all cases or (cases, stations).
        from_left: bool, broadcast to the shape of x: take the limit from the left at a
            point force or torque (default: from the right).

    Returns:
        :class:`InternalActions`, every field (cases, stations).
    """
    cases = loading.cases
    x = np.asarray(x, dtype=float)
    x = np.broadcast_to(x if x.ndim == 2 else x[None, :], (cases, x.shape[-1]))
    from_left = np.broadcast_to(np.asarray(from_left, dtype=bool), x.shape)
    v, m, s, d = _load_integrals(loading, x, from_left)
    reaction, moment_0, slope_0 = (q[:, None] for q in left_end_unknowns(loading))
    shear = reaction - v
    moment = moment_0 + reaction * x - m
    slope = slope_0 - (moment_0 * x + reaction * x**2 / 2.0 - s)
    deflection = slope_0 * x - (moment_0 * x**2 / 2.0 + reaction * x**3 / 6.0 - d)
    torque, twist = _torsion(loading, x, from_left)
    return InternalActions(
        x=x, shear=shear, moment=moment, torque=torque,
        axial=np.broadcast_to(loading.axial[:, None], x.shape), slope_times_stiffness=slope,
        deflection_times_stiffness=deflection, twist_times_stiffness=twist,
    )


def _torsion(loading: MemberLoading, x: np.ndarray, from_left: np.ndarray):
    """Internal torque (N m) and G K phi (N m^2) at x (cases, stations); module docstring."""
    a = loading.torque_at[:, None, :]
    t = loading.torque_value[:, None, :]
    span = loading.span[:, None, None]
    xs = x[:, :, None]
    passed = (xs > a) | ((xs == a) & ~from_left[:, :, None])
    # share of each torque taken by the right-end restraint: none on a cantilever
    right_free = loading.supports == "cantilever" or loading.twist_free_at_right_end
    right_share = 0.0 if right_free else a / span
    torque = (t * (~passed - right_share)).sum(-1)
    twist = (t * (np.minimum(xs, a) - right_share * xs)).sum(-1)
    return torque, twist


def breakpoints(loading: MemberLoading) -> np.ndarray:
    """Positions where a diagram may change its law: ends, point actions, load limits (cases, B).

    Between consecutive breakpoints the shear is linear, the moment at most quadratic and the
    torque constant.
    """
    span = loading.span[:, None]
    return np.concatenate(
        [np.zeros_like(span), span, loading.force_at, loading.distributed_start,
         loading.distributed_end, loading.torque_at, loading.mass_at], axis=1,
    )


def diagram_stations(loading: MemberLoading, count: int = 101):
    """Stations for drawing the diagrams: ``count`` even points plus every breakpoint twice.

    Returns:
        (x, from_left): both (cases, count + 2 B), sorted along x; at a breakpoint the limit
        from the left comes first, so a plotted line shows each jump as a vertical step.
    """
    even = loading.span[:, None] * np.linspace(0.0, 1.0, count)[None, :]
    points = breakpoints(loading)
    x = np.concatenate([even, points, points], axis=1)
    from_left = np.concatenate(
        [np.zeros_like(even, dtype=bool), np.ones_like(points, dtype=bool),
         np.zeros_like(points, dtype=bool)], axis=1,
    )
    order = np.lexsort((~from_left, x), axis=1)
    return np.take_along_axis(x, order, axis=1), np.take_along_axis(from_left, order, axis=1)
