"""Critical sections of a general member: where the diagrams peak, found from their shape.

Between consecutive breakpoints (:func:`service.core.loading.internal.breakpoints`) the shear
V is linear, the moment M at most quadratic (dM/dx = V), the torque T and the axial force N
constant. So:

- max |V| and max |T| lie at a breakpoint, on one side or the other of it;
- max |M| lies at a breakpoint or where V = 0 inside a loaded segment (the vertex of M);
- max |twist| (phi linear between torques) lies at a breakpoint;
- max |deflection| lies at an end or where the slope is zero; it is found by sampling and
  Newton steps on the slope (d(E I theta)/dx = -M), which converge to round-off.

The candidate stations (both limits at every breakpoint plus each segment's V = 0 point) hold
the maximum of any stress that, over a segment, grows with |M| at fixed T and N (the outer
fibre: bending, torsion, axial) or with |V| at fixed T and N (the neutral axis: transverse
shear, torsion, axial). An engine evaluates its combined stresses at :attr:`CriticalSections
.candidates` (cases, K) for every section and material and takes the largest: the critical
section of the combination is found, not assumed.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from service.core.loading.actions import MemberLoading
from service.core.loading.internal import InternalActions, breakpoints, internal_actions

DEFLECTION_SAMPLES = 65
"""Even samples of the deflection line before the Newton refinement."""

NEWTON_STEPS = 6
"""Newton steps on the slope; the line is a quartic per segment, so a few steps reach
round-off from the nearest sample (checked in the tests against dense sampling)."""


@dataclass(frozen=True)
class CriticalSections:
    """Peaks of the diagrams of every case, and where they are (all arrays (cases,) unless said).

    Attributes:
        candidates: the internal actions at the K candidate stations, (cases, K) fields.
        candidate_from_left: which candidates are limits from the left, (cases, K).
        moment: signed bending moment of largest magnitude, N m; ``moment_at`` its x, m.
        shear: signed shear force of largest magnitude, N; ``shear_at`` its x, m.
        torque: signed torque of largest magnitude, N m; ``torque_at`` its x, m.
        axial: axial force, N (uniform along the member).
        deflection_times_stiffness: E I y of largest magnitude, N m^3; ``deflection_at`` its x.
        twist_times_stiffness: G K phi of largest magnitude, N m^2; ``twist_at`` its x.
    """

    candidates: InternalActions
    candidate_from_left: np.ndarray
    moment: np.ndarray
    moment_at: np.ndarray
    shear: np.ndarray
    shear_at: np.ndarray
    torque: np.ndarray
    torque_at: np.ndarray
    axial: np.ndarray
    deflection_times_stiffness: np.ndarray
    deflection_at: np.ndarray
    twist_times_stiffness: np.ndarray
    twist_at: np.ndarray


def _signed_peak(values: np.ndarray, x: np.ndarray):
    index = np.abs(values).argmax(axis=1)[:, None]
    return (np.take_along_axis(values, index, axis=1)[:, 0],
            np.take_along_axis(x, index, axis=1)[:, 0])


def candidate_stations(loading: MemberLoading):
    """(x, from_left), both (cases, 3 B - 1): both limits at each breakpoint, V = 0 points."""
    points = np.sort(breakpoints(loading), axis=1)
    starts, ends = points[:, :-1], points[:, 1:]
    shear_after = internal_actions(loading, starts).shear
    middle = (starts + ends) / 2.0
    covered = ((loading.distributed_start[:, None, :] <= middle[:, :, None])
               & (middle[:, :, None] < loading.distributed_end[:, None, :]))
    intensity = (loading.distributed_value[:, None, :] * covered).sum(-1)
    # V falls at the rate w over a loaded segment: V = 0 at start + V(start+) / w
    safe = np.where(intensity == 0.0, 1.0, intensity)
    vertex = np.where(intensity == 0.0, starts, starts + shear_after / safe)
    vertex = np.clip(vertex, starts, ends)
    x = np.concatenate([points, points, vertex], axis=1)
    from_left = np.concatenate(
        [np.ones_like(points, dtype=bool), np.zeros_like(points, dtype=bool),
         np.zeros_like(vertex, dtype=bool)], axis=1,
    )
    return x, from_left


def _deflection_peak(loading: MemberLoading):
    span = loading.span[:, None]
    x = span * np.linspace(0.0, 1.0, DEFLECTION_SAMPLES)[None, :]
    sampled = internal_actions(loading, x).deflection_times_stiffness
    index = np.abs(sampled).argmax(axis=1)[:, None]
    step = span / (DEFLECTION_SAMPLES - 1)
    guess = np.take_along_axis(x, index, axis=1)
    low, high = np.maximum(guess - step, 0.0), np.minimum(guess + step, span)
    for _ in range(NEWTON_STEPS):
        lines = internal_actions(loading, guess)
        moment = lines.moment
        safe = np.where(moment == 0.0, 1.0, moment)
        # theta' = -M / E I, so the Newton step on theta = 0 is + E I theta / M
        guess = np.clip(np.where(moment == 0.0, guess, guess + lines.slope_times_stiffness / safe),
                        low, high)
    refined = internal_actions(loading, guess).deflection_times_stiffness
    best_sample = np.take_along_axis(sampled, index, axis=1)
    take_refined = np.abs(refined) >= np.abs(best_sample)
    return (np.where(take_refined, refined, best_sample)[:, 0],
            np.where(take_refined, guess, np.take_along_axis(x, index, axis=1))[:, 0])


def critical_sections(loading: MemberLoading) -> CriticalSections:
    """The peaks of V, M, T, deflection and twist of every case (see the module docstring)."""
    x, from_left = candidate_stations(loading)
    fields = internal_actions(loading, x, from_left)
    moment, moment_at = _signed_peak(fields.moment, x)
    shear, shear_at = _signed_peak(fields.shear, x)
    torque, torque_at = _signed_peak(fields.torque, x)
    twist, twist_at = _signed_peak(fields.twist_times_stiffness, x)
    deflection, deflection_at = _deflection_peak(loading)
    return CriticalSections(
        candidates=fields, candidate_from_left=from_left,
        moment=moment, moment_at=moment_at, shear=shear, shear_at=shear_at,
        torque=torque, torque_at=torque_at, axial=loading.axial.copy(),
        deflection_times_stiffness=deflection, deflection_at=deflection_at,
        twist_times_stiffness=twist, twist_at=twist_at,
    )
