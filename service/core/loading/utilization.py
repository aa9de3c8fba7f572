"""Strength and fatigue utilization of general members over designs x cases.

The composition an engine's checks call: the member is cut once per case
(:func:`service.core.loading.segments.cut`); each design adds its own self-weight by
superposition; every piece is judged at its largest |M| (outer fibre) and its largest |V|
(neutral axis) with its T and N (:mod:`service.core.loading.stress`), and the worst piece is
the member's utilization. Fatigue does the same with the mean and the alternating parts of the
loading (:mod:`service.core.loading.fatigue`), at the outer fibre (where bending, the usual
driver of fatigue, peaks; transverse shear, zero there, is left out as in Shigley's shaft
analysis, 10th ed., section 7-4).

Shapes: section and material arrays broadcast against the case axis, e.g. (designs, cases);
results have that shape. SI throughout.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from service.core.loadcases import STANDARD_GRAVITY
from service.core.loading.fatigue import (
    equivalent_alternating_and_mean,
    goodman_utilization,
    rotating_bending,
)
from service.core.loading.segments import Segments, moment_peaks, shear_peaks, with_uniform
from service.core.loading.stress import combined_utilization, point_stresses


@dataclass(frozen=True)
class SectionArrays:
    """What the stress checks read of a section, arrays broadcasting against (cases,).

    Attributes:
        area: A, m^2. section_modulus: Z (bending axis), m^3.
        torsion_modulus: Q, m^3 (peak torsional shear T / Q).
        shear_area: A_s, m^2 (peak transverse shear V / A_s).
        mass_per_length: m', kg/m (self-weight m' g when it is counted).
    """

    area: np.ndarray
    section_modulus: np.ndarray
    torsion_modulus: np.ndarray
    shear_area: np.ndarray
    mass_per_length: np.ndarray


def _expanded(value):
    return np.asarray(value, dtype=float)[..., None]


def _self_weight(section: SectionArrays, self_weight: bool):
    return np.asarray(section.mass_per_length, dtype=float) * STANDARD_GRAVITY * float(
        self_weight)


def strength_utilization(applied: Segments, unit: Segments, section: SectionArrays,
                         strength, safety_factor, brittle, compressive_strength=None,
                         self_weight: bool = False):
    """Combined-stress demand over capacity of every design and case (<= 1 passes).

    Args:
        applied, unit: :func:`service.core.loading.segments.cut` of the cases.
        section: the designs' sections.
        strength, safety_factor, brittle, compressive_strength: as
            :func:`service.core.loading.stress.combined_utilization`.
        self_weight: add each design's own weight m' g as a uniform load.
    """
    pieces = with_uniform(applied, unit, _self_weight(section, self_weight))
    shear = shear_peaks(pieces)[0]
    stresses = point_stresses(
        moment_peaks(pieces)[0], pieces.torque, pieces.axial,
        np.abs(shear) / _expanded(section.shear_area), _expanded(section.area),
        _expanded(section.section_modulus), _expanded(section.torsion_modulus),
    )
    compressive = None if compressive_strength is None else _expanded(compressive_strength)
    return combined_utilization(stresses, _expanded(strength), safety_factor,
                                _expanded(brittle), compressive).max(axis=-1)


def fatigue_utilization(mean: tuple[Segments, Segments], alternating: tuple[Segments, Segments],
                        section: SectionArrays, fatigue_strength, ultimate_strength,
                        safety_factor, rotating: bool, self_weight: bool = False):
    """Modified Goodman demand over capacity of every design and case (<= 1 passes).

    Args:
        mean, alternating: ``cut`` of the mean and of the alternating parts of the loading
            (``member_loading(..., part="mean" | "alternating")``; the same pieces).
        section: the designs' sections.
        fatigue_strength: S_f of the part at the required life, Pa (Marin factors and the
            S-N line applied: :func:`service.core.loading.fatigue.fatigue_strength_at`).
        ultimate_strength: S_ut, Pa.
        safety_factor: required fatigue safety factor n.
        rotating: a rotating shaft: all bending is fully reversed.
        self_weight: the designs' own weight, a steady load, joins the mean part.
    """
    steady = with_uniform(*mean, _self_weight(section, self_weight))
    varying = with_uniform(*alternating, 0.0)
    mean_moment, alternating_moment = moment_peaks(steady)[0], moment_peaks(varying)[0]
    if rotating:
        mean_moment, alternating_moment = rotating_bending(mean_moment, alternating_moment)
    area, modulus = _expanded(section.area), _expanded(section.section_modulus)
    torsion_modulus = _expanded(section.torsion_modulus)
    sigma_a, sigma_m = equivalent_alternating_and_mean(
        alternating_moment / modulus, varying.axial / area, varying.torque / torsion_modulus,
        mean_moment / modulus, steady.axial / area, steady.torque / torsion_modulus,
    )
    return goodman_utilization(sigma_a, sigma_m, _expanded(fatigue_strength),
                               _expanded(ultimate_strength), safety_factor).max(axis=-1)
