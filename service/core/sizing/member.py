"""The general member load case in the sizing engine (contract: "General member loading").

A request of load case ``member`` (or a shorthand case with a frequency or fatigue
requirement, or asking for diagrams: it is sized in its general form,
:func:`service.core.loading.actions.shorthand_actions`) carries a :class:`MemberDemand`: what
the sizing reads of its actions, computed once per case by :mod:`service.core.loading`.

Two uses, two levels of exactness:

- The proportion search needs the smallest scale s at fixed proportions (each check's
  ``scale_bound`` has a general member's form beside its shorthand one,
  :mod:`service.core.sizing.checks`). It takes the member's peaks (largest |M|, |V|, |T|,
  |N|, E I y and G K phi over the span, and the same peaks of a 1 N/m uniform load for the
  self-weight) as if they acted at one section: each peak is found exactly, and superposing
  peaks that may sit at different sections can only overestimate a combination, so the
  scale is on the safe side (and exact where they coincide, as in every shorthand case).
  Each stress term is a power of s (axial s^-2, bending and torsion s^-3, transverse shear
  s^-2, self-weight moments s^-1), so the pure-bending scales are the closed forms of
  :mod:`service.core.sizing.closed_forms` and a combination is a short vectorised
  bisection on log s (:func:`smallest_scale`).
- The recheck of every design (:func:`member_actions`) is exact: every piece of the member
  judged at its own M, V, T, N with the design's own self-weight
  (:mod:`service.core.loading.utilization`), the deflection and twist lines' true peaks,
  the first frequency by Dunkerley's formula and the fatigue by modified Goodman.

Array layout: numeric fields of :class:`MemberDemand` follow :class:`Demand`'s (a float per
case, stacked to (C, 1, 1), rows (R, 1)); the pieces and frequency terms carry the case or
row axis first ((C, S), (C,)), and the recheck puts the row axis last where the section
arrays have more than one axis (:func:`_rows_last`).
"""

from __future__ import annotations

import dataclasses
import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np

from service.core.loadcases import STANDARD_GRAVITY
from service.core.loading.actions import (
    Action,
    MemberLoading,
    Part,
    attached_weight,
    combine,
    member_loading,
    shorthand_actions,
)
from service.core.loading.fatigue import (
    fatigue_strength_at,
    size_factor,
)
from service.core.loading.frequency import (
    AttachedMassTerms,
    attached_mass_terms,
    dunkerley_frequency,
)
from service.core.loading.segments import (
    Segments,
    cut,
    deflection_peaks,
    member_peak,
    moment_peaks,
    shear_line_peaks,
    shear_peaks,
    twist_peaks,
    with_uniform,
)
from service.core.loading.utilization import (
    SectionArrays,
    fatigue_utilization,
    strength_utilization,
)
from service.core.sizing.member_stability import (
    DIAGRAM_NUMBERS,
    diagram_terms,
    end_length,
)
from service.core.stability.beam_column import amplification

MEMBER_NUMBERS = (
    "moment", "shear", "torque", "axial", "deflection", "twist", "weight_moment",
    "weight_shear", "weight_deflection", "shear_deflection", "weight_shear_deflection",
    "flexibility_mass", "shear_flexibility_mass", "min_frequency",
    "fatigue_cycles", "mean_moment", "alternating_moment", "mean_torque",
    "alternating_torque", "mean_axial", "alternating_axial", *DIAGRAM_NUMBERS,
)
"""The numeric fields of :class:`MemberDemand` (floats per case, stacked like Demand's)."""

MEMBER_ARRAYS = ("pieces", "unit_pieces", "mean_pieces", "alternating_pieces", "masses")
"""The per-case structures (case axis first) of :class:`MemberDemand`."""


@dataclass(frozen=True)
class MemberDemand:
    """What the sizing reads of one (or many) general member cases, SI.

    Attributes:
        supports: one of ``service.core.loading.actions.SUPPORTS``.
        rotating: a rotating shaft: bending fully reversed in fatigue.
        twist_free_at_right_end: the support at x = L does not restrain twist.
        moment, shear, torque, axial: largest |M| (N m), |V| (N), |T| (N m) over the span
            and the axial force N (N, positive tension), attached masses' weights included.
        deflection: largest |E I y|, N m^3. twist: largest |G K phi|, N m^2.
        weight_moment, weight_shear, weight_deflection: the same peaks under 1 N/m over the
            span (the self-weight is m' g times these).
        shear_deflection, weight_shear_deflection: largest |S y_s| of the shear deflection
            line (Timoshenko: y_s = (M(x) - M(0) - c x) / S with S = G k A,
            :func:`service.core.loading.segments.shear_line_peaks`), N m, of the loading and
            of 1 N/m.
        flexibility_mass: Dunkerley's sum_i m_i (E I delta_ii), kg m^3.
        shear_flexibility_mass: its shear part sum_i m_i (S delta_s,ii), kg m
            (:mod:`service.core.loading.frequency`).
        min_frequency: required first bending frequency, Hz (0: none).
        fatigue_cycles: required life, cycles (0: no fatigue check).
        mean_moment, alternating_moment, mean_torque, alternating_torque: peaks of the mean
            and the alternating parts of the loading, N m.
        mean_axial, alternating_axial: N.
        lateral_gradient, weight_lateral_gradient: C1 of the applied loads' moment diagram
            and of a uniform load's (lateral-torsional buckling,
            :mod:`service.core.sizing.member_stability`).
        height_torsion, height_warping: the load-height constants of the downward applied
            loads, N m and N m^3 (:func:`service.core.stability.moment_diagram
            .load_height_constants`).
        pieces, unit_pieces: the member cut into pieces under its actions (with the masses'
            weights) and under 1 N/m (:func:`service.core.loading.segments.cut`).
        mean_pieces, alternating_pieces: ``cut`` of the mean and the alternating parts.
        masses: Dunkerley's and Rayleigh's per-case terms.
        loading: the loading of one case (with the masses' weights), for its diagrams (a
            stacked demand keeps its first case's; the diagrams read a single case's).
        diagrams: return each design's diagrams.
        flags: what any case of the group has (``torque``, ``axial``, ``compression``,
            ``frequency``, ``fatigue``, ``deflection_limit``, ``twist_limit``): the scale
            terms of the search are the same for every row of a group, whichever rows it
            takes.
        case_index: the case of each row (None: one row per case).
    """

    supports: str
    rotating: bool
    twist_free_at_right_end: bool
    moment: Any
    shear: Any
    torque: Any
    axial: Any
    deflection: Any
    twist: Any
    weight_moment: Any
    weight_shear: Any
    weight_deflection: Any
    shear_deflection: Any
    weight_shear_deflection: Any
    flexibility_mass: Any
    shear_flexibility_mass: Any
    min_frequency: Any
    fatigue_cycles: Any
    mean_moment: Any
    alternating_moment: Any
    mean_torque: Any
    alternating_torque: Any
    mean_axial: Any
    alternating_axial: Any
    lateral_gradient: Any
    weight_lateral_gradient: Any
    height_torsion: Any
    height_warping: Any
    pieces: Segments
    unit_pieces: Segments
    mean_pieces: tuple[Segments, Segments]
    alternating_pieces: tuple[Segments, Segments]
    masses: AttachedMassTerms
    loading: MemberLoading
    diagrams: bool = False
    flags: frozenset[str] = frozenset()
    case_index: np.ndarray | None = None

    def per_case(self, structure):
        """A per-case structure (:data:`MEMBER_ARRAYS`) at this demand's rows: the
        structures keep one entry per case, and rows index them (no copies while the search
        takes rows apart)."""
        if self.case_index is None:
            return structure
        return _map_structure(structure, lambda value: value[self.case_index])

    @property
    def checks_frequency(self) -> bool:
        """Whether a frequency is required (in any case)."""
        return "frequency" in self.flags

    @property
    def checks_fatigue(self) -> bool:
        """Whether fatigue is checked (in any case)."""
        return "fatigue" in self.flags

    @classmethod
    def stack(cls, demands: Sequence[MemberDemand]) -> MemberDemand:
        """Cases of one group as one (numbers (C, 1, 1), structures case-first)."""
        first = demands[0]
        values: dict[str, Any] = {
            name: np.array([getattr(d, name) for d in demands], dtype=float)[:, None, None]
            for name in MEMBER_NUMBERS}
        for name in MEMBER_ARRAYS:
            values[name] = _join([getattr(d, name) for d in demands])
        values["flags"] = frozenset().union(*(d.flags for d in demands))
        return dataclasses.replace(first, **values)

    def map_numbers(self, numbers: Callable, rows: Callable) -> MemberDemand:
        """``numbers`` applied to every numeric array field (floats are kept), ``rows`` to
        the case index of the per-case structures (cases to rows)."""
        values: dict[str, Any] = {
            name: numbers(value) if np.ndim(value := getattr(self, name)) else value
            for name in MEMBER_NUMBERS}
        index = (np.arange(self.pieces.start.shape[0]) if self.case_index is None
                 else self.case_index)
        return dataclasses.replace(self, case_index=rows(index), **values)


def _join(items: list):
    """Structures of single cases joined along their case axis."""
    first = items[0]
    if isinstance(first, tuple):
        return tuple(_join([item[k] for item in items]) for k in range(len(first)))
    values = {}
    for field in dataclasses.fields(first):
        parts = [getattr(item, field.name) for item in items]
        values[field.name] = (parts[0] if isinstance(parts[0], str)
                              else np.concatenate([np.asarray(p) for p in parts], axis=0))
    return type(first)(**values)


def _map_structure(item, function):
    if isinstance(item, tuple):
        return tuple(_map_structure(part, function) for part in item)
    return type(item)(**{field.name: value if isinstance(value := getattr(item, field.name), str)
                         else function(np.asarray(value))
                         for field in dataclasses.fields(item)})


def general_form(request) -> tuple[str, list[Action]]:
    """(supports, actions) of a request: its own for ``member``, else the shorthand case's
    general form."""
    if request.load_case == "member":
        return str(request.supports), list(request.actions)
    load = request.load or 0.0
    torque = request.torque or 0.0
    supports, actions = shorthand_actions(request.load_case, request.span, load, torque)
    if request.axial_force:   # a shorthand beam-column
        actions.append(Action("axial", request.axial_force))
    return supports, actions


def member_demand(request) -> MemberDemand:
    """The :class:`MemberDemand` of one validated request."""
    supports, actions = general_form(request)
    if not any(action.kind == "mass" for action in actions):
        # a zero mass at x = 0 adds nothing, and keeps every case's arrays the same shape
        actions = [*actions, Action("mass", 0.0, at=0.0)]
    twist_free = bool(request.twist_free_at_right_end)
    span = [request.span]

    def loading(part: Part) -> MemberLoading:
        return member_loading(supports, span, [actions], part, twist_free)

    total = loading("total")
    # attached masses weigh on the member (a steady load)
    weighted = combine(total, attached_weight(total))
    pieces, unit = cut(weighted)
    # the same breakpoints in both parts (zero forces where the masses hang), so that their
    # pieces pair up
    if request.fatigue_cycles is not None:
        weightless = attached_weight(dataclasses.replace(total,
                                                         mass_value=0.0 * total.mass_value))
        mean_pieces = cut(combine(loading("mean"), attached_weight(total)))
        alternating_pieces = cut(combine(loading("alternating"), weightless))
    else:
        # not read without a fatigue requirement (fatigue_cycles 0 masks them); the same
        # shapes as the parts, so that cases with and without one stack together
        mean_pieces = alternating_pieces = (pieces, unit)
    masses = attached_mass_terms(total)

    def peak(values) -> float:
        return float(np.abs(member_peak(values)[0])[0])

    held = supports != "cantilever"
    moment = peak(moment_peaks(pieces))
    weight_moment = peak(moment_peaks(unit))
    lateral = diagram_terms(weighted, moment, weight_moment)
    axial = float(pieces.axial.reshape(-1)[0]) if pieces.axial.size else 0.0
    present = {"torque": bool(np.any(pieces.torque)), "axial": axial != 0.0,
               "compression": axial < 0.0, "frequency": request.min_frequency is not None,
               "fatigue": request.fatigue_cycles is not None,
               "deflection_limit": request.max_deflection is not None,
               "twist_limit": request.max_twist is not None}
    return MemberDemand(
        supports=supports, rotating=bool(request.rotating), twist_free_at_right_end=twist_free,
        moment=moment, shear=peak(shear_peaks(pieces)),
        torque=float(np.abs(pieces.torque).max(initial=0.0)),
        axial=axial,
        deflection=peak(deflection_peaks(pieces, held_at_both_ends=held)),
        twist=peak(twist_peaks(pieces)),
        weight_moment=weight_moment, weight_shear=peak(shear_peaks(unit)),
        weight_deflection=peak(deflection_peaks(unit, held_at_both_ends=held)),
        shear_deflection=peak(shear_line_peaks(pieces, held_at_both_ends=held)),
        weight_shear_deflection=peak(shear_line_peaks(unit, held_at_both_ends=held)),
        flexibility_mass=float(masses.flexibility_mass[0]),
        shear_flexibility_mass=float(masses.shear_flexibility_mass[0]),
        min_frequency=request.min_frequency or 0.0,
        fatigue_cycles=request.fatigue_cycles or 0.0,
        mean_moment=peak(moment_peaks(mean_pieces[0])),
        alternating_moment=peak(moment_peaks(alternating_pieces[0])),
        mean_torque=float(np.abs(mean_pieces[0].torque).max(initial=0.0)),
        alternating_torque=float(np.abs(alternating_pieces[0].torque).max(initial=0.0)),
        mean_axial=float(mean_pieces[0].axial.reshape(-1)[0]) if mean_pieces[0].axial.size
        else 0.0,
        alternating_axial=float(np.abs(alternating_pieces[0].axial).max(initial=0.0)),
        lateral_gradient=lateral["lateral_gradient"],
        weight_lateral_gradient=lateral["weight_lateral_gradient"],
        height_torsion=lateral["height_torsion"], height_warping=lateral["height_warping"],
        pieces=pieces, unit_pieces=unit, mean_pieces=mean_pieces,
        alternating_pieces=alternating_pieces, masses=masses, loading=weighted,
        diagrams=bool(request.diagrams),
        flags=frozenset(name for name, there in present.items() if there),
    )


# --- the proportion search: smallest scale at fixed proportions -------------------------

LOG2_RANGE = (-40.0, 24.0)
"""The bisection keeps log2 s in this range (s from 1e-12 m to 1.6e7 m)."""

BISECTION_STEPS = 48
"""Halvings of the log2 bracket: its width ends below 64 / 2^48, a relative error in s near
1.6e-13."""


def smallest_scale(utilization: Callable[[np.ndarray], np.ndarray], shape) -> np.ndarray:
    """Smallest s with ``utilization(s) <= 1`` for a utilization falling with s, by bisection
    on log2 s, every element at once; ``inf`` where even the largest scale fails."""
    low = np.full(shape, LOG2_RANGE[0])
    high = np.full(shape, LOG2_RANGE[1])
    with np.errstate(divide="ignore", invalid="ignore", over="ignore", under="ignore"):
        feasible_at_top = np.broadcast_to(utilization(np.exp2(high)) <= 1.0, shape)
        for _ in range(BISECTION_STEPS):
            middle = (low + high) / 2.0
            passes = np.broadcast_to(utilization(np.exp2(middle)) <= 1.0, shape)
            high = np.where(passes, middle, high)
            low = np.where(passes, low, middle)
    return np.where(feasible_at_top, np.exp2(high), np.inf)


@dataclass(frozen=True)
class MemberUnit:
    """What the member checks read of a section at scale 1 (arrays broadcasting together).

    Attributes:
        area: a. second_moment: i. section_modulus: z. torsion_constant: k.
        torsion_modulus: q. shear_area: a_s (all at scale 1 m, powers 2, 4, 3, 4, 3, 2).
        depth_ratio, width_ratio: overall depth and width at scale 1.
        shear_stiffness_area: k A, the Timoshenko shear area (power 2; the material's
            Poisson's ratio in Cowper's k, :mod:`service.core.sections.shear_deformation`);
            ``inf`` for none.
        round: the section is round (solid or tube): the size factor of a round.
    """

    area: Any
    second_moment: Any
    section_modulus: Any
    torsion_constant: Any
    torsion_modulus: Any
    shear_area: Any
    depth_ratio: Any
    width_ratio: Any
    round: bool
    shear_stiffness_area: Any = np.inf


def weight_per_scale2(unit: MemberUnit, materials, demand):
    """The self-weight m' g of sections ``unit`` per s^2, N/m at scale 1 (0 without
    self-weight)."""
    return materials.density * unit.area * STANDARD_GRAVITY * float(demand.self_weight)


def search_shape(unit: MemberUnit, materials, demand) -> tuple[int, ...]:
    """The shape of a general member's search arrays (sections, materials and cases)."""
    member: MemberDemand = demand.member
    return np.broadcast_shapes(*(np.shape(x) for x in (
        unit.area, materials.density, materials.strength,
        np.asarray(demand.safety_factor, dtype=float), member.moment, member.torque,
        np.abs(member.axial))))


# --- fatigue ------------------------------------------------------------------------------

def part_fatigue_strength(unit: MemberUnit, materials, demand, scale):
    """S_f of the part at the required life, Pa: Marin's k_a and k_b on the specimen's
    fatigue strength, then the S-N line (:mod:`service.core.loading.fatigue`)."""
    member: MemberDemand = demand.member
    depth = unit.depth_ratio * scale
    if unit.round:
        k_b = size_factor(depth, rotating=member.rotating)
    else:
        k_b = size_factor(depth, rotating=False, shape="rectangle",
                          width=unit.width_ratio * scale)
    part = materials.surface_factor * k_b * materials.fatigue_strength
    return fatigue_strength_at(np.maximum(member.fatigue_cycles, 1.0),
                               materials.ultimate_strength, part, materials.fatigue_cycles,
                               materials.endurance_limit > 0)


# --- the recheck: exact, from actual dimensions -------------------------------------------

@dataclass(frozen=True)
class MemberActions:
    """What a general member carries at its actual dimensions (arrays of the sections' shape).

    Attributes:
        strength: combined-stress utilization (safety factor included).
        equivalent_stress: the peak equivalent stress, Pa (von Mises, or the largest
            principal stress of a brittle material).
        bending_stress: peak |N| / A (compression) + |M| / Z, Pa (for local buckling).
        compression_stress: |N| / A of an axial compression, Pa (0 without one).
        axial_stress: N / A, Pa, positive tension (0 without an axial force).
        torsion_stress: peak |T| / Q, Pa. shear_stress: peak |V| / A_s, Pa.
        deflection: peak deflection, m. twist: peak angle of twist, rad.
        frequency: first bending frequency (Dunkerley), Hz; NaN where not required.
        fatigue: modified Goodman utilization (0 where not required).
        moment: peak |M| of the loads and the self-weight, N m (member buckling).
    """

    strength: np.ndarray
    equivalent_stress: np.ndarray
    bending_stress: np.ndarray
    compression_stress: np.ndarray
    axial_stress: np.ndarray
    torsion_stress: np.ndarray
    shear_stress: np.ndarray
    deflection: np.ndarray
    twist: np.ndarray
    frequency: np.ndarray
    fatigue: np.ndarray
    moment: np.ndarray


def _rows_last(value, rows: int):
    value = np.asarray(value, dtype=float)
    return np.moveaxis(value, 0, -1) if rows > 1 and value.ndim >= 2 else value


def _rows_first(value, rows: int):
    value = np.asarray(value)
    return np.moveaxis(value, -1, 0) if rows > 1 and value.ndim >= 2 else value


def member_actions(unit: MemberUnit, materials, demand) -> MemberActions:
    """Every member quantity of actual sections ``unit`` (properties at their true size) for
    ``materials`` and ``demand`` (one case, or rows: then the row axis comes first)."""
    member: MemberDemand = demand.member
    applied, unit_pieces = member.per_case(member.pieces), member.per_case(member.unit_pieces)
    rows = applied.start.shape[0]

    def last(value):
        return _rows_last(value, rows)

    area, second_moment = last(unit.area), last(unit.second_moment)
    modulus, torsion_modulus = last(unit.section_modulus), last(unit.torsion_modulus)
    torsion_constant, shear_area = last(unit.torsion_constant), last(unit.shear_area)
    density = last(materials.density)
    mass_per_length = density * area
    weight = mass_per_length * STANDARD_GRAVITY * float(demand.self_weight)
    section = SectionArrays(area, modulus, torsion_modulus, shear_area, mass_per_length)
    factor = np.asarray(demand.safety_factor, dtype=float).reshape(-1)   # (rows,) or (1,)
    strength = last(materials.strength)
    fibre_strength = last(materials.compression_strength)     # the weaker fibre's
    brittle = last(materials.brittle) > 0
    shear_strength = last(materials.shear_strength)
    e_i = last(materials.youngs_modulus) * second_moment
    g_k = last(materials.shear_modulus) * torsion_constant
    held = member.supports != "cantilever"
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        # E I / (G k A), m^2: the shear deflection line's weight (Timoshenko)
        flexibility = e_i / (last(materials.shear_modulus) * last(unit.shear_stiffness_area))
        if not demand.self_weight and not member.flags & {"torque", "axial"}:
            # transverse loads alone, no self-weight: the lines do not depend on the
            # section, so the member's own peaks are exact, and no stresses combine (the
            # fibre carries M / Z alone, the neutral axis V / A_s alone)
            numbers = _row_demand(demand, rows).member
            moment, shear = numbers.moment, numbers.shear
            torque = np.zeros(np.shape(moment))
            neutral = np.where(brittle, 1.0, math.sqrt(3.0)) * shear / shear_area
            equivalent = np.maximum(moment / modulus, neutral)
            combined = factor * np.maximum(moment / modulus / fibre_strength,
                                           neutral / strength)
            shear_ratio = factor * shear / shear_area / shear_strength
            deflection = np.abs(member_peak(deflection_peaks(
                applied, flexibility, held_at_both_ends=held))[0]) / e_i
            twist = numbers.twist / g_k
        else:
            combined = strength_utilization(applied, unit_pieces, section, strength,
                                            factor[:, None], brittle, fibre_strength,
                                            demand.self_weight)
            # the peak equivalent stress itself: the ratio's, unless a weaker compression
            # side shares the ratio out between two strengths
            equivalent = (strength_utilization(applied, unit_pieces, section, 1.0, 1.0,
                                               brittle, None, demand.self_weight)
                          if np.any(fibre_strength != strength)
                          else combined * strength / factor)
            pieces = with_uniform(applied, unit_pieces, weight)
            # shear at the neutral axis against the shear strength, piece by piece
            piece_shear = (np.abs(shear_peaks(pieces)[0]) / shear_area[..., None]
                           + np.abs(pieces.torque) / torsion_modulus[..., None])
            shear_ratio = (factor[:, None] * piece_shear
                           / shear_strength[..., None]).max(axis=-1)
            moment = np.abs(member_peak(moment_peaks(pieces))[0])
            shear = np.abs(member_peak(shear_peaks(pieces))[0])
            torque = np.abs(pieces.torque).max(axis=-1, initial=0.0)
            deflection = np.abs(member_peak(deflection_peaks(
                pieces, flexibility, held_at_both_ends=held))[0]) / e_i
            twist = np.abs(member_peak(twist_peaks(pieces))[0]) / g_k
        ratio = np.maximum(combined, shear_ratio)
        axial = np.asarray(applied.axial, dtype=float)[..., 0]
        compression = np.maximum(-axial, 0.0)
        bending_stress = compression / area + moment / modulus
        if "compression" in member.flags:
            deflection = deflection * amplification(
                compression, np.pi**2 * e_i / (end_length(member.supports)
                                               * np.asarray(demand.span, dtype=float)
                                               .reshape(-1)) ** 2)
        frequency = np.full(np.shape(ratio), np.nan)
        if member.checks_frequency:
            frequency = dunkerley_frequency(
                member.per_case(member.masses), e_i, mass_per_length,
                last(materials.shear_modulus) * last(unit.shear_stiffness_area),
                last(materials.youngs_modulus) * area)
        fatigue = np.zeros(np.shape(ratio))
        if member.checks_fatigue:
            fatigue = _exact_fatigue(unit, materials, demand, section, rows)
    shape = np.broadcast_shapes(*(np.shape(x) for x in (ratio, deflection, frequency,
                                                        fatigue, bending_stress)))

    def first(value):
        return _rows_first(np.broadcast_to(value, shape), rows)

    return MemberActions(
        strength=first(ratio), equivalent_stress=first(equivalent),
        bending_stress=first(bending_stress),
        compression_stress=first(compression / area), axial_stress=first(axial / area),
        torsion_stress=first(torque / torsion_modulus),
        shear_stress=first(shear / shear_area), deflection=first(deflection),
        twist=first(twist), frequency=first(frequency), fatigue=first(fatigue),
        moment=first(moment),
    )


def _exact_fatigue(unit: MemberUnit, materials, demand, section: SectionArrays, rows: int):
    """Modified Goodman over every piece (:func:`service.core.loading.utilization
    .fatigue_utilization`), with the part's fatigue strength at its actual size."""
    member: MemberDemand = demand.member

    def last(value):
        return _rows_last(value, rows)

    at_size = dataclasses.replace(
        unit, **{name: last(getattr(unit, name)) for name in ("depth_ratio", "width_ratio")})
    lasting = _LastMaterials(materials, rows)
    strength = part_fatigue_strength(at_size, lasting, _row_demand(demand, rows), 1.0)
    factor = np.asarray(demand.safety_factor, dtype=float).reshape(-1)[:, None]
    ratio = fatigue_utilization(member.per_case(member.mean_pieces),
                                member.per_case(member.alternating_pieces), section,
                                strength, lasting.ultimate_strength, factor,
                                member.rotating, demand.self_weight)
    cycles = np.asarray(member.fatigue_cycles, dtype=float).reshape(-1)
    return np.where(cycles > 0, ratio, 0.0)


class _LastMaterials:
    """Material values with the row axis moved last (see :func:`_rows_last`)."""

    def __init__(self, materials, rows: int):
        self._materials, self._rows = materials, rows

    def __getattr__(self, name):
        return _rows_last(getattr(self._materials, name), self._rows)


def _row_demand(demand, rows: int):
    """The demand with its member numbers as flat (rows,) arrays (broadcasting against a
    last row axis)."""
    member = demand.member.map_numbers(lambda value: np.asarray(value).reshape(-1),
                                       lambda index: index)
    return demand.replace(member=member)


def member_diagrams(family, dimensions: dict, values, row: int, demand) -> dict[str, list]:
    """The diagrams of one design (contract names, SI lists): its own E I and self-weight on
    the case's loading (:func:`service.core.loading.diagrams.diagrams`)."""
    from service.core.loading.diagrams import diagrams
    from service.core.sizing.unit_bounds import timoshenko_area

    member: MemberDemand = demand.member
    dims = {name: np.asarray(value, dtype=float) for name, value in dimensions.items()}
    area, second_moment, _ = family.sizing_properties(dims, "bending")
    e_i = float(values.youngs_modulus[row]) * float(second_moment)
    weight = (float(values.density[row]) * float(area) * STANDARD_GRAVITY
              if demand.self_weight else 0.0)
    # the deflection with its Timoshenko shear part, E I / (G k A)
    flexibility = e_i / (float(values.shear_modulus[row]) * float(timoshenko_area(
        family, dims, float(values.poisson_ratio[row]))))
    lines = diagrams(member.loading, np.array([e_i]), np.array([weight]),
                     shear_flexibility=np.array([flexibility]))
    return {name: [float(v) for v in np.asarray(getattr(lines, name))[0]]
            for name in ("x", "shear", "moment", "torque", "axial", "deflection")}
