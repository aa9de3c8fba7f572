"""Section constants for lateral-torsional buckling, and which families can buckle that way.

A member bent about its major axis can buckle by lateral bending about the minor axis and
twist together, when its minor-axis bending stiffness is smaller than its major-axis one
(Timoshenko & Gere, Theory of Elastic Stability, 2nd ed., 1961, ch. 6; Trahair,
Flexural-Torsional Buckling of Structures, 1993, ch. 3, from memory). The elastic critical
moment needs four constants of the section: I_z (minor second moment, m^4), I_t (Saint-Venant
torsion constant, m^4, the families' ``torsion_constant``), I_w (warping constant, m^6) and the
height of a top load above the shear centre (m).

Which families can buckle laterally (:func:`lateral_torsional_properties` ``susceptible``):

- I-section and solid rectangle bent about their major axis (I_z < I_y): yes.
- rectangular tube with depth > width: yes, checked like the others (its large closed-section
  I_t makes M_cr high, but a long span at small depth can still be limited by it).
- solid round, round tube, square tube (I_z = I_y) and any section bent about its minor or
  an equal axis: no. With the prebuckling curvature taken into account, M_cr grows without
  bound as I_z approaches I_y, as 1 / sqrt(1 - I_z / I_y) (Trahair 1993, sec. 3.8; Kirby &
  Nethercot, Design for Structural Stability, 1979, from memory); a section with I_z >= I_y
  has no lateral-torsional mode. Neglecting the prebuckling curvature elsewhere is
  conservative.
- sandwich panel: not modelled here (a panel's width, set by the envelope, lies across the
  plane of bending; ``susceptible`` is False where I_z >= I_y and the check does not apply to
  the family otherwise).

Warping constants (m^6), each with its source:

- I-section: I_w = t_f b^3 h_s^2 / 24 with h_s = h - t_f the distance between flange
  centroids: the thin-walled value for a doubly symmetric I (Timoshenko & Gere 1961
  sec. 5.5; EN 1993-1-1 practice, from memory). The flanges' own thickness warping
  (b^3 t_f^3 / 144 each) and the web's are under 1 % of it for the proportions allowed;
  the comparison with sectionproperties is in tests/validation.
- solid rectangle, rectangular tube: taken as 0. A narrow solid rectangle's warping constant
  is about b^3 h^3 / 144 (compared with sectionproperties in tests/validation); it adds
  pi^2 E I_w / (L^2 G I_t) = 0.54 (h / L)^2 (E / G = 2.6) to the torsional term, so M_cr
  would rise by about 1 % at a span of five depths and less beyond. The classical
  narrow-rectangle solution neglects it (Timoshenko & Gere sec. 6.2). A closed section's
  warping is small beside its Bredt-Batho torsion. Leaving either out only lowers M_cr
  (conservative).
- solid round, round tube: 0 exactly (no warping), and not susceptible anyway.

Torsion constant of the I-section: the lower bound of :func:`i_section_torsion_lower_bound`
(the sum of the exact Saint-Venant constants of the two flanges and the web between them,
taken apart), not the family's El Darwish & Johnston value, which credits the web-flange
junctions and runs up to 28 % above a finite element solution at the stockiest proportions
allowed (flanges as thick as they are wide; tests/validation/test_lateral_properties.py).
The torsional rigidity of a domain is never below the sum of those of disjoint subdomains it
contains (each part's Prandtl stress function, extended by zero, is admissible for the whole;
Polya & Szego, Isoperimetric Inequalities in Mathematical Physics, 1951, ch. 1, from memory),
so M_cr is never overestimated through I_t; for thin walls the junctions add only a few per
cent, which the bound leaves out (conservative).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from service.core.sections.base import Dimensions, SectionFamily, SectionProperties
from service.core.sections.saint_venant import rectangle_torsion_constant

LATERAL_TORSIONAL_FAMILIES = ("i_section", "solid_rectangle", "rectangular_tube")
"""Families whose members bent about their major axis can buckle laterally (see above)."""


@dataclass(frozen=True)
class LateralTorsionalProperties:
    """What the elastic critical moment needs of a section, arrays of the dimensions' shape.

    Attributes:
        minor_second_moment: I_z, m^4.
        torsion_constant: I_t, the Saint-Venant torsion constant, m^4.
        warping_constant: I_w, m^6.
        top_load_height: distance from the shear centre up to the top surface of the
            section, where a load "on the top flange" acts, m (h / 2 for these doubly
            symmetric sections).
        susceptible: True where the section can buckle laterally (bent about its major axis,
            I_z < I_y, in a family of :data:`LATERAL_TORSIONAL_FAMILIES`).
    """

    minor_second_moment: np.ndarray
    torsion_constant: np.ndarray
    warping_constant: np.ndarray
    top_load_height: np.ndarray
    susceptible: np.ndarray


def warping_constant(family: SectionFamily, dims: Dimensions) -> np.ndarray:
    """I_w of the family's sections, m^6 (see the module docstring for each formula).

    Args:
        family: a section family.
        dims: its dimensions, arrays broadcastable to one shape ``S`` (m).

    Returns:
        I_w, shape ``S``.
    """
    arrays = family.arrays(dims)
    if family.id == "i_section":
        depth, width, flange, _ = arrays
        return flange * width**3 * (depth - flange) ** 2 / 24.0
    return np.zeros(np.broadcast_shapes(*(a.shape for a in arrays)))


def i_section_torsion_lower_bound(dims: Dimensions) -> np.ndarray:
    """2 K(b x t_f) + K((h - 2 t_f) x t_w), m^4: the flanges and the web as separate exact
    Saint-Venant rectangles (``sections.saint_venant``), a lower bound of the I-section's
    torsion constant (see the module docstring)."""
    depth, width, flange, web = (np.asarray(dims[name], dtype=float) for name in (
        "depth", "flange_width", "flange_thickness", "web_thickness"))
    flanges = rectangle_torsion_constant(width, flange)
    webs = rectangle_torsion_constant(depth - 2.0 * flange, web)
    return 2.0 * flanges + webs


def lateral_torsional_properties(family: SectionFamily, dims: Dimensions,
                                 props: SectionProperties | None = None
                                 ) -> LateralTorsionalProperties:
    """The constants of :class:`LateralTorsionalProperties` for sections of one family.

    Args:
        family: a section family.
        dims: its dimensions, arrays broadcastable to one shape ``S`` (m).
        props: ``family.properties(dims)`` when the caller has it already (None: computed).

    Returns:
        Every field of shape ``S``.
    """
    if props is None:
        props = family.properties(dims)
    depth = family.overall_depth(dims) * np.ones_like(props.area)
    susceptible = (props.second_moment_minor < props.second_moment_major) & (
        family.id in LATERAL_TORSIONAL_FAMILIES)
    torsion = props.torsion_constant
    if family.id == "i_section":
        torsion = np.minimum(torsion, i_section_torsion_lower_bound(dims))
    return LateralTorsionalProperties(
        minor_second_moment=props.second_moment_minor,
        torsion_constant=torsion,
        warping_constant=warping_constant(family, dims) * np.ones_like(props.area),
        top_load_height=0.5 * depth,
        susceptible=susceptible,
    )
