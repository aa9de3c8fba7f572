"""Closed thin- and thick-walled tubes: round tube and rectangular (box) tube."""

from __future__ import annotations

import numpy as np

from service.core.sections import orthotropic
from service.core.sections.base import (
    Dimension,
    Dimensions,
    Elastic,
    LocalBuckling,
    ProportionRule,
    RatioBound,
    SectionFamily,
    SectionProperties,
)
from service.core.sections.buckling import element_buckling_stress
from service.core.sections.flexure_shear import round_tube_peak_shear_area
from service.core.sections.orthotropic import OrthotropicElastic

BENDING_KNOCKDOWN_AMPLITUDE = 0.731
"""NASA SP-8007 (1968 rev.), Buckling of Thin-Walled Circular Cylinders, bending correlation
gamma = 1 - 0.731 (1 - exp(-phi)), phi = sqrt(r/t)/16, for r/t < 1500 (from memory)."""

TORSION_KNOCKDOWN = 0.67
"""NASA SP-8007 (1968 rev.) correlation factor for cylinders in torsion (from memory)."""

class RoundTube(SectionFamily):
    """Round tube of outer diameter D and wall t (exact thick-walled formulas).

    A = pi (D^2 - d^2)/4, I = pi (D^4 - d^4)/64, Z = 2 I / D, plastic modulus (D^3 - d^3)/6,
    K = J = 2 I and Q = J / (D/2), d = D - 2t: exact elasticity for a circular annulus
    (Roark's Formulas for Stress and Strain, 7th ed., appendix A and table 10.7, from memory).

    Local buckling (see :meth:`local_buckling`): classical cylinder bifurcation with the
    NASA SP-8007 knockdowns, and Brazier's ovalization limit in bending.
    """

    id = "round_tube"
    description = "Round tube (closed circular hollow section)"
    dimensions = (
        Dimension("outer_diameter", "Outside diameter, m"),
        Dimension("wall", "Wall thickness, m"),
    )
    loadings = ("bending", "torsion", "tension", "compression")
    scale_dimension = "outer_diameter"
    ratio_bounds = (
        RatioBound("wall", 0.005, 0.5, "common practice (tube catalogues; 0.5 is solid)",
                   widest_low=1.0 / 3000.0, widest_source=(
                       "the NASA SP-8007 buckling correlation holds for r/t < 1500, i.e. "
                       "wall/outer_diameter > 1/3000 (from memory); 0.5 is a solid bar")),
    )
    depth_dimension = "outer_diameter"
    width_dimension = "outer_diameter"
    wall_dimensions = ("wall",)
    rules = (
        ProportionRule(
            "wall",
            ("outer_diameter", "wall"),
            lambda d, t: t < d / 2.0,
            "must be less than half of outer_diameter",
            lambda d, t: (np.log(d / (2.0 * t)),),
        ),
    )

    def properties(self, dims: Dimensions) -> SectionProperties:
        outer, wall = self.arrays(dims)
        inner = outer - 2.0 * wall
        second_moment = np.pi * (outer**4 - inner**4) / 64.0
        section_modulus = 2.0 * second_moment / outer
        return SectionProperties(
            area=np.pi * (outer**2 - inner**2) / 4.0,
            second_moment_major=second_moment,
            second_moment_minor=second_moment,
            section_modulus_major=section_modulus,
            section_modulus_minor=section_modulus,
            plastic_modulus_major=(outer**3 - inner**3) / 6.0,
            torsion_constant=2.0 * second_moment,
            torsion_modulus=2.0 * section_modulus,
        )

    def local_buckling(
        self, dims: Dimensions, material: Elastic | OrthotropicElastic,
        core: Elastic | None = None, shear_area=None
    ) -> LocalBuckling:
        """Wall buckling of the tube, as critical peak stresses.

        Bending: the lower of (a) the classical axial bifurcation stress of the mid-surface,
        E t / (r sqrt(3 (1 - nu^2))) (Timoshenko & Gere sec. 11.4), times the SP-8007 bending
        knockdown; (b) Brazier's ovalization limit moment over Z. Members are long tubes
        (span many times r sqrt(r/t)), where ovalization precedes bifurcation, so (b) is kept;
        it governs for r/t between about 10 and 250 and is the conservative choice.
        Torsion: the long-cylinder result times the SP-8007 torsion knockdown. Both
        mid-surface stresses are divided by the mid-surface/peak ratio r / (D/2).
        The three classical values are computed in their orthotropic forms (Donnell
        orthotropic cylinder, Brazier and the long-tube torsion limit with the wall's own
        stiffnesses, :mod:`~service.core.sections.orthotropic`), which are the formulas above
        for an isotropic wall; an
        :class:`~service.core.sections.orthotropic.OrthotropicElastic` material (fibres
        along the tube) takes them under the same knockdowns (SP-8007 applies them to orthotropic
        cylinders with the same equivalent thickness, see
        :func:`~service.core.sections.orthotropic.cylinder_axial_stress`).
        """
        outer, wall = self.arrays(dims)
        radius = 0.5 * (outer - wall)
        midsurface_ratio = 2.0 * radius / outer
        phi = np.sqrt(radius / wall) / 16.0
        bending_knockdown = 1.0 - BENDING_KNOCKDOWN_AMPLITUDE * (1.0 - np.exp(-phi))
        wall_material = orthotropic.as_orthotropic(material)
        classical = orthotropic.cylinder_axial_stress(wall_material, wall, radius)
        brazier_moment = orthotropic.brazier_moment(wall_material, wall, radius)
        torsion = TORSION_KNOCKDOWN * orthotropic.long_cylinder_torsion_stress(
            wall_material, wall, radius)
        return LocalBuckling(
            bending=np.minimum(
                bending_knockdown * classical / midsurface_ratio,
                brazier_moment / self.properties(dims).section_modulus_major,
            ),
            torsion=torsion / midsurface_ratio,
            # Transverse shear buckling of a long tube is about 1.25 times the torsional value
            # (Roark's Formulas for Stress and Strain, table 15.2, from memory): the torsional
            # value is taken, conservative, against the peak shear at the neutral axis.
            shear=torsion,
        )

    def shear_area(self, dims: Dimensions, second_moment=None) -> np.ndarray:
        """A / k, k the peak-to-mean transverse shear of a tube from the exact flexure solution
        at nu = 0.3 (:func:`~service.core.sections.flexure_shear.round_tube_peak_shear_area`;
        2 for a thin tube, rising with the wall: the peak is at the bore). Sizing uses the
        material's own nu (``sizing.unit_bounds.peak_shear_area``)."""
        return round_tube_peak_shear_area(dims, 0.3)


class RectangularTube(SectionFamily):
    """Rectangular (box) tube with sharp corners: depth h in the plane of bending, width b,
    uniform wall t.

    A, I, Z and the plastic modulus are exact for the sharp-cornered outline (difference of
    two rectangles). Torsion: Bredt-Batho on the wall mid-line (enclosed area
    A_m = (b - t)(h - t), mid-line perimeter p = 2 (b + h - 2t)) with the thick-wall
    correction of EN 10219-2:2006 annex B (from memory; corner radius set to 0):

        K = t^3 p / 3 + 4 A_m^2 t / p,     Q = K / (t + 2 A_m / p)

    The first term is the open-wall Saint-Venant part Bredt-Batho omits; Q is the peak wall
    stress away from the corners (the sharp re-entrant inner corners are stress
    singularities; real tubes have corner radii).
    """

    id = "rectangular_tube"
    description = "Rectangular tube (closed box section); depth lies in the plane of bending"
    dimensions = (
        Dimension("depth", "Outside size in the plane of bending, m"),
        Dimension("width", "Outside size across the plane of bending, m"),
        Dimension("wall", "Wall thickness, m"),
    )
    loadings = ("bending", "torsion", "tension", "compression")
    scale_dimension = "depth"
    ratio_bounds = (
        RatioBound("width", 0.25, 4.0, "common practice (hollow section catalogues)",
                   widest_high=10.0, widest_source=(
                       "narrower than 1:4 a box may buckle laterally (checked by the "
                       "sizing as member_buckling); wider than 10:1 it is a panel: shear "
                       "lag and transverse plate bending, not modelled here, matter (from "
                       "memory)")),
        RatioBound(
            "wall",
            0.005,
            0.5,
            "common practice; the geometry rule wall < min(depth, width)/2 also applies",
            widest_low=0.001,
            widest_source=(
                "flat-plate buckling of every wall is checked at any slenderness (Timoshenko & "
                "Gere ch. 9, from memory); 0.001 of the depth keeps the 0.001 mm rounding "
                "small against the wall of members over 1 mm deep (common practice)"),
        ),
    )
    depth_dimension = "depth"
    width_dimension = "width"
    wall_dimensions = ("wall",)
    lateral_edge = ("width", 1.0)   # the square tube: I_z = I_y
    rules = (
        ProportionRule(
            "wall",
            ("depth", "width", "wall"),
            lambda h, b, t: t < np.minimum(h, b) / 2.0,
            "must be less than half of the smaller of depth and width",
            lambda h, b, t: (np.log(h / (2.0 * t)), np.log(b / (2.0 * t))),
        ),
    )

    def properties(self, dims: Dimensions) -> SectionProperties:
        depth, width, wall = self.arrays(dims)
        inner_depth = depth - 2.0 * wall
        inner_width = width - 2.0 * wall
        major = _box_second_moment(depth, width, wall)
        minor = _box_second_moment(width, depth, wall)
        torsion_constant, torsion_modulus = _box_torsion(depth, width, wall)
        return SectionProperties(
            area=width * depth - inner_width * inner_depth,
            second_moment_major=major,
            second_moment_minor=minor,
            section_modulus_major=2.0 * major / depth,
            section_modulus_minor=2.0 * minor / width,
            plastic_modulus_major=(width * depth**2 - inner_width * inner_depth**2) / 4.0,
            torsion_constant=torsion_constant,
            torsion_modulus=torsion_modulus,
        )

    def sizing_properties(self, dims: Dimensions, loading: str
                          ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        if loading != "bending":
            return super().sizing_properties(dims, loading)
        depth, width, wall = self.arrays(dims)    # without the minor axis and torsion
        major = _box_second_moment(depth, width, wall)
        area = width * depth - (width - 2.0 * wall) * (depth - 2.0 * wall)
        return area, major, 2.0 * major / depth

    def local_buckling(
        self, dims: Dimensions, material: Elastic | OrthotropicElastic,
        core: Elastic | None = None, shear_area=None
    ) -> LocalBuckling:
        """Flat-wall buckling, plate widths on the wall mid-line (b - t, h - t).

        Bending: the compression flange (internal element, uniform compression, k = 4.0) or
        a web (internal element in pure bending, k = 23.9), whichever is lower, over the
        mid-line/peak stress ratio (h - t)/h. Edges taken as simply supported (the corner
        restraint is ignored, conservative). Torsion: the widest wall in shear (k = 5.34,
        long plate) under the Bredt shear flow, over that wall stress's ratio to the peak,
        Q / (2 A_m t). An :class:`~service.core.sections.orthotropic.OrthotropicElastic`
        material (fibres along the member) takes the orthotropic long-plate formulas.
        """
        depth, width, wall = self.arrays(dims)
        to_peak = depth / (depth - wall)
        flange = element_buckling_stress("internal_compression", material, wall, width - wall)
        web = element_buckling_stress("internal_bending", material, wall, depth - wall)
        # Every wall carries the same Bredt shear flow: the wider walls buckle first.
        enclosed = (width - wall) * (depth - wall)
        # the peak stress T / Q over the Bredt wall stress T / (2 A_m t)
        peak_to_bredt = 2.0 * enclosed * wall / _box_torsion(depth, width, wall)[1]
        web_shear = element_buckling_stress("internal_shear", material, wall, depth - wall)
        depth_wall_shear = web_shear * peak_to_bredt
        width_wall_shear = (
            element_buckling_stress("internal_shear", material, wall, width - wall) * peak_to_bredt)
        # Transverse shear: both webs (height h - t, k = 5.34) at their mean stress
        # V / (2 t (h - t)), over that stress's ratio to the peak V / A_s.
        return LocalBuckling(
            bending=np.minimum(flange, web) * to_peak,
            torsion=np.minimum(depth_wall_shear, width_wall_shear),
            shear=web_shear * 2.0 * wall * (depth - wall) / (
                self.shear_area(dims) if shear_area is None else shear_area),
            bending_modes=(flange * to_peak, web * to_peak),
            torsion_modes=(depth_wall_shear, width_wall_shear),
        )

    def shear_area(self, dims: Dimensions, second_moment=None) -> np.ndarray:
        """I 2t / S with S = (b h^2 - (b - 2t)(h - 2t)^2) / 8 the first moment of the half
        section about the neutral axis: tau = V S / (I 2t) in the two webs (elementary beam
        theory, Timoshenko & Gere, Mechanics of Materials, sec. 5.10, from memory)."""
        depth, width, wall = self.arrays(dims)
        first_moment = (width * depth**2 - (width - 2.0 * wall) * (depth - 2.0 * wall) ** 2) / 8.0
        if second_moment is None:
            second_moment = _box_second_moment(depth, width, wall)
        return second_moment * 2.0 * wall / first_moment


def _box_torsion(depth, width, wall):
    """K and Q of a box (Bredt-Batho with the thick-wall term, see RectangularTube)."""
    enclosed = (width - wall) * (depth - wall)
    perimeter = 2.0 * (width + depth - 2.0 * wall)
    constant = wall**3 * perimeter / 3.0 + 4.0 * enclosed**2 * wall / perimeter
    return constant, constant / (wall + 2.0 * enclosed / perimeter)


def _box_second_moment(depth, width, wall):
    """I of a box about the axis across ``depth``: (b h^3 - b_i h_i^3) / 12, m^4."""
    return (width * depth**3 - (width - 2.0 * wall) * (depth - 2.0 * wall) ** 3) / 12.0
