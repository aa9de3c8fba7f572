"""Doubly symmetric I-section with sharp corners (no root fillets)."""

from __future__ import annotations

import numpy as np

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
from service.core.sections.buckling import element_buckling_stress, no_buckling
from service.core.sections.orthotropic import OrthotropicElastic
from service.core.sections.saint_venant import rectangle_torsion_constant

JUNCTION_COEFFICIENT = 0.15
"""El Darwish & Johnston (1965), Torsion of structural shapes, J. Struct. Div. ASCE 91(ST1):
junction term alpha = (t_thin / t_thick)(0.15 + 0.10 r / t_flange), here with root radius
r = 0 (from memory; also Roark's Formulas for Stress and Strain, 7th ed., table 10.7)."""


class ISection(SectionFamily):
    """I-section: overall depth h, flange width b, flange thickness t_f, web thickness t_w.

    Area, second moments, elastic and plastic moduli are exact for the sharp-cornered outline:
    A = 2 b t_f + (h - 2 t_f) t_w, I_major = (b h^3 - (b - t_w)(h - 2 t_f)^3)/12,
    I_minor = (2 t_f b^3 + (h - 2 t_f) t_w^3)/12, plastic modulus
    b t_f (h - t_f) + t_w (h - 2 t_f)^2 / 4.

    Torsion constant (El Darwish & Johnston 1965; Roark table 10.7, from memory):
    K = 2 K_flange + (h - 2 t_f) t_w^3 / 3 + 2 alpha D^4, with K_flange the exact Saint-Venant
    value of a b x t_f rectangle (it carries the free-end correction, ~0.63 t/b for thin
    flanges), the web a thin strip between the flanges, alpha the junction coefficient and D
    the diameter of the largest circle inscribed at a web-flange junction:
    D = (t_f^2 + t_w^2/4) / t_f while t_w <= 2 t_f (the circle touches the outer flange face
    and both re-entrant corners), else D = t_w (the circle fits in the web).

    Torsion modulus: Q = K / D, i.e. tau_max = T D / K, the peak on the outer flange face over
    the web. It is the leading term of El Darwish & Johnston's junction stress coefficient
    C = D / (1 + pi^2 D^4 / (16 A^2)) * [1 + 0.15 (pi^2 D^4 / (16 A^2) - D / (2 r))] (Roark
    table 10.7, from memory) without the fillet term, which belongs to the fillet and is
    singular at r = 0. D >= max(t_f, t_w), so it is never below the thin-walled open-section
    value T t_max / K. Stresses at the sharp re-entrant corners themselves are singular and
    not represented (rolled sections have root fillets).
    """

    id = "i_section"
    description = "I-section (doubly symmetric, sharp corners); depth lies in the plane of bending"
    dimensions = (
        Dimension("depth", "Overall depth in the plane of bending, m"),
        Dimension("flange_width", "Width of each flange, m"),
        Dimension("flange_thickness", "Thickness of each flange, m"),
        Dimension("web_thickness", "Thickness of the web, m"),
    )
    # Torsion is allowed: the section is weak in torsion (small K), which the sizing and the
    # rankings see through K and Q; it has no local buckling mode in Saint-Venant torsion.
    loadings = ("bending", "torsion", "tension", "compression")
    scale_dimension = "depth"
    ratio_bounds = (
        RatioBound(
            "flange_width",
            0.2,
            1.0,
            "common practice (EN 10365 rolled sections span about 0.37 for IPE 600 to 1.0 "
            "for HEB; from memory)",
            widest_source=(
                "narrower flanges make the beam prone to lateral-torsional buckling (checked by "
                "the sizing as member_buckling, so they come out heavy unless the compression "
                "flange is restrained); flanges wider than the depth turn the major axis"),
        ),
        RatioBound(
            "flange_thickness",
            0.01,
            0.2,
            "common practice (IPE about 0.04, HEM up to 0.17; from memory)",
            widest_low=0.002,
            widest_source=(
                "flange outstand buckling is checked at any slenderness (Timoshenko & Gere sec. "
                "9.3, from memory); below 0.002 of the depth the outstands are membranes; "
                "above 0.2 the thin-walled torsion formulas (El Darwish & Johnston) lose "
                "accuracy (from memory)"),
        ),
        RatioBound(
            "web_thickness",
            0.005,
            0.1,
            "common practice (IPE about 0.02-0.03, HEM up to 0.1; from memory)",
            widest_source=(
                "thinner webs approach flange-induced web buckling (EN 1993-1-5 clause 8), "
                "which the sizing does not check; thicker ones leave the thin-walled torsion "
                "formulas (from memory)"),
        ),
    )
    depth_dimension = "depth"
    width_dimension = "flange_width"
    wall_dimensions = ("flange_thickness", "web_thickness")
    # The junction term of K switches formula at t_w = 2 t_f and takes min/max of the two
    # thicknesses; bending has no such branch (its buckling modes are kept apart).
    kinked_loadings = ("torsion",)
    rules = (
        ProportionRule(
            "flange_thickness",
            ("depth", "flange_thickness"),
            lambda h, tf: tf < h / 2.0,
            "must be less than half of depth",
            lambda h, tf: (np.log(h / (2.0 * tf)),),
        ),
        ProportionRule(
            "web_thickness",
            ("flange_width", "web_thickness"),
            lambda b, tw: tw <= b,
            "must not exceed flange_width",
            lambda b, tw: (np.log(b / tw),),
        ),
    )

    def properties(self, dims: Dimensions) -> SectionProperties:
        depth, width, flange, web = self.arrays(dims)
        web_depth = depth - 2.0 * flange
        major = _major_second_moment(depth, width, flange, web)
        minor = (2.0 * flange * width**3 + web_depth * web**3) / 12.0
        flange_constant = rectangle_torsion_constant(width, flange)
        junction_diameter = np.where(web <= 2.0 * flange, (flange**2 + 0.25 * web**2) / flange, web)
        junction = (
            JUNCTION_COEFFICIENT
            * np.minimum(flange, web)
            / np.maximum(flange, web)
            * junction_diameter**4
        )
        torsion_constant = 2.0 * flange_constant + web_depth * web**3 / 3.0 + 2.0 * junction
        return SectionProperties(
            area=_area(depth, width, flange, web),
            second_moment_major=major,
            second_moment_minor=minor,
            section_modulus_major=2.0 * major / depth,
            section_modulus_minor=2.0 * minor / width,
            plastic_modulus_major=width * flange * (depth - flange) + web * web_depth**2 / 4.0,
            torsion_constant=torsion_constant,
            torsion_modulus=torsion_constant / junction_diameter,
        )

    def local_buckling(
        self, dims: Dimensions, material: Elastic | OrthotropicElastic,
        core: Elastic | None = None, shear_area=None
    ) -> LocalBuckling:
        """Plate buckling in major-axis bending; no local mode in torsion.

        Plate widths are on the mid-line model: the flange outstand runs from the web
        mid-plane to the tip (b/2, longer than the clear outstand, conservative), the web
        spans the flange mid-planes (h - t_f). Bending: the compression flange outstand
        (k = 0.425) or the web in pure bending (k = 23.9), each over its mid-line/peak stress
        ratio (h - t_f)/h (the flange mid-plane and the web's compression edge both lie at
        (h - t_f)/2). Torsion: Saint-Venant torsion of an open section puts no membrane shear
        in its plates (the shear stress reverses through each thickness), so there is no
        plate shear buckling: ``inf``. The section's weakness in torsion shows in K and Q.

        ``material`` may be :class:`~service.core.sections.orthotropic.OrthotropicElastic`
        (fibres along the member): each plate then takes its orthotropic long-plate formula
        (:func:`~service.core.sections.buckling.element_buckling_stress`).
        """
        depth, width, flange, web = self.arrays(dims)
        outstand = element_buckling_stress("outstand_compression", material, flange, 0.5 * width)
        web_plate = element_buckling_stress("internal_bending", material, web, depth - flange)
        to_peak = depth / (depth - flange)
        bending = np.minimum(outstand, web_plate) * to_peak
        # Transverse shear: the web (h - t_f, k = 5.34) at its mean stress V / (t_w (h - t_f)),
        # over that stress's ratio to the peak V / A_s.
        web_shear = element_buckling_stress("internal_shear", material, web, depth - flange)
        return LocalBuckling(bending=bending, torsion=no_buckling(bending),
                             shear=web_shear * web * (depth - flange) / (
                                 self.shear_area(dims) if shear_area is None else shear_area),
                             bending_modes=(outstand * to_peak, web_plate * to_peak))

    def sizing_properties(self, dims: Dimensions, loading: str
                          ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        if loading != "bending":
            return super().sizing_properties(dims, loading)
        depth, width, flange, web = self.arrays(dims)   # without the flanges' torsion series
        major = _major_second_moment(depth, width, flange, web)
        return _area(depth, width, flange, web), major, 2.0 * major / depth

    def shear_area(self, dims: Dimensions, second_moment=None) -> np.ndarray:
        """I t_w / S with S = (b h^2 - (b - t_w)(h - 2 t_f)^2) / 8 the first moment of the half
        section: tau = V S / (I t_w) at the web's mid-height (elementary beam theory,
        Timoshenko & Gere, Mechanics of Materials, sec. 5.10, from memory)."""
        depth, width, flange, web = self.arrays(dims)
        first_moment = (width * depth**2 - (width - web) * (depth - 2.0 * flange) ** 2) / 8.0
        if second_moment is None:
            second_moment = _major_second_moment(depth, width, flange, web)
        return second_moment * web / first_moment


def _area(depth, width, flange, web):
    """2 b t_f + (h - 2 t_f) t_w, m^2 (sharp corners)."""
    return 2.0 * width * flange + (depth - 2.0 * flange) * web


def _major_second_moment(depth, width, flange, web):
    """(b h^3 - (b - t_w)(h - 2 t_f)^3) / 12, m^4 (sharp corners)."""
    return (width * depth**3 - (width - web) * (depth - 2.0 * flange) ** 3) / 12.0
