"""Solid sections: round bar and rectangular bar. No local buckling mode."""

from __future__ import annotations

import numpy as np

from service.core.sections.base import (
    Dimension,
    Dimensions,
    Elastic,
    LocalBuckling,
    RatioBound,
    SectionFamily,
    SectionProperties,
)
from service.core.sections.buckling import no_buckling
from service.core.sections.orthotropic import OrthotropicElastic
from service.core.sections.saint_venant import rectangle_torsion

ROUND_SHEAR_PEAK = 3.6 / 2.6
"""Peak over mean transverse shear of a solid circle, (3 + 2 nu)/(2 (1 + nu)) at nu = 0.3."""


class SolidSection(SectionFamily):
    """A solid bar: it carries every loading and has no wall to buckle locally."""

    loadings = ("bending", "torsion", "tension", "compression")
    wall_dimensions = ()

    def local_buckling(
        self, dims: Dimensions, material: Elastic | OrthotropicElastic,
        core: Elastic | None = None, shear_area=None
    ) -> LocalBuckling:
        shape = no_buckling(*self.arrays(dims), material.youngs_modulus, material.poisson_ratio)
        return LocalBuckling(bending=shape, torsion=shape.copy())


class SolidRound(SolidSection):
    """Solid circle of diameter d.

    Exact elasticity results (Roark's Formulas for Stress and Strain, 7th ed., appendix A
    properties of plane areas and table 10.7 torsion, from memory): A = pi d^2/4,
    I = pi d^4/64, Z = pi d^3/32, plastic modulus d^3/6, K = J = pi d^4/32, Q = pi d^3/16.
    """

    id = "solid_round"
    description = "Solid round bar"
    dimensions = (Dimension("diameter", "Diameter, m"),)
    scale_dimension = "diameter"
    ratio_bounds = ()
    depth_dimension = "diameter"
    width_dimension = "diameter"

    def properties(self, dims: Dimensions) -> SectionProperties:
        (diameter,) = self.arrays(dims)
        second_moment = np.pi * diameter**4 / 64.0
        section_modulus = np.pi * diameter**3 / 32.0
        return SectionProperties(
            area=np.pi * diameter**2 / 4.0,
            second_moment_major=second_moment,
            second_moment_minor=second_moment,
            section_modulus_major=section_modulus,
            section_modulus_minor=section_modulus,
            plastic_modulus_major=diameter**3 / 6.0,
            torsion_constant=2.0 * second_moment,
            torsion_modulus=2.0 * section_modulus,
        )

    def shear_area(self, dims: Dimensions, second_moment=None) -> np.ndarray:
        """A / 1.385: the exact flexure solution's peak at the centre, (3 + 2 nu) / (2 (1 + nu))
        V / A (Timoshenko & Goodier, Theory of Elasticity, sec. 124, from memory), at
        nu = 0.3; elementary theory's 4/3 is 4 % low. (1.5 at nu = 0, 1.42 at nu = 0.2.)"""
        (diameter,) = self.arrays(dims)
        return np.pi * diameter**2 / 4.0 / ROUND_SHEAR_PEAK


class SolidRectangle(SolidSection):
    """Solid rectangle, depth h in the plane of bending, width b.

    A = b h, I_major = b h^3/12, Z_major = b h^2/6, plastic modulus b h^2/4 (any strength of
    materials text; Roark's appendix A, from memory). K and Q from the exact
    Saint-Venant series (:mod:`service.core.sections.saint_venant`).
    """

    id = "solid_rectangle"
    description = "Solid rectangular bar; depth lies in the plane of bending"
    dimensions = (
        Dimension("depth", "Outside size in the plane of bending, m"),
        Dimension("width", "Outside size across the plane of bending, m"),
    )
    scale_dimension = "depth"
    ratio_bounds = (RatioBound(
        "width", 0.1, 10.0, "common practice (bar and flat stock)",
        widest_source=(
            "narrower than 1:10 a deep flat bar buckles laterally (checked by the sizing as "
            "member_buckling); wider than 10:1 it bends as a plate, with anticlastic "
            "curvature and transverse stresses that beam theory leaves out (Timoshenko & "
            "Woinowsky-Krieger, Theory of Plates and Shells, sec. 2, from memory)")),)
    depth_dimension = "depth"
    width_dimension = "width"

    def properties(self, dims: Dimensions) -> SectionProperties:
        depth, width = self.arrays(dims)
        torsion_constant, torsion_modulus = rectangle_torsion(depth, width)
        return SectionProperties(
            area=depth * width,
            second_moment_major=width * depth**3 / 12.0,
            second_moment_minor=depth * width**3 / 12.0,
            section_modulus_major=width * depth**2 / 6.0,
            section_modulus_minor=depth * width**2 / 6.0,
            plastic_modulus_major=width * depth**2 / 4.0,
            torsion_constant=torsion_constant,
            torsion_modulus=torsion_modulus,
        )

    def sizing_properties(self, dims: Dimensions, loading: str
                          ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        if loading != "bending":
            return super().sizing_properties(dims, loading)
        depth, width = self.arrays(dims)   # the formulas of properties(), without the series
        return depth * width, width * depth**3 / 12.0, width * depth**2 / 6.0

    def shear_area(self, dims: Dimensions, second_moment=None) -> np.ndarray:
        """2 A / 3: peak shear 3 V / (2 A) at the neutral axis, the parabolic distribution of
        elementary beam theory (Timoshenko & Gere, Mechanics of Materials, sec. 5.8, from
        memory; exact for narrow sections, a few percent low for wide flat ones)."""
        depth, width = self.arrays(dims)
        return 2.0 * depth * width / 3.0
