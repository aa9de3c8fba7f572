"""The member buckling check of one load case: one utilisation for beams, columns and
beam-columns, from the modules of this package.

- bending case without axial compression: |M| / M_b (lateral-torsional buckling,
  ``lateral_torsional``), plus N / N_t for a tension (``beam_column.interaction``).
- bending case with axial compression: the beam-column interaction, the moment amplified
  by the Euler load in the plane of bending and the compression set against the column
  resistance about the weaker axis, both with the effective length of the case's supports
  (``columns.BENDING_END_CONDITIONS``).
- column: P / N_b about the weaker axis with the column's end conditions, N_b = chi A_eff f
  with the effective area of slender walls (``MemberMaterial.area_ratio``; the gross area
  elsewhere), as the compression of a beam-column.
- tie: no member buckling (the tension strength and extension are the tie's own checks).
- sandwich panel: not modelled (the family carries bending only, across its wide panel).

Every action is factored (the load times the safety factor) by the caller; every resistance
here is unfactored. Utilisation <= 1 where the member holds. ``strength`` is the design
strength on the compression side (where a material's compressive strength is lower than its
tensile one, the caller passes the lower). A continuous lateral restraint removes
lateral-torsional buckling; the compression of a beam-column is still checked against
buckling about the weaker axis (conservative: the restraint may prevent that too).
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass

import numpy as np

from service.core.sections.base import Dimensions, SectionFamily
from service.core.stability.beam_column import interaction
from service.core.stability.buckling_curves import (
    column_curve,
    curve_arrays,
    lateral_torsional_curve,
)
from service.core.stability.columns import (
    BENDING_END_CONDITIONS,
    EFFECTIVE_LENGTH_FACTORS,
    column_resistance,
    euler_load,
)
from service.core.stability.critical_moment import MOMENT_FACTORS
from service.core.stability.lateral_properties import (
    LateralTorsionalProperties,
    lateral_torsional_properties,
)
from service.core.stability.lateral_torsional import LateralTorsional
from service.core.stability.ties import tension_resistance


@dataclass(frozen=True)
class MaterialCurves:
    """The buckling curves of several materials for one section family, arrays of shape
    ``(materials,)`` (reshape them to broadcast along the materials axis).

    Attributes:
        column_imperfection, column_plateau: alpha and lambda_0 of the column curves.
        lateral_imperfection, lateral_plateau: alpha_LT and lambda_0,LT.
    """

    column_imperfection: np.ndarray
    column_plateau: np.ndarray
    lateral_imperfection: np.ndarray
    lateral_plateau: np.ndarray

    def reshaped(self, shape: tuple[int, ...]) -> MaterialCurves:
        """The same curves with every array reshaped (e.g. ``(-1, 1)`` for a materials axis
        in front of a sections axis)."""
        return MaterialCurves(*(np.reshape(getattr(self, name), shape)
                                for name in self.__dataclass_fields__))


def material_curves(material_families: Sequence[str], section_family: str) -> MaterialCurves:
    """The column and lateral-torsional curves of each material family (``buckling_curves``)."""
    column = curve_arrays([column_curve(name, section_family) for name in material_families])
    lateral = curve_arrays([lateral_torsional_curve(name, section_family)
                            for name in material_families])
    return MaterialCurves(*column, *lateral)


@dataclass(frozen=True)
class MemberMaterial:
    """The material constants member buckling reads, arrays along a materials axis.

    Attributes:
        youngs_modulus: E, Pa.
        shear_modulus: G, Pa.
        strength: f, the design strength, Pa.
        curves: the materials' buckling curves, shaped like the other fields.
        area_ratio: A / A_eff (>= 1) of the walls in uniform compression (EN 1993-1-5
            4.3(3)): a slender-walled section's squash load is A_eff f and its flexural
            buckling resistance chi A_eff f with lambda = sqrt(A_eff f / N_cr) (EN 1993-1-1
            6.3.1.1 eq. 6.48, 6.3.1.2 eq. 6.50, class 4). It depends on the walls'
            proportions and the material, not on the scale, so it stays fixed along a
            scale search; 1 where no effective width applies.
    """

    youngs_modulus: np.ndarray | float
    shear_modulus: np.ndarray | float
    strength: np.ndarray | float
    curves: MaterialCurves
    area_ratio: np.ndarray | float = 1.0

    def at(self, take: FlatTake) -> MemberMaterial:
        """The elements ``take`` picks of these values (as :meth:`MemberSection.at`)."""
        curves = self.curves
        return MemberMaterial(
            take(self.youngs_modulus), take(self.shear_modulus), take(self.strength),
            MaterialCurves(*(take(getattr(curves, name))
                             for name in MaterialCurves.__dataclass_fields__)),
            take(self.area_ratio))


class FlatTake:
    """Values broadcast to ``shape``, at the flat positions ``index`` (integers into the
    C-ordered elements of ``shape``, as ``np.flatnonzero`` gives), each of the index's shape:
    gathered from the flattened array, several times faster than a tuple of index arrays
    over a broadcast view (measured on 2.6 million elements: 3 against 18 ms). A value of
    that shape is read directly (as it is where the index takes every element), a scalar
    repeated, and a smaller value (a materials column against materials x proportions) read
    at its own positions, found once per shape for every value taken alike (flattening its
    broadcast view would copy it whole)."""

    def __init__(self, shape: tuple[int, ...], index: np.ndarray) -> None:
        self.shape, self.index = shape, index
        self.every = index.size == math.prod(shape)     # (the index is then 0, 1, 2, ...)
        self._positions: dict[tuple[int, ...], np.ndarray] = {}

    def __call__(self, value) -> np.ndarray:
        array = np.asarray(value)
        if array.ndim == 0:
            return np.full(np.shape(self.index), array)
        if array.shape == self.shape:
            return array.reshape(-1) if self.every else array.reshape(-1).take(self.index)
        positions = self._positions.get(array.shape)
        if positions is None:
            positions = self._positions[array.shape] = self._positions_in(array.shape)
        return array.reshape(-1).take(positions)

    def _positions_in(self, shape: tuple[int, ...]) -> np.ndarray:
        """The flat positions in an array of ``shape`` of the elements at ``index``."""
        own = (1,) * (len(self.shape) - len(shape)) + shape
        if len(own) != len(self.shape) or any(
                n not in (1, size) for n, size in zip(own, self.shape, strict=True)):
            raise ValueError(f"shape {shape} does not broadcast to {self.shape}")
        same = [n == size for n, size in zip(own, self.shape, strict=True)]
        ones = [n == 1 for n in own]
        for split in range(len(own) + 1):
            if all(same[:split]) and all(ones[split:]):     # a leading block: a quotient
                return self.index // math.prod(self.shape[split:])
            if all(ones[:split]) and all(same[split:]):     # a trailing block: a remainder
                return self.index % math.prod(own)
        coordinates = np.unravel_index(self.index, self.shape)
        return np.ravel_multi_index(
            tuple(c if n > 1 else 0 for c, n in zip(coordinates, own, strict=True)), own)


@dataclass(frozen=True)
class MemberSection:
    """What member buckling reads of a section, arrays of one shape ``S``.

    Attributes:
        area: A, m^2.
        second_moment_major: I_y, m^4 (the plane of bending).
        section_modulus_major: Z, elastic, m^3.
        lateral: the lateral-torsional constants (I_z, I_t, I_w, top height, susceptible).
    """

    area: np.ndarray
    second_moment_major: np.ndarray
    section_modulus_major: np.ndarray
    lateral: LateralTorsionalProperties

    @classmethod
    def of(cls, family: SectionFamily, dims: Dimensions) -> MemberSection:
        """The constants of the family's sections ``dims`` (m, shape ``S``)."""
        props = family.properties(dims)
        return cls(props.area, props.second_moment_major, props.section_modulus_major,
                   lateral_torsional_properties(family, dims, props))

    def at(self, take: FlatTake) -> MemberSection:
        """The elements ``take`` picks of these constants (:class:`FlatTake`: flat
        positions of a broadcast shape), each field of its index's shape."""
        lateral = self.lateral
        return MemberSection(
            take(self.area), take(self.second_moment_major), take(self.section_modulus_major),
            LateralTorsionalProperties(*(take(getattr(lateral, name))
                                         for name in lateral.__dataclass_fields__)))

    def scaled(self, scale) -> MemberSection:
        """The same proportions at ``scale`` times every dimension: A ~ s^2, I and I_t ~ s^4,
        Z ~ s^3, I_w ~ s^6, the load height ~ s (exact for every family)."""
        s = np.asarray(scale, dtype=float)
        square = s * s
        fourth = square * square       # products, not power(): several times cheaper
        lateral = self.lateral
        return MemberSection(
            self.area * square, self.second_moment_major * fourth,
            self.section_modulus_major * (square * s),
            LateralTorsionalProperties(
                minor_second_moment=lateral.minor_second_moment * fourth,
                torsion_constant=lateral.torsion_constant * fourth,
                warping_constant=lateral.warping_constant * (fourth * square),
                top_load_height=lateral.top_load_height * s,
                susceptible=lateral.susceptible))


def member_buckling_utilization(
    family: SectionFamily, dims: Dimensions, material: MemberMaterial, load_case: str, span,
    **actions,
) -> np.ndarray | None:
    """The member buckling utilisation of the family's sections ``dims`` (m, shape ``S``),
    or None for a tie or a family whose member buckling is not modelled (sandwich panel);
    ``actions`` as for :func:`member_utilization`."""
    if load_case == "tie" or "compression" not in family.loadings:
        return None
    return member_utilization(MemberSection.of(family, dims), material, load_case, span,
                              **actions)


def member_utilization(
    section: MemberSection, material: MemberMaterial, load_case: str, span,
    *, moment=0.0, axial_force=0.0, end_conditions: str | None = None,
    restraint: str = "none", load_position: str = "shear_centre", about_minor=None,
) -> np.ndarray:
    """The member buckling utilisation (see the module docstring) of a column or a beam.

    Args:
        section: the section's constants (shape ``S``).
        material: E, G, f and curves, broadcastable with ``S`` (a materials axis).
        load_case: a bending load case id or ``"column"``.
        span: L, m.
        moment: the factored peak first-order |M| of a bending case, N m.
        axial_force: the factored axial force, N, positive tension (a column's load is a
            compression: pass it negative).
        end_conditions: a key of ``columns.EFFECTIVE_LENGTH_FACTORS`` (columns only).
        restraint: ``"none"`` or ``"continuous"`` lateral restraint (bending cases).
        load_position: ``"shear_centre"`` or ``"top"`` (bending cases).
        about_minor: the axis of the compression's flexural buckling
            (:func:`flexural_resistance`): None for the weaker (the check).

    Returns:
        Utilisation in the broadcast shape of every argument.
    """
    return member_check(material, load_case, span, axial_force=axial_force,
                        end_conditions=end_conditions, restraint=restraint,
                        load_position=load_position, about_minor=about_minor)(section, moment)


def member_check(
    material: MemberMaterial, load_case: str, span, *, axial_force=0.0,
    end_conditions: str | None = None, restraint: str = "none",
    load_position: str = "shear_centre", about_minor=None,
) -> Callable[[MemberSection, np.ndarray | float], np.ndarray]:
    """:func:`member_utilization` as a function of the sections and the moment, (section,
    moment) -> utilisation, with what depends on the material, the load case and the axial
    force alone computed once: a scale search evaluates it at many scales of the same
    sections (arguments as for :func:`member_utilization`)."""
    if load_case == "column":
        if end_conditions not in EFFECTIVE_LENGTH_FACTORS:
            raise ValueError(f"unknown end conditions {end_conditions!r}")
        column_factor = EFFECTIVE_LENGTH_FACTORS[end_conditions]
        compression = np.maximum(-np.asarray(axial_force, dtype=float), 0.0)

        def column(section: MemberSection, moment) -> np.ndarray:
            return compression / flexural_resistance(section, material, span, column_factor,
                                                     about_minor)
        return column
    curves = material.curves
    lateral = LateralTorsional.of(
        MOMENT_FACTORS[load_case], span, material.youngs_modulus, material.shear_modulus,
        material.strength, curves.lateral_imperfection, curves.lateral_plateau,
        load_position=load_position, restraint=restraint)
    factor = EFFECTIVE_LENGTH_FACTORS[BENDING_END_CONDITIONS[load_case]]

    def beam(section: MemberSection, moment) -> np.ndarray:
        resistance = lateral.resistance(section.section_modulus_major, section.lateral)
        return beam_column_utilization(section, material, span, factor, moment, axial_force,
                                       resistance.moment_resistance, about_minor)
    return beam


def flexural_resistance(section: MemberSection, material: MemberMaterial, span,
                        effective_length_factor, about_minor=None) -> np.ndarray:
    """N_b = chi A_eff f (N) of flexural buckling on the effective length K L (``columns``)
    about the weaker axis, or, with ``about_minor`` (bools broadcasting with the section),
    about the minor axis where true and the major where false; the effective area
    A / ``material.area_ratio`` (:class:`MemberMaterial`).

    N_b rises with I at a fixed area, so about the weaker axis it is the smaller of the two
    axes': the smallest scale that holds it is the larger of the two axes' smallest scales,
    each smooth in the proportions where their minimum has a kink (a square box, where the
    weaker axis changes), which is why a search over the proportions reads them apart."""
    second_moment = (np.minimum(section.second_moment_major,
                                section.lateral.minor_second_moment) if about_minor is None
                     else np.where(about_minor, section.lateral.minor_second_moment,
                                   section.second_moment_major))
    curves = material.curves
    return column_resistance(
        span, effective_length_factor, material.youngs_modulus, material.strength,
        section.area / material.area_ratio, second_moment,
        curves.column_imperfection, curves.column_plateau).resistance


def beam_column_utilization(section: MemberSection, material: MemberMaterial, span,
                            effective_length_factor, moment, axial_force, moment_resistance,
                            about_minor=None) -> np.ndarray:
    """The interaction of ``beam_column`` for a member bent by the factored peak ``moment``
    (N m) with the factored ``axial_force`` (N, positive tension) and the buckling
    resistance moment M_b (``moment_resistance``, N m): the compression against the column
    resistance about the weaker axis (or as ``about_minor`` says: :func:`flexural_resistance`)
    and the Euler load in the plane of bending, both on the effective length K L of the
    supports (``effective_length_factor``). Only the compression's term reads
    ``about_minor`` and the effective area, and it rises as either resistance falls: the
    interaction is the largest over the axes and over the pieces of the effective area (the
    smooth parts of a scale search, ``sizing.checks.member_buckling``)."""
    force = np.asarray(axial_force, dtype=float)
    if not np.count_nonzero(force):     # a beam: the bending term alone (no axial resistance read)
        return interaction(force, moment, np.inf, np.inf, moment_resistance, np.inf)
    compression_resistance: np.ndarray | float
    in_plane: np.ndarray | float
    if (force < 0.0).any():
        compression_resistance = flexural_resistance(section, material, span,
                                                     effective_length_factor, about_minor)
        in_plane = euler_load(material.youngs_modulus, section.second_moment_major, span,
                              effective_length_factor)
    else:   # no compression anywhere: neither resistance enters the interaction
        compression_resistance = in_plane = np.inf
    return interaction(axial_force, moment, tension_resistance(section.area, material.strength),
                       compression_resistance, moment_resistance, in_plane)
