"""A member cut at its breakpoints: each piece's diagrams as exact polynomials.

Between consecutive breakpoints (:func:`service.core.loading.internal.breakpoints`) the load
intensity w is constant, so every line is a polynomial known from its values at the piece's
start s (the limit from the right) by Taylor's theorem, exactly (V = dM/dx, E I theta' = -M,
dw/dx = 0; Euler-Bernoulli as in :mod:`service.core.loading.internal`), t in [0, length]:

    V(s + t)         = V_s - w t
    M(s + t)         = M_s + V_s t - w t^2 / 2
    E I theta(s + t) = E I theta_s - M_s t - V_s t^2 / 2 + w t^3 / 6
    E I y(s + t)     = E I y_s + E I theta_s t - M_s t^2 / 2 - V_s t^3 / 6 + w t^4 / 24
    T(s + t)         = T_s,     G K phi(s + t) = G K phi_s + T_s t

That makes the pieces the engine's currency: they are cut once per case, and every line is
linear in the loads, so the self-weight of any section (a uniform load q = m' g, different
for every design) is added by :func:`with_uniform` as q times the same pieces under 1 N/m,
broadcast over designs, without solving the member again. Peaks per piece:
:func:`moment_peaks` (closed form: ends or the vertex where V = 0), :func:`shear_peaks`
(ends), :func:`deflection_peaks` (ends or slope zeros, by sampling and Newton steps).
Within a piece T and N are constant, so the piece's largest |M| (outer fibre) and largest |V|
(neutral axis) with its T and N give its largest combined stress of
:mod:`service.core.loading.stress`: the critical section of any combination is the worst
piece.

Shapes: the fields of :class:`Segments` are (..., cases, S), S = B - 1 pieces for B
breakpoints (pieces of zero length, where breakpoints coincide, are harmless).
"""

from __future__ import annotations

from dataclasses import dataclass, fields, replace

import numpy as np

from service.core.loading.actions import MemberLoading, uniform_load
from service.core.loading.internal import breakpoints, internal_actions

DEFLECTION_SAMPLES = 9
"""Even samples of the deflection inside each piece before the Newton refinement."""

NEWTON_STEPS = 5
"""Newton steps on the slope (a cubic per piece) from the best sample; the tests compare the
peaks with a dense sampling of the whole member."""


@dataclass(frozen=True)
class Segments:
    """Pieces of a member and the values of its lines at each piece's start (from the right).

    Attributes:
        start: s, m. length: m.
        shear: V_s, N. moment: M_s, N m. intensity: w, N/m (positive down).
        slope: E I theta_s, N m^2. deflection: E I y_s, N m^3.
        torque: T_s, N m (constant over the piece). twist: G K phi_s, N m^2.
        axial: N, N (constant along the member), broadcast to the pieces' shape.
    """

    start: np.ndarray
    length: np.ndarray
    shear: np.ndarray
    moment: np.ndarray
    intensity: np.ndarray
    slope: np.ndarray
    deflection: np.ndarray
    torque: np.ndarray
    twist: np.ndarray
    axial: np.ndarray


def _cut(loading: MemberLoading, points: np.ndarray) -> Segments:
    starts, ends = points[:, :-1], points[:, 1:]
    lines = internal_actions(loading, starts)
    middle = (starts + ends) / 2.0
    covered = ((loading.distributed_start[:, None, :] <= middle[:, :, None])
               & (middle[:, :, None] < loading.distributed_end[:, None, :]))
    return Segments(
        start=starts, length=ends - starts, shear=lines.shear, moment=lines.moment,
        intensity=(loading.distributed_value[:, None, :] * covered).sum(-1),
        slope=lines.slope_times_stiffness, deflection=lines.deflection_times_stiffness,
        torque=lines.torque, twist=lines.twist_times_stiffness, axial=lines.axial,
    )


def cut(loading: MemberLoading) -> tuple[Segments, Segments]:
    """(pieces under the loading's actions, the same pieces under 1 N/m over the whole span)."""
    points = np.sort(breakpoints(loading), axis=1)
    unit = uniform_load(loading.supports, loading.span, 1.0)
    return _cut(loading, points), _cut(unit, points)


def with_uniform(applied: Segments, unit: Segments, intensity) -> Segments:
    """The pieces with a uniform load ``intensity`` (N/m) added, by superposition.

    ``intensity`` broadcasts against the case axis: shape (..., cases), for example one
    self-weight m' g per design and case; the result has fields (..., cases, S).
    """
    q = np.asarray(intensity, dtype=float)[..., None]
    values = {}
    for field in fields(Segments):
        name = field.name
        if name in ("start", "length", "torque", "twist", "axial"):
            values[name] = np.broadcast_to(getattr(applied, name),
                                           np.broadcast_shapes(q.shape, applied.start.shape))
        else:
            values[name] = getattr(applied, name) + q * getattr(unit, name)
    return Segments(**values)


def _largest(*candidates: tuple[np.ndarray, np.ndarray]):
    """The signed value of largest magnitude among (value, position) pairs, and its position."""
    values = np.stack([np.broadcast_to(v, np.broadcast_shapes(*(c[0].shape for c in candidates)))
                       for v, _ in candidates])
    positions = np.stack([np.broadcast_to(x, values.shape[1:]) for _, x in candidates])
    index = np.abs(values).argmax(axis=0)[None]
    return (np.take_along_axis(values, index, axis=0)[0],
            np.take_along_axis(positions, index, axis=0)[0])


def moment_peaks(pieces: Segments):
    """(M of largest magnitude in each piece, its x): ends or the vertex V = 0, exactly."""
    m, v, w, length = pieces.moment, pieces.shear, pieces.intensity, pieces.length
    end_moment = m + v * length - w * length**2 / 2.0
    safe = np.where(w == 0.0, 1.0, w)
    with np.errstate(over="ignore"):   # a vanishing intensity: the vertex lies beyond the piece
        vertex = np.where(w == 0.0, 0.0, np.clip(v / safe, 0.0, length))
    vertex_moment = m + v * vertex - w * vertex**2 / 2.0
    return _largest((m, pieces.start), (end_moment, pieces.start + length),
                    (vertex_moment, pieces.start + vertex))


def shear_peaks(pieces: Segments):
    """(V of largest magnitude in each piece, its x): at one of its ends."""
    end_shear = pieces.shear - pieces.intensity * pieces.length
    return _largest((pieces.shear, pieces.start), (end_shear, pieces.start + pieces.length))


def twist_peaks(pieces: Segments):
    """(G K phi of largest magnitude in each piece, its x): at one of its ends."""
    end_twist = pieces.twist + pieces.torque * pieces.length
    return _largest((pieces.twist, pieces.start), (end_twist, pieces.start + pieces.length))


def _shear_line(pieces: Segments, held_at_both_ends: bool):
    """(M(0), c) of the shear deflection line S y_s(x) = M(x) - M(0) - c x, (..., cases, 1)."""
    moment_0 = pieces.moment[..., :1]
    if not held_at_both_ends:
        return moment_0, np.zeros_like(moment_0)
    length = pieces.length[..., -1:]
    moment_end = (pieces.moment[..., -1:] + pieces.shear[..., -1:] * length
                  - pieces.intensity[..., -1:] * length**2 / 2.0)
    return moment_0, (moment_end - moment_0) / (pieces.start[..., -1:] + length)


def shear_line_peaks(pieces: Segments, held_at_both_ends=True):
    """(S y_s of largest magnitude in each piece, its x), N m: the shear deflection line
    M(x) - M(0) - c x of :func:`deflection_at` times the shear stiffness S, exactly (a
    quadratic per piece: its ends or the vertex where V = c, by :func:`moment_peaks` of the
    line written as a moment)."""
    moment_0, chord = _shear_line(pieces, held_at_both_ends)
    return moment_peaks(replace(pieces, moment=pieces.moment - moment_0 - chord * pieces.start,
                                shear=pieces.shear - chord))


def deflection_at(pieces: Segments, t, shear_flexibility=0.0, held_at_both_ends=True):
    """E I y at local positions t (m from each piece's start), shape (..., cases, S, k).

    ``shear_flexibility`` phi = E I / S (m^2, broadcasting against (cases,); 0 for a member
    without shear deformation) adds the shear deflection of a sandwich member, E I y_s =
    phi (M(x) - M(0) - c x): the integral of V / S from x = 0 (Allen, Analysis and Design of
    Structural Sandwich Panels, 1969, ch. 2, from memory), with c (M(L) - M(0)) / L turning
    it so that y_s(L) = 0 on a member ``held_at_both_ends`` (zero on a cantilever). Exact for
    determinate members and symmetric loads; on indeterminate members under unsymmetric
    loads the reactions stay those of Euler-Bernoulli theory, as in Allen's coefficients
    (``service.core.loadcases``).
    """
    m, v, w = (a[..., None] for a in (pieces.moment, pieces.shear, pieces.intensity))
    bending = (pieces.deflection[..., None] + pieces.slope[..., None] * t
               - m * t**2 / 2.0 - v * t**3 / 6.0 + w * t**4 / 24.0)
    moment_0, chord = (a[..., None] for a in _shear_line(pieces, held_at_both_ends))
    moment = m + v * t - w * t**2 / 2.0
    shear_line = moment - moment_0 - chord * (pieces.start[..., None] + t)
    return bending + np.asarray(shear_flexibility, dtype=float)[..., None, None] * shear_line


def deflection_peaks(pieces: Segments, shear_flexibility=0.0, held_at_both_ends=True):
    """(E I y of largest magnitude in each piece, its x): ends or a zero of the slope.

    ``shear_flexibility`` and ``held_at_both_ends`` as :func:`deflection_at`. Samples each
    piece evenly, then takes Newton steps on the slope (E I y'' = -M - phi w) from the best
    sample, kept within the neighbouring samples; the refined point replaces the sample only
    where it is larger, so the answer is never below the sampled peak.
    """
    length = pieces.length[..., None]
    t = length * np.linspace(0.0, 1.0, DEFLECTION_SAMPLES)
    sampled = deflection_at(pieces, t, shear_flexibility, held_at_both_ends)
    # a shear flexibility per design broadcasts the pieces over the designs
    t = np.broadcast_to(t, sampled.shape)
    length = np.broadcast_to(length, sampled.shape[:-1] + (1,))
    index = np.abs(sampled).argmax(axis=-1)[..., None]
    guess = np.take_along_axis(t, index, axis=-1)
    step = length / (DEFLECTION_SAMPLES - 1)
    low, high = np.maximum(guess - step, 0.0), np.minimum(guess + step, length)
    m, v, w = (a[..., None] for a in (pieces.moment, pieces.shear, pieces.intensity))
    theta = pieces.slope[..., None]
    phi = np.asarray(shear_flexibility, dtype=float)[..., None, None]
    chord = _shear_line(pieces, held_at_both_ends)[1][..., None]
    for _ in range(NEWTON_STEPS):
        shear = v - w * guess
        moment = m + v * guess - w * guess**2 / 2.0
        bending_slope = theta - m * guess - v * guess**2 / 2.0 + w * guess**3 / 6.0
        slope = bending_slope + phi * (shear - chord)
        curvature = -moment - phi * w
        safe = np.where(curvature == 0.0, 1.0, curvature)
        with np.errstate(over="ignore", invalid="ignore"):  # a vanishing curvature: clipped
            step = np.nan_to_num(slope / safe)
        guess = np.clip(np.where(curvature == 0.0, guess, guess - step), low, high)
    refined = deflection_at(pieces, guess, shear_flexibility, held_at_both_ends)[..., 0]
    best = np.take_along_axis(sampled, index, axis=-1)[..., 0]
    best_t = np.take_along_axis(t, index, axis=-1)[..., 0]
    take = np.abs(refined) > np.abs(best)
    return (np.where(take, refined, best),
            pieces.start + np.where(take, guess[..., 0], best_t))


def member_peak(peaks: tuple[np.ndarray, np.ndarray]):
    """Reduce per-piece (value, x) to the member's (value of largest magnitude, x), (..., cases)."""
    values, positions = peaks
    index = np.abs(values).argmax(axis=-1)[..., None]
    return (np.take_along_axis(values, index, axis=-1)[..., 0],
            np.take_along_axis(positions, index, axis=-1)[..., 0])
