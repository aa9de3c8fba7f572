"""Member buckling of a general member (load case ``member``, or a shorthand case sized in
its general form): lateral-torsional buckling under the member's own moment diagram, flexural
buckling under an axial compression, and their interaction.

- The per-case constants (:func:`diagram_terms`, once per case in
  :func:`service.core.sizing.member.member_demand`): the moment-gradient factor C1 of the
  applied loads' diagram and of the self-weight's, and the load-height constants of the
  downward loads (:mod:`service.core.stability.moment_diagram`).
- The utilisation (:func:`general_buckling_utilization`): M_cr of the whole diagram
  (``moment_diagram.diagram_critical_moment``), reduced by the material's lateral-torsional
  curve to M_b (``lateral_torsional.resistance_of``), then the beam-column interaction of
  ``stability.beam_column`` with the effective length of the supports
  (:data:`SUPPORT_END_CONDITIONS`), as the shorthand cases do.
- The search's smallest scale at fixed proportions (:func:`general_member_scale`): the peaks
  of the applied loads and of the self-weight superposed (the safe side, as the other
  general scale terms), found by ``stability.scaling.falling_root``.

The recheck takes the exact peak of the whole diagram; the utilisation rises with that
peak at a fixed critical load factor (the reduction chi_LT lambda_LT^2 rises toward 1 as the
slenderness does), so the superposed peak of the search only errs on the safe side.
Torsion does not enter (a torque's effect on lateral buckling is not modelled; the combined
stress check holds the torque).
"""

from __future__ import annotations

import numpy as np

from service.core.loadcases import STANDARD_GRAVITY
from service.core.loading.actions import MemberLoading, uniform_load
from service.core.loading.internal import internal_actions
from service.core.stability.columns import EFFECTIVE_LENGTH_FACTORS
from service.core.stability.lateral_torsional import resistance_of
from service.core.stability.member import (
    MemberMaterial,
    MemberSection,
    beam_column_utilization,
)
from service.core.stability.moment_diagram import (
    DiagramLoading,
    diagram_critical_moment,
    load_height_constants,
    ritz_moment_gradient,
)
from service.core.stability.scaling import falling_root

SUPPORT_END_CONDITIONS: dict[str, str] = {
    "cantilever": "fixed_free",
    "simply_supported": "pinned_pinned",
    "fixed_fixed": "fixed_fixed",
    "propped_cantilever": "fixed_pinned",
}
"""A general member's supports -> the end conditions of its flexural buckling (effective
length factors of ``columns.EFFECTIVE_LENGTH_FACTORS``, AISC 360-16 Commentary table
C-A-7.1 recommended values, from memory), the same for both axes."""


def end_length(supports: str) -> float:
    """K, the effective length factor of a general member's supports, for flexural buckling
    about either axis (:data:`SUPPORT_END_CONDITIONS`)."""
    return EFFECTIVE_LENGTH_FACTORS[SUPPORT_END_CONDITIONS[supports]]


def compression_deflection_term(member, span):
    """N_c (K L)^2 / pi^2 (N m^2) of a general member's axial compression N_c, 0 without one.

    The compression amplifies the deflection by 1 / (1 - N_c / P_cr), P_cr = pi^2 E I /
    (K L)^2 in the plane of bending (``stability.beam_column``; unfactored loads, a
    serviceability check), so delta_0 / (1 - N_c / P_cr) <= delta_max reads
    delta_0 E I + delta_max N_c (K L)^2 / pi^2 <= delta_max E I: this term joins the
    deflection's constant, as in the shorthand beam-columns."""
    compression = np.maximum(-np.asarray(member.axial, dtype=float), 0.0)
    return compression * (end_length(member.supports) * np.asarray(span, dtype=float)) ** 2 / (
        np.pi**2)


def wall_compression_ratio(axial_stress, bending_stress, bending_buckling_stress,
                           compression_buckling_stress) -> np.ndarray:
    """Local buckling of walls under an axial compression with bending (before the safety
    factor): the larger of the peak fibre stress (N / A + M / Z) over the bending mode's
    critical stress, and the linear interaction N / A / sigma_cr,c + M / Z / sigma_cr,b with
    the walls' critical stress in uniform compression (``stability.wall_compression``: the
    I-section's web as an internal element, k = 4.0, far below its bending value). The
    linear sum is conservative for plates under compression and in-plane bending, whose
    published interaction (sigma_c / sigma_cr,c + (sigma_b / sigma_cr,b)^2 <= 1, Bulson,
    The Stability of Flat Plates, 1970, from memory) lies outside it."""
    with np.errstate(divide="ignore", invalid="ignore"):
        fibre = (axial_stress + bending_stress) / bending_buckling_stress
        linear = (np.where(axial_stress > 0, axial_stress / compression_buckling_stress, 0.0)
                  + bending_stress / bending_buckling_stress)
    return np.maximum(fibre, linear)


DIAGRAM_NUMBERS = ("lateral_gradient", "weight_lateral_gradient", "height_torsion",
                   "height_warping")
"""The numbers :func:`diagram_terms` adds to a general member's demand (floats per case)."""


def diagram_terms(loading: MemberLoading, moment_peak: float, weight_peak: float
                  ) -> dict[str, float]:
    """The lateral-torsional constants of one case (:data:`DIAGRAM_NUMBERS`).

    Args:
        loading: the case's loading with the attached masses' weights (one case).
        moment_peak: its exact |M|_max, N m. weight_peak: that of 1 N/m over the span, m^2.
    """
    supports = loading.supports
    span = loading.span

    def moments(of: MemberLoading):
        return lambda x: internal_actions(of, x).moment

    applied = ritz_moment_gradient(supports, moments(loading), span, [moment_peak])
    weight = ritz_moment_gradient(supports, moments(uniform_load(supports, span, 1.0)), span,
                                  [weight_peak])
    torsion, warping = load_height_constants(
        supports, span, loading.force_at, loading.force_value, loading.distributed_start,
        loading.distributed_end, loading.distributed_value)
    return {"lateral_gradient": float(applied[0]), "weight_lateral_gradient": float(weight[0]),
            "height_torsion": float(torsion[0]), "height_warping": float(warping[0])}


def general_applies(demand) -> bool:
    """Whether a general member is checked for member buckling: an axial compression in any
    case, or bending (a moment or the self-weight) with the compression flange free."""
    member = demand.member
    bent = bool(np.any(np.asarray(member.moment) > 0)) or bool(demand.self_weight)
    return "compression" in member.flags or (bent and demand.lateral_restraint != "continuous")


def general_buckling_utilization(section: MemberSection, material: MemberMaterial, demand,
                                 peak, weight, about_minor=None) -> np.ndarray:
    """The member buckling utilisation of a general member (see the module docstring).

    Args:
        section: the section's constants (shape ``S``).
        material: E, G, f and curves, broadcastable with ``S``.
        demand: the general member's :class:`~service.core.sizing.demand.Demand`.
        peak: |M|_max of the whole loading, N m, unfactored.
        weight: the self-weight per length, N/m (0 without).
        about_minor: the compression's buckling axis
            (``stability.member.flexural_resistance``; None: the weaker).

    Returns:
        Utilisation <= 1 where the member holds, the broadcast shape of the arguments.
    """
    member = demand.member
    factor = np.asarray(demand.safety_factor, dtype=float)
    loading = DiagramLoading(
        member.supports, demand.span, member.lateral_gradient, member.moment,
        member.weight_lateral_gradient, member.weight_moment, member.height_torsion,
        member.height_warping)
    lateral = section.lateral
    height = lateral.top_load_height if demand.load_position == "top" else 0.0
    critical = diagram_critical_moment(
        loading, peak, weight, material.youngs_modulus, material.shear_modulus,
        lateral.minor_second_moment, lateral.torsion_constant, lateral.warping_constant,
        height)
    curves = material.curves
    resistance = resistance_of(critical, material.strength, section.section_modulus_major,
                               lateral, curves.lateral_imperfection, curves.lateral_plateau,
                               restraint=demand.lateral_restraint)
    return beam_column_utilization(section, material, demand.span, end_length(member.supports),
                                   np.asarray(peak) * factor,
                                   np.asarray(member.axial, dtype=float) * factor,
                                   resistance.moment_resistance, about_minor)


def general_member_scale(unit: MemberSection, density, material: MemberMaterial, demand,
                         start, about_minor=None) -> np.ndarray:
    """The smallest scale (m) at the proportions of ``unit`` (constants at scale 1) whose
    general member buckling check holds (the compression about ``about_minor``'s axis, by
    default the weaker), searched from ``start`` (the strength's scale, where the check is
    never weaker), with the applied and self-weight peaks superposed.

    Arguments broadcast: ``unit`` and ``density`` (kg/m^3) as the search's sections and
    materials, ``material`` along the materials, ``demand`` with a case axis or rows.
    """
    member = demand.member
    start = np.where(np.isfinite(start) & (start > 0), start, 1.0)
    at_start = unit.scaled(start)
    weight = (np.asarray(density) * unit.area * STANDARD_GRAVITY * start**2
              if demand.self_weight else 0.0)

    def utilization(scale):
        load = np.asarray(weight) * scale**2
        return general_buckling_utilization(
            at_start.scaled(scale), material, demand,
            np.asarray(member.moment) + np.asarray(member.weight_moment) * load, load,
            about_minor)

    return start * falling_root(utilization)

