"""Critical sections of a general member: where the diagrams peak, found from their shape.

The member is cut into pieces at its breakpoints (:mod:`service.core.loading.segments`),
inside which V is linear, M at most quadratic, y at most quartic and T, N constant. So:

- max |V| and max |T| lie at a piece's end, on one side or the other of a breakpoint;
- max |M| lies at a piece's end or where V = 0 inside it (closed form);
- max |twist| (phi linear in each piece) lies at a breakpoint;
- max |deflection| lies at an end or where the slope is zero (sampling, then Newton steps on
  the slope, which converge to round-off).

A stress that, over a piece, grows with |M| at fixed T and N (the outer fibre) or with |V| at
fixed T and N (the neutral axis) peaks where the piece's |M| or |V| does: an engine takes
:func:`~service.core.loading.segments.moment_peaks` and
:func:`~service.core.loading.segments.shear_peaks` per piece with the piece's T and N into
:mod:`service.core.loading.stress` and keeps the worst piece; the critical section of the
combination is found, not assumed. :func:`critical_sections` gives the peaks of each
diagram alone.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from service.core.loading.actions import MemberLoading
from service.core.loading.segments import (
    cut,
    deflection_peaks,
    member_peak,
    moment_peaks,
    shear_peaks,
    twist_peaks,
    with_uniform,
)


@dataclass(frozen=True)
class CriticalSections:
    """Peaks of the diagrams, and where they are; arrays (..., cases) as the uniform load.

    Attributes:
        moment: signed bending moment of largest magnitude, N m; ``moment_at`` its x, m.
        shear: signed shear force of largest magnitude, N; ``shear_at`` its x, m.
        torque: signed torque of largest magnitude, N m; ``torque_at`` its x (the start of
            the piece that carries it), m.
        axial: axial force, N (uniform along the member).
        deflection_times_stiffness: E I y of largest magnitude (with the shear part when a
            shear flexibility is given), N m^3; ``deflection_at`` its x.
        twist_times_stiffness: G K phi of largest magnitude, N m^2; ``twist_at`` its x.
    """

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


def critical_sections(loading: MemberLoading, uniform=0.0, shear_flexibility=0.0
                      ) -> CriticalSections:
    """The peaks of V, M, T, deflection and twist of every case.

    Args:
        loading: the cases.
        uniform: an extra uniform load over the whole span, N/m (self-weight m' g), shape
            broadcasting against (cases,), e.g. (designs, cases); 0 by default.
        shear_flexibility: E I / S, m^2, of sandwich members (S the shear stiffness, N),
            broadcasting likewise; the deflection then includes its shear part
            (:func:`service.core.loading.segments.deflection_at`). 0 by default.
    """
    applied, unit = cut(loading)
    pieces = with_uniform(applied, unit, uniform)
    moment, moment_at = member_peak(moment_peaks(pieces))
    shear, shear_at = member_peak(shear_peaks(pieces))
    torque, torque_at = member_peak((pieces.torque, pieces.start))
    twist, twist_at = member_peak(twist_peaks(pieces))
    deflection, deflection_at = member_peak(deflection_peaks(
        pieces, shear_flexibility, held_at_both_ends=loading.supports != "cantilever"))
    return CriticalSections(
        moment=moment, moment_at=moment_at, shear=shear, shear_at=shear_at,
        torque=torque, torque_at=torque_at, axial=pieces.axial[..., 0].copy(),
        deflection_times_stiffness=deflection, deflection_at=deflection_at,
        twist_times_stiffness=twist, twist_at=twist_at,
    )
