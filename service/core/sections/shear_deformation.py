"""Shear deformation of beams: Timoshenko shear areas (Cowper's coefficients) and the shear
part of the deflection for the built-in load cases.

A Timoshenko beam deflects by shear as well as by bending: with the shear stiffness
S = k G A (k the shear coefficient, G the shear modulus, A the area) the extra peak deflection
of each built-in load case is c_S P L / S, with the same c_S as the sandwich beam's
(:mod:`service.core.loadcases`, :func:`~service.core.loadcases.shear_deflection`):
1, 1/2, 1/4, 1/8, 1/4, 1/8 for the cantilever (end, uniform), simply supported (centre,
uniform) and fixed-fixed (centre, uniform) cases (Timoshenko & Gere, Mechanics of Materials,
sec. 9.11; Roark's Formulas for Stress and Strain, 8th ed., table 8.1 shear terms, from
memory: the shear deflection is the integral of V / (k G A) from a zero-shear section).

Shear coefficients: Cowper, The shear coefficient in Timoshenko's beam theory, J. Appl. Mech.
33 (1966) 335-340, table 1 (from memory), from the Saint-Venant flexure solution averaged over
the section, for the material's own Poisson's ratio nu. Thin-walled sections use the wall
mid-line dimensions. Every function takes dims (arrays of shape ``S``) and nu (broadcastable,
e.g. materials ``M x 1``) and returns k A in m^2 of the broadcast shape.
"""

from __future__ import annotations

import numpy as np

from service.core.loadcases import LoadCase, shear_deflection
from service.core.sections.base import Dimensions
from service.core.sections.sandwich import shear_stiffness as sandwich_shear_stiffness


def _get(dims: Dimensions, *names: str) -> tuple[np.ndarray, ...]:
    return tuple(np.asarray(dims[name], dtype=float) for name in names)


def _thin_walled_denominator(m, nu):
    """The part of Cowper's I and box denominators common to both."""
    return (12.0 + 72.0 * m + 150.0 * m**2 + 90.0 * m**3
            + nu * (11.0 + 66.0 * m + 135.0 * m**2 + 90.0 * m**3))


def solid_round(dims: Dimensions, nu) -> np.ndarray:
    """k = 6 (1 + nu) / (7 + 6 nu) (Cowper table 1, circle) times pi d^2 / 4."""
    (diameter,) = _get(dims, "diameter")
    return 6.0 * (1.0 + nu) / (7.0 + 6.0 * nu) * np.pi * diameter**2 / 4.0


def solid_rectangle(dims: Dimensions, nu) -> np.ndarray:
    """k = 10 (1 + nu) / (12 + 11 nu) (Cowper table 1, rectangle) times b h."""
    depth, width = _get(dims, "depth", "width")
    return 10.0 * (1.0 + nu) / (12.0 + 11.0 * nu) * depth * width


def round_tube(dims: Dimensions, nu) -> np.ndarray:
    """Hollow circle, m = inner / outer radius (Cowper table 1):
    k = 6 (1 + nu) (1 + m^2)^2 / ((7 + 6 nu)(1 + m^2)^2 + (20 + 12 nu) m^2), times A.
    The thin-walled limit is 2 (1 + nu) / (4 + 3 nu)."""
    outer, wall = _get(dims, "outer_diameter", "wall")
    m2 = ((outer - 2.0 * wall) / outer) ** 2
    k = 6.0 * (1.0 + nu) * (1.0 + m2) ** 2 / ((7.0 + 6.0 * nu) * (1.0 + m2) ** 2
                                             + (20.0 + 12.0 * nu) * m2)
    return k * np.pi * (outer**2 - (outer - 2.0 * wall) ** 2) / 4.0


def rectangular_tube(dims: Dimensions, nu) -> np.ndarray:
    """Thin-walled box (Cowper table 1), mid-line depth h and width b, flanges t1 = webs t:
    m = b t1 / (h t), n = b / h,
    k = 10 (1 + nu)(1 + 3m)^2 / (D(m, nu) + 10 n^2 ((3 + nu) m + 3 m^2)), times A."""
    depth, width, wall = _get(dims, "depth", "width", "wall")
    height, breadth = depth - wall, width - wall
    m = breadth / height
    n = breadth / height
    k = 10.0 * (1.0 + nu) * (1.0 + 3.0 * m) ** 2 / (
        _thin_walled_denominator(m, nu) + 10.0 * n**2 * ((3.0 + nu) * m + 3.0 * m**2))
    return k * (width * depth - (width - 2.0 * wall) * (depth - 2.0 * wall))


def i_section(dims: Dimensions, nu) -> np.ndarray:
    """Thin-walled I (Cowper table 1), mid-line depth h = depth - t_f, flange width b:
    m = 2 b t_f / (h t_w), n = b / h,
    k = 10 (1 + nu)(1 + 3m)^2 / (D(m, nu) + 30 n^2 (m + m^2) + 5 nu n^2 (8m + 9m^2)), times A."""
    depth, width, flange, web = _get(dims, "depth", "flange_width", "flange_thickness",
                                     "web_thickness")
    height = depth - flange
    m = 2.0 * width * flange / (height * web)
    n = width / height
    k = 10.0 * (1.0 + nu) * (1.0 + 3.0 * m) ** 2 / (
        _thin_walled_denominator(m, nu) + 30.0 * n**2 * (m + m**2)
        + 5.0 * nu * n**2 * (8.0 * m + 9.0 * m**2))
    return k * (2.0 * width * flange + (depth - 2.0 * flange) * web)


TIMOSHENKO_SHEAR_AREA = {
    "solid_round": solid_round,
    "solid_rectangle": solid_rectangle,
    "round_tube": round_tube,
    "rectangular_tube": rectangular_tube,
    "i_section": i_section,
}
"""Family id -> k A (dims, nu) -> m^2. The sandwich panel's shear stiffness is its own
(:func:`~service.core.sections.sandwich.shear_stiffness`, Allen's G_c b d^2 / c)."""


def shear_stiffness(family_id: str, dims: Dimensions, shear_modulus, poisson_ratio,
                    core_shear_modulus=None) -> np.ndarray:
    """S = G k A, N, of the family's section (the sandwich panel: G_c b d^2 / c).

    Args:
        family_id: a contract family id.
        dims: the family's dimensions, arrays of shape ``S``.
        shear_modulus, poisson_ratio: G (Pa) and nu of the member's material, shape ``M``
            broadcastable with ``S``; for an orthotropic wall, the G12 and nu12 in the plane of
            the shear (webs along the member).
        core_shear_modulus: G_c, Pa, for the sandwich panel only.
    """
    if family_id == "sandwich_panel":
        return sandwich_shear_stiffness(dims, core_shear_modulus)
    shear_area = TIMOSHENKO_SHEAR_AREA[family_id](dims, np.asarray(poisson_ratio, dtype=float))
    return np.asarray(shear_modulus, dtype=float) * shear_area


def timoshenko_shear_deflection(case: LoadCase, load, span, family_id: str, dims: Dimensions,
                                shear_modulus, poisson_ratio, core_shear_modulus=None
                                ) -> np.ndarray:
    """Extra peak deflection from shear, c_S P L / (G k A), m, added to the bending
    deflection of the same case (both peak at the same section in every built-in case).
    Arguments as :func:`shear_stiffness`; load P (N) and span L (m) broadcast."""
    stiffness = shear_stiffness(family_id, dims, shear_modulus, poisson_ratio, core_shear_modulus)
    return shear_deflection(case, load, span, stiffness)
