"""Sandwich panel: two equal faces bonded to one core, and classical sandwich beam theory.

Theory after Allen, Analysis and Design of Structural Sandwich Panels (1969), ch. 2, and
Zenkert, An Introduction to Sandwich Construction (1995), ch. 3-4 (from memory). Symbols:
b width, c core thickness, t face thickness, d = c + t the distance between face centroids,
E_f face Young's modulus, E_c and G_c core Young's and shear moduli. Every function is
vectorised: dimensions and moduli broadcast together.
"""

from __future__ import annotations

import numpy as np

from service.core.errors import InputError
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
from service.core.sections.saint_venant import rectangle_torsion, rectangle_torsion_constant

WRINKLING_COEFFICIENT = 0.5
"""Face wrinkling sigma_w = 0.5 (E_f E_c G_c)^(1/3): Hoff & Mautner (1945), J. Aeronaut. Sci.
12; Allen (1969) ch. 8; Zenkert (1995) ch. 8 recommends 0.5 for design (from memory). The
theoretical thick-core coefficient is about 0.78-0.82; 0.5 allows for the initial waviness of
real faces, which the tests behind it contained."""


def _geometry(dims: Dimensions) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    width, core, face = (np.asarray(dims[name], dtype=float)
                         for name in ("width", "core_thickness", "face_thickness"))
    return width, core, face


def flexural_rigidity(
    dims: Dimensions, face_modulus: np.ndarray | float, core_modulus: np.ndarray | float,
    core_cube: np.ndarray | None = None,
) -> np.ndarray:
    """Equivalent bending stiffness D, N m^2 (Allen 1969 ch. 2, from memory).

    D = E_f b t d^2 / 2 + E_f b t^3 / 6 + E_c b c^3 / 12: faces about the panel's mid-plane,
    faces about their own centroids, and the core. ``core_cube``: c^3 of these panels where
    the caller has it already.
    """
    width, core, face = _geometry(dims)
    lever = core + face
    if core_cube is None:
        core_cube = core * core * core    # products, not power(): several times cheaper
    return (
        face_modulus * width * face * lever**2 / 2.0
        + face_modulus * width * (face * face * face) / 6.0
        + core_modulus * width * core_cube / 12.0
    )


def shear_stiffness(dims: Dimensions, core_shear_modulus: np.ndarray | float) -> np.ndarray:
    """Transverse shear stiffness S = G_c b d^2 / c, N (Allen 1969 ch. 2, from memory).

    A beam's shear deflection is (shear deflection coefficient) x load x span / S.
    """
    width, core, face = _geometry(dims)
    return core_shear_modulus * width * (core + face) ** 2 / core


def face_stress(
    moment: np.ndarray | float,
    dims: Dimensions,
    face_modulus: np.ndarray | float,
    core_modulus: np.ndarray | float,
    rigidity: np.ndarray | None = None,
) -> np.ndarray:
    """Peak face bending stress M E_f z_max / D at the outer surface z_max = c/2 + t, Pa.

    The exact engineering-beam value (Allen 1969 ch. 2, from memory), chosen over the
    thin-face M / (b t d) because it stays right for thick faces and stiff cores; the two
    agree within t/d for thin faces and a weak core. ``rigidity``: D of these panels
    (:func:`flexural_rigidity`) where the caller has it already.
    """
    _, core, face = _geometry(dims)
    if rigidity is None:
        rigidity = flexural_rigidity(dims, face_modulus, core_modulus)
    return np.asarray(moment, dtype=float) * face_modulus * (0.5 * core + face) / rigidity


def core_shear_stress(shear_force: np.ndarray | float, dims: Dimensions) -> np.ndarray:
    """Core shear stress V / (b d), Pa: uniform through a weak core carrying all the shear
    (Allen 1969 ch. 2, thin faces and weak core, from memory). The strength check against
    the core's shear strength is made by the sizing."""
    width, core, face = _geometry(dims)
    return np.asarray(shear_force, dtype=float) / (width * (core + face))


def wrinkling_stress(face: Elastic, core: Elastic) -> np.ndarray:
    """Face wrinkling stress 0.5 (E_f E_c G_c)^(1/3), Pa (see :data:`WRINKLING_COEFFICIENT`)."""
    return WRINKLING_COEFFICIENT * np.cbrt(
        np.asarray(face.youngs_modulus, dtype=float)
        * np.asarray(core.youngs_modulus, dtype=float)
        * np.asarray(core.shear_modulus, dtype=float)
    )


def peak_wrinkling_stress(core_thickness, face_thickness, face: Elastic, core: Elastic
                          ) -> np.ndarray:
    """The peak face stress at which the compression face wrinkles, Pa: the wrinkling
    stress (:func:`wrinkling_stress`) over d / (c + 2t), the share of the peak stress M /
    Z_major that the face's mid-plane carries; from arrays of c and t (m)."""
    face_to_peak = (core_thickness + face_thickness) / (core_thickness + 2.0 * face_thickness)
    return wrinkling_stress(face, core) / face_to_peak


def face_second_moments(width, core, face, core_cube: np.ndarray | None = None
                        ) -> tuple[np.ndarray, np.ndarray]:
    """The faces' second moments, m^4: I_major = b ((c + 2t)^3 - c^3) / 12 about the
    panel's width and I_minor = t b^3 / 6 across it (the core carries no bending stress;
    :meth:`SandwichPanel.properties`), from arrays of b, c and t (m), each in the
    broadcast shape of the arrays it reads; ``core_cube``: c^3 where the caller has it
    already."""
    depth = core + 2.0 * face
    if core_cube is None:
        core_cube = core * core * core    # products, not power(): several times cheaper
    return width * (depth * depth * depth - core_cube) / 12.0, face * width**3 / 6.0


def face_torsion_constant(width, face) -> np.ndarray:
    """The faces' torsion constant 2 K(b x t), m^4, from arrays of b and t (m): two
    independent Saint-Venant strips (:meth:`SandwichPanel.properties`), without the torsion
    modulus."""
    return 2.0 * rectangle_torsion_constant(width, face)


class SandwichPanel(SectionFamily):
    """Sandwich panel of width b: two faces of thickness t on a core of thickness c.

    :meth:`properties` are the faces' geometric properties: the core is taken to carry no
    bending stress (Allen's weak-core assumption), so ``area`` is the faces' area 2 b t
    (the core's b c adds mass, not strength), I_major = b ((c + 2t)^3 - c^3) / 12,
    Z_major = 2 I_major / (c + 2t), plastic modulus b t d, I_minor = t b^3 / 6. Torsion: the
    faces as two independent Saint-Venant strips (a lower bound; the core's shear coupling
    is ignored). The panel is sized for bending only. Use :func:`flexural_rigidity`,
    :func:`shear_stiffness`, :func:`face_stress` and :func:`core_shear_stress` for the
    two-material beam.

    Sizing scales ``core_thickness`` with ``face_thickness`` as its ratio; ``width`` is a
    :attr:`fixed_dimensions` member, set from the envelope, not scaled. The overall depth
    compared with an envelope is c + 2t (:meth:`overall_depth`).
    """

    id = "sandwich_panel"
    description = "Sandwich panel: two equal faces on one core, bent about its width"
    dimensions = (
        Dimension("width", "Panel width, m"),
        Dimension("core_thickness", "Core thickness, m"),
        Dimension("face_thickness", "Thickness of each of the two faces, m"),
    )
    loadings = ("bending",)
    scale_dimension = "core_thickness"
    ratio_bounds = (
        RatioBound(
            "face_thickness",
            0.005,
            1.0,
            "common practice (thin faces on a thick core; Zenkert 1995 ch. 1)",
            widest_source=(
                "the sandwich formulas take thin faces (their own bending stiffness neglected) "
                "and the face wrinkling model a thick core (Zenkert 1995 ch. 2 and 8, from "
                "memory)"),
        ),
    )
    depth_dimension = "core_thickness"
    width_dimension = "width"
    wall_dimensions = ("face_thickness",)
    fixed_dimensions = ("width",)

    def overall_depth(self, dims: Dimensions) -> np.ndarray:
        """c + 2t, m."""
        _, core, face = _geometry(dims)
        return core + 2.0 * face

    def properties(self, dims: Dimensions) -> SectionProperties:
        width, core, face = self.arrays(dims)
        depth = core + 2.0 * face
        major, minor = face_second_moments(width, core, face)
        strip_constant, strip_modulus = rectangle_torsion(width, face)
        return SectionProperties(
            area=2.0 * width * face,
            second_moment_major=major,
            second_moment_minor=minor,
            section_modulus_major=2.0 * major / depth,
            section_modulus_minor=2.0 * minor / width,
            plastic_modulus_major=width * face * (core + face),
            torsion_constant=2.0 * strip_constant,
            torsion_modulus=2.0 * strip_modulus,
        )

    def shear_area(self, dims: Dimensions, second_moment=None) -> np.ndarray:
        """b d, d = c + t: the core carries the shear force at the uniform stress V / (b d)
        (Allen 1969, ch. 2, from memory); the sizing compares it with the core's shear
        strength (:func:`core_shear_stress`)."""
        width, core_thickness, face = self.arrays(dims)
        return width * (core_thickness + face)

    def local_buckling(
        self, dims: Dimensions, material: Elastic | OrthotropicElastic,
        core: Elastic | None = None, shear_area=None
    ) -> LocalBuckling:
        """Face wrinkling in bending, against the peak face stress; ``inf`` in torsion.

        The compression face's mid-plane carries d / (c + 2t) of the peak stress M / Z_major,
        so the wrinkling stress is divided by that ratio (:func:`peak_wrinkling_stress`).
        Core shear failure is a strength check (:func:`core_shear_stress`), made by the
        sizing. Dimpling (honeycomb cores only) and shear crimping (a global mode of panels
        in end compression) are not modelled.

        Raises:
            InputError: on ``core_material`` when no core is given.
            ValueError: for faces of an orthotropic material: the wrinkling formula is that
                of isotropic faces (the sizing does not offer the form for such a material,
                ``service.core.sizing.walls.UNSOUND_FORMS``).
        """
        if core is None:
            raise InputError.single("core_material", "a sandwich panel needs a core material")
        if isinstance(material, OrthotropicElastic):
            raise ValueError("the face wrinkling formula is that of isotropic faces")
        width, core_thickness, face = self.arrays(dims)
        bending = peak_wrinkling_stress(core_thickness, face, material, core)
        return LocalBuckling(bending=bending, torsion=no_buckling(bending, width))
