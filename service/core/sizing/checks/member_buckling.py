"""Member buckling: the factored peak moment against the lateral-torsional buckling
resistance of the whole member, M SF / M_b, and a column's factored load against its
flexural buckling resistance about the weaker axis, P SF / N_b (:mod:`service.core.stability`:
Euler load with the effective length of its end conditions, reduced by the column curve of
the material family) with N_b = chi A_eff f: the effective area of slender walls in uniform
compression where the interaction check reads one (:func:`area_ratio`; EN 1993-1-1 6.3.1.1
eq. 6.48 and 6.3.1.2 eq. 6.50 for class 4 sections), the gross area elsewhere.

M_b = chi_LT Z f with the elastic critical moment of the load case's moment-gradient and
load-position factors (``stability.critical_moment.MOMENT_FACTORS``, each with its source)
and the buckling curve of the material family (``stability.buckling_curves``). 0 when the
request restrains the compression flange continuously (``lateral_restraint``), for torsion
and ties, and for families whose member buckling is checked elsewhere. A section that cannot buckle
laterally (closed round and square sections, any section with I_minor >= I_major; see
``stability.lateral_properties``) has M_b = Z f, so its ratio equals the bending part of the
strength check.

With an axial force N (``axial_force``, a beam-column) the ratio is the interaction of
``stability.beam_column``: N SF / (A f) for tension, or P SF / N_b about the weaker axis for
compression, plus M SF / (1 - P SF / P_cr) / M_b with P_cr the Euler load in the plane of
bending on the effective length of the case's supports (``stability.columns``). It is checked
whatever the lateral restraint (the restraint removes lateral-torsional buckling only).

With self-weight the moment diagram is a sum of the load case's and the uniform case's; its
factors C1 and C2 lie between those of the two diagrams (both peaks are at the same section,
see ``service.core.loadcases``), so the larger of the two ratios is taken (conservative).
"""

from __future__ import annotations

import dataclasses
import functools
from typing import TYPE_CHECKING

import numpy as np

from service.core.loadcases import STANDARD_GRAVITY
from service.core.materials.vocabulary import FAMILIES
from service.core.sections.base import SectionFamily
from service.core.sections.effective_width import AREA_PIECES
from service.core.sizing.checks.base import Actions, Check, Found
from service.core.sizing.closed_forms import case_values
from service.core.sizing.demand import Demand
from service.core.sizing.member_stability import (
    general_applies,
    general_buckling_utilization,
    general_member_scale,
)
from service.core.sizing.values import MaterialValues
from service.core.stability.lateral_properties import LATERAL_TORSIONAL_FAMILIES
from service.core.stability.member import (
    FlatTake,
    MaterialCurves,
    MemberMaterial,
    MemberSection,
    material_curves,
    member_utilization,
)
from service.core.stability.scaling import minimum_scale

if TYPE_CHECKING:
    from service.core.sizing.checks.interaction import WebSection
    from service.core.sizing.scale import UnitSection

UNKNOWN_FAMILY = "unknown"
"""The material family of values without one: the most conservative curves apply."""


@functools.cache
def family_curves(section_family: str) -> MaterialCurves:
    """The buckling curves of every material family for a section family, in the order of
    :data:`~service.core.materials.vocabulary.FAMILIES` (``MaterialValues.family``), then
    those of :data:`UNKNOWN_FAMILY`; built once per section family (the arrays are only
    read)."""
    return material_curves([*FAMILIES, UNKNOWN_FAMILY], section_family)


def member_material(values: MaterialValues, section_family: str,
                    area_ratio: np.ndarray | float = 1.0) -> MemberMaterial:
    """E, G, f and the buckling curves of ``values`` for a section family, shaped like the
    values' arrays; f is the compressed fibre's strength
    (``MaterialValues.compression_strength``: a column's squash stress, a beam's weaker
    fibre); ``area_ratio`` A / A_eff of the sections' walls in uniform compression
    (:func:`area_ratio`)."""
    shape = np.shape(values.youngs_modulus)
    position = len(FAMILIES) if values.family is None else values.family
    curves = family_curves(section_family)
    picked = [getattr(curves, name)[position] for name in MaterialCurves.__dataclass_fields__]
    # the usual family array has the values' shape already (np.broadcast_to costs as much
    # as a small search's arithmetic)
    shaped = MaterialCurves(*(curve if np.shape(curve) == shape else np.broadcast_to(curve, shape)
                              for curve in picked))
    return MemberMaterial(values.youngs_modulus, values.shear_modulus,
                          values.compression_strength, shaped, area_ratio)


def area_ratio(web: WebSection | None, demand: Demand) -> np.ndarray | float:
    """A / A_eff of slender walls in uniform compression (EN 1993-1-5 4.3(3), 4.4), which
    a compressed member's flexural buckling resistance chi A_eff f reads (EN 1993-1-1 6.3.1.1
    eq. 6.48 and 6.3.1.2 eq. 6.50 for class 4 sections): the interaction check's, where it
    applies (ductile in-plane isotropic I-sections and boxes under an axial compression,
    local buckling checked; ``WebSection.area_ratio``), else 1 (the gross area)."""
    return web.area_ratio if web is not None and demand.local_buckling else 1.0


def area_ratio_pieces(web: WebSection | None, demand: Demand) -> list[np.ndarray | float]:
    """The smooth pieces of :func:`area_ratio` (``WebSection.area_ratio_pieces``: A over
    each piece of the effective area; the ratio is their largest): as many for every point
    of a family under one demand (a search stacks the parts of its points), one 1 where no
    effective width applies."""
    if web is None or not demand.local_buckling:
        return [1.0]
    pieces = web.area_ratio_pieces
    if not isinstance(pieces, np.ndarray) or pieces.ndim == 0:   # no compression at all
        return [pieces] * AREA_PIECES
    return list(pieces)


def buckling_cases(demand: Demand) -> tuple[str, ...]:
    """The load cases whose factors bound the member's moment diagram: the request's, and
    with self-weight the uniform case on the same supports too (see the module doc)."""
    if demand.self_weight and demand.case.self_weight_case != demand.case.id:
        return (demand.case.id, demand.case.uniform.id)
    return (demand.case.id,)


def applies(demand: Demand) -> bool:
    """Whether the request asks for member buckling at all: a column, a bending case whose
    compression flange is not restrained continuously, or one with an axial force (a
    beam-column); a member sized in its general form (``demand.member``) likewise, by
    :func:`service.core.sizing.member_stability.general_applies`."""
    if demand.member is not None:
        return general_applies(demand)
    return demand.case.loading == "compression" or (demand.bending and (
        demand.lateral_restraint != "continuous" or has_axial_force(demand)))


def has_axial_force(demand: Demand) -> bool:
    """Whether any case of a bending demand carries an axial force (a beam-column; a general
    member's axial action)."""
    if demand.member is not None:
        return "axial" in demand.member.flags
    return bool(np.any(np.asarray(demand.axial_force) != 0.0))


def moment_ratio(section: MemberSection, material: MemberMaterial, demand: Demand,
                 factored_moment) -> np.ndarray:
    """M SF / M_b of sections (with an axial force, the beam-column interaction of
    ``stability.beam_column``), the larger over :func:`buckling_cases`."""
    ratios = [member_utilization(section, material, case, demand.span, moment=factored_moment,
                                 axial_force=np.asarray(demand.axial_force)
                                 * demand.safety_factor,
                                 restraint=demand.lateral_restraint,
                                 load_position=demand.load_position)
              for case in buckling_cases(demand)]
    return np.maximum.reduce(ratios) if len(ratios) > 1 else ratios[0]


def utilization(actions: Actions, materials: MaterialValues, demand: Demand) -> np.ndarray:
    """M SF / M_b (0 where not asked for; see the module doc)."""
    if actions.member_section is None or not applies(demand):
        return np.zeros_like(actions.stress)
    material = member_material(materials, actions.section_family,
                               area_ratio(actions.web, demand))
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        if actions.member is not None:
            weight = (materials.density * actions.member_section.area * STANDARD_GRAVITY
                      if demand.self_weight else 0.0)
            return general_buckling_utilization(actions.member_section, material, demand,
                                                actions.member.moment, weight)
        if demand.case.loading == "compression":
            return member_utilization(actions.member_section, material, "column", demand.span,
                                      axial_force=-np.asarray(demand.action)
                                      * demand.safety_factor,
                                      end_conditions=demand.end_conditions)
        return moment_ratio(actions.member_section, material, demand,
                            np.asarray(actions.moment) * demand.safety_factor)


def requested(demand: Demand) -> bool:
    """Whether a request asks for member buckling (else a design reports null): whenever
    :func:`applies` (a bending case left unbraced, the default, a beam-column or a column)."""
    return applies(demand)


LATERAL_FAMILIES = (*LATERAL_TORSIONAL_FAMILIES, "sandwich_panel")
"""The section families that can buckle laterally in bending (a sandwich panel's faces as
flanges: ``service.core.sizing.sandwich.panel_member_buckling``)."""


def for_family(family: SectionFamily, demand: Demand) -> bool:
    """Whether a design of ``family`` reports member buckling: a column or a beam-column
    always, a beam only in a family that can buckle laterally (a round section's M_b is
    Z f, its strength check already)."""
    return (demand.case.loading == "compression" or has_axial_force(demand)
            or family.id in LATERAL_FAMILIES)


def scale_bound(unit: UnitSection, materials: MaterialValues, demand: Demand, found: Found
                ) -> list[np.ndarray] | None:
    """The smallest scale whose member buckling check holds at fixed proportions, searched
    from the strength's scale (where it is never weaker; ``found`` holds the strength's
    parts): a shorthand case by :func:`member_scale` (under the earlier checks' floor where
    only the scale is read, ``found.floor()``), a general member by
    :func:`~service.core.sizing.member_stability.general_member_scale`. Where every part
    must be exact, a compressed member's scale comes as its smooth parts
    (:func:`buckling_parts`). None where not asked for or the sections carry no member
    constants."""
    if unit.member_section is None or not applies(demand):
        return None
    strength = found.parts["strength"]
    material = member_material(materials, unit.section_family, area_ratio(unit.web, demand))
    split = found.exact and compressed(demand)
    if demand.member is not None and unit.member is not None:
        start = np.maximum.reduce(strength)
        if not split:
            return [general_member_scale(unit.member_section, materials.density, material,
                                         demand, start)]
        ratios, minor = buckling_parts(unit.web, demand)
        return [general_member_scale(unit.member_section, materials.density,
                                     dataclasses.replace(material, area_ratio=ratio), demand,
                                     start, about_minor)
                for ratio, about_minor in zip(ratios, minor, strict=True)]
    scale = member_scale(unit, materials.density, material, demand, strength[0],
                         found.floor(), split)
    return list(scale) if split else [scale]


def buckling_parts(web: WebSection | None, demand: Demand,
                   shape: tuple[int, ...] | None = None) -> tuple[np.ndarray, np.ndarray]:
    """The smooth parts of a compressed member's flexural buckling (a search over the
    proportions reads them apart; the check is their largest): each axis
    (``stability.member.flexural_resistance``) with each piece of the effective area
    (:func:`area_ratio_pieces`). Returns A / A_eff of each part, shape (parts,) + the
    pieces' shape (broadcast to ``shape`` where given), and whether it buckles about the
    minor axis, shape (parts,) + ones."""
    pieces = [piece if shape is None else np.broadcast_to(piece, shape)
              for piece in area_ratio_pieces(web, demand)]
    ratios = np.stack(np.broadcast_arrays(*pieces, *pieces))
    minor = np.repeat([False, True], len(pieces)).reshape((-1,) + (1,) * (ratios.ndim - 1))
    return ratios, minor


def compressed(demand: Demand) -> bool:
    """Whether any case presses the member: a column, a beam-column with an axial
    compression, a general member with one."""
    if demand.member is not None:
        return "compression" in demand.member.flags
    return demand.case.loading == "compression" or bool(
        np.any(np.asarray(demand.axial_force) < 0.0))


def member_scale(unit: UnitSection, density, material: MemberMaterial, demand: Demand,
                 strength_scale, floor=None, split: bool = False) -> np.ndarray:
    """The smallest scale whose member buckling check holds (lateral-torsional buckling of
    a bending case, flexural buckling of a column about its weaker axis; see the module
    doc) for sections with member constants (``unit.member_section``); with ``split``, that
    of each smooth part of a compressed member (:func:`buckling_parts`), stacked on a first
    axis (one search for them all).

    No closed form exists (M_cr mixes powers of s under a root, chi_LT solves a quadratic):
    :func:`service.core.stability.scaling.minimum_scale` finds it for every element at once.
    It starts from the strength's scale ``strength_scale`` (chi = 1), where member buckling
    is never weaker, so the root lies at or above it and near it. 0 where a beam's section
    cannot buckle laterally (its M_b = Z f is the strength check already).

    With ``floor`` (m, the largest of the other checks' scales), the check is first made at
    the floor: where it holds there, member buckling cannot set the scale, and a lower bound
    at most the floor stands in for the root (``minimum_scale``'s ``ceiling``) without a
    search; elsewhere the search starts from the floor. Where the floor is ``inf`` nothing
    is searched (0 stands in).
    """
    section = unit.member_section
    assert section is not None
    case, span, action, factor = case_values(demand)
    start = np.where(np.isfinite(strength_scale) & (strength_scale > 0), strength_scale, 1.0)
    column = case.loading == "compression"   # flexural buckling about the weaker axis
    moment = 0.0 if column else case.moment_coefficient * action * span * factor
    weight_moment = (case.uniform.moment_coefficient * density * unit.area * STANDARD_GRAVITY
                     * span * span * factor if demand.self_weight and not column else 0.0)
    axial = -action * factor if column else np.asarray(demand.axial_force) * factor
    shape = np.broadcast_shapes(np.shape(start), np.shape(section.area),
                                np.shape(moment), np.shape(weight_moment), np.shape(axial),
                                np.shape(material.youngs_modulus),
                                np.shape(material.area_ratio))
    about_minor = None
    if split:
        ratios, about_minor = buckling_parts(unit.web, demand, shape)
        material = dataclasses.replace(material, area_ratio=ratios)
        shape = ratios.shape
    # Without an axial force only sections that can buckle laterally need the search (the
    # others' M_b = Z f is the strength row): it runs on those elements alone.
    chosen = (np.ones(shape, dtype=bool) if column or has_axial_force(demand)
              else np.broadcast_to(section.lateral.susceptible, shape))
    if floor is not None:
        # an infinite floor reads nothing of this check (Found.floor): 0 stands in
        chosen = chosen & ~np.isposinf(np.broadcast_to(floor, shape))
    scale = np.zeros(shape)
    if not chosen.any():
        return scale
    pick = FlatTake(shape, np.flatnonzero(chosen))

    begin = pick(start)
    ceiling = None if floor is None else pick(floor) / begin
    scales = [minimum_scale(section.at(pick).scaled(begin),
                            material.at(pick), case_id, pick(span),
                            moment=pick(moment),
                            self_weight_moment=pick(np.asarray(weight_moment) * start**2),
                            axial_force=pick(axial), end_conditions=demand.end_conditions,
                            restraint=demand.lateral_restraint,
                            load_position=demand.load_position, ceiling=ceiling,
                            about_minor=None if about_minor is None else pick(about_minor))
              for case_id in (("column",) if column else buckling_cases(demand))]
    scale.reshape(-1)[pick.index] = begin * (np.maximum.reduce(scales) if len(scales) > 1
                                        else scales[0])
    return scale


MEMBER_BUCKLING = Check("member_buckling", utilization, requested, for_family=for_family,
                        scale_bound=scale_bound, reads=("strength",))
