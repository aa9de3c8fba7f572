"""Combined stress at the critical points of a section, and the failure rule that judges it.

A beam section under bending moment M, shear V, torque T and axial force N (SI, arrays
broadcast) has a plane state at every point: one normal stress sigma along the member and one
shear stress tau. Two points govern (Shigley's Mechanical Engineering Design, 10th ed.,
ch. 3 on stresses in beams and shafts, and the shaft analysis of section 7-4, from memory):

- the outer fibre: sigma = N / A +- |M| / Z, tau = |T| / Q (transverse shear is zero there);
- the neutral axis: sigma = N / A, tau = |T| / Q + tau_V, with tau_V = |V| / A_s the peak
  transverse shear stress (A_s: ``SectionFamily.shear_area`` of ``service.core.sections``,
  checked there against a finite-element flexure solution). Torsional and transverse shear
  are added as if they acted in the same direction at the same point: exact on the side of a
  round section where they do, conservative elsewhere.

Rules (the material's ``brittle`` flag chooses; Shigley 10th ed., ch. 5):

- ductile: distortion energy (von Mises, section 5-5, eq. 5-15):
  sigma' = sqrt(sigma^2 + 3 tau^2) <= strength / safety factor;
- brittle: maximum principal stress (section 5-8, Rankine's maximum-normal-stress theory):
  sigma_1 = sigma / 2 + sqrt((sigma / 2)^2 + tau^2) <= strength / safety factor, and the most
  compressive principal stress sigma_2 = sigma / 2 - sqrt((sigma / 2)^2 + tau^2) within the
  compressive strength (Mohr's circle, section 3-6, eq. 3-13).

Every section family here is symmetric about its bending axis, so one Z serves both fibres.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np


@dataclass(frozen=True)
class PointStresses:
    """Normal and shear stresses at the governing points, Pa (arrays of the broadcast shape).

    Attributes:
        tension_fibre_normal: N / A + |M| / Z at the fibre bending puts in tension.
        compression_fibre_normal: N / A - |M| / Z at the opposite fibre.
        fibre_shear: |T| / Q at both fibres.
        neutral_axis_normal: N / A.
        neutral_axis_shear: |T| / Q + tau_V.
    """

    tension_fibre_normal: np.ndarray
    compression_fibre_normal: np.ndarray
    fibre_shear: np.ndarray
    neutral_axis_normal: np.ndarray
    neutral_axis_shear: np.ndarray


def point_stresses(moment, torque, axial, transverse_shear_stress, area, section_modulus,
                   torsion_modulus) -> PointStresses:
    """The stresses of :class:`PointStresses` (arrays broadcast).

    Args:
        moment: M, N m. torque: T, N m. axial: N, N (positive tension).
        transverse_shear_stress: tau_V = |V| / shear_area, Pa (the section family's
            ``shear_area``).
        area: A, m^2. section_modulus: Z, m^3. torsion_modulus: Q, m^3 (peak tau = T / Q).
    """
    axial_stress = np.asarray(axial, dtype=float) / np.asarray(area, dtype=float)
    bending = np.abs(np.asarray(moment, dtype=float)) / np.asarray(section_modulus, dtype=float)
    torsion = np.abs(np.asarray(torque, dtype=float)) / np.asarray(torsion_modulus, dtype=float)
    return PointStresses(
        tension_fibre_normal=axial_stress + bending,
        compression_fibre_normal=axial_stress - bending,
        fibre_shear=torsion,
        neutral_axis_normal=axial_stress,
        neutral_axis_shear=torsion + np.abs(np.asarray(transverse_shear_stress, dtype=float)),
    )


def von_mises(normal, shear):
    """sigma' = sqrt(sigma^2 + 3 tau^2), Pa (Shigley 10th ed., eq. 5-15)."""
    normal = np.asarray(normal, dtype=float)
    return np.sqrt(normal**2 + 3.0 * np.asarray(shear, dtype=float) ** 2)


def principal_stresses(normal, shear):
    """(sigma_1, sigma_2), Pa: sigma / 2 +- sqrt((sigma / 2)^2 + tau^2) (Mohr's circle)."""
    half = np.asarray(normal, dtype=float) / 2.0
    radius = np.hypot(half, np.asarray(shear, dtype=float))
    return half + radius, half - radius


def _points(stresses: PointStresses):
    """(normal, shear) of each governing point: both fibres and the neutral axis."""
    return ((stresses.tension_fibre_normal, stresses.fibre_shear),
            (stresses.compression_fibre_normal, stresses.fibre_shear),
            (stresses.neutral_axis_normal, stresses.neutral_axis_shear))


def peak_von_mises(stresses: PointStresses):
    """Largest von Mises stress over the governing points, Pa."""
    return np.maximum.reduce([von_mises(normal, shear) for normal, shear in _points(stresses)])


def peak_principal(stresses: PointStresses):
    """(largest sigma_1, most compressive sigma_2) over the governing points, Pa."""
    first = []
    second = []
    for normal, shear in _points(stresses):
        sigma_1, sigma_2 = principal_stresses(normal, shear)
        first.append(sigma_1)
        second.append(sigma_2)
    return np.maximum.reduce(first), np.minimum.reduce(second)


def combined_utilization(stresses: PointStresses, strength, safety_factor, brittle,
                         compressive_strength=None):
    """Demand over capacity of the combined stress, dimensionless (<= 1 passes).

    Args:
        stresses: from :func:`point_stresses`.
        strength: design strength, Pa (yield for ductile, tensile for brittle materials).
        safety_factor: >= 1.
        brittle: bool array or scalar; True applies the maximum principal stress rule.
        compressive_strength: Pa, for the compressive principal stress of brittle materials
            and the von Mises stress of a point whose normal stress is compressive in
            ductile ones; None takes ``strength`` (the safe assumption when no value is
            known).
    """
    strength = np.asarray(strength, dtype=float)
    compressive = strength if compressive_strength is None else np.asarray(
        compressive_strength, dtype=float)
    sigma_1, sigma_2 = peak_principal(stresses)
    brittle_ratio = np.maximum(np.maximum(sigma_1, 0.0) / strength,
                               np.maximum(-sigma_2, 0.0) / compressive)
    if compressive_strength is None:
        ductile_ratio = peak_von_mises(stresses) / strength
    else:
        # each point against the strength of its normal stress's sign (a fibre in
        # compression against the compressive strength)
        ductile_ratio = np.maximum.reduce([
            von_mises(normal, shear) / np.where(np.asarray(normal) < 0.0, compressive, strength)
            for normal, shear in _points(stresses)])
    return np.asarray(safety_factor, dtype=float) * np.where(brittle, brittle_ratio,
                                                             ductile_ratio)
