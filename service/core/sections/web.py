"""Combined stresses in webs: bending with shear at the web-flange junction of I-sections and
boxes, their von Mises and principal values, and the interaction of web bending and shear
buckling.

Stresses at a height y above the neutral axis of the web, elementary beam theory (Timoshenko &
Gere, Mechanics of Materials, sec. 5.10, from memory): normal sigma = M y / I, shear
tau = V S(y) / (I t) with S(y) the first moment of the section above y and t the total web
thickness at that height, plus the Saint-Venant torsion shear T t_w / K of an open web or the
Bredt-Batho shear flow T / (2 A_m t) of a box wall (added on the web where the two shears
have the same sense: the peak). The junction is the web's end at the inside face of the
flange, y = h/2 - t_f: the largest normal stress that acts together with nearly the largest
web shear.

Every function takes dims (arrays of shape ``S``) and actions (moment N m, shear N, torque N m)
broadcastable with it, and returns Pa of the broadcast shape.
"""

from __future__ import annotations

import numpy as np

from service.core.sections import FAMILIES
from service.core.sections.base import Dimensions


def _i_geometry(dims):
    depth, width, flange, web = (np.asarray(dims[name], dtype=float) for name in (
        "depth", "flange_width", "flange_thickness", "web_thickness"))
    return depth, width, flange, web, web, 0.0


def _box_geometry(dims):
    depth, width, wall = (np.asarray(dims[name], dtype=float) for name in (
        "depth", "width", "wall"))
    return depth, width, wall, 2.0 * wall, wall, (width - wall) * (depth - wall)


_GEOMETRY = {"i_section": _i_geometry, "rectangular_tube": _box_geometry}


def web_stresses(family_id: str, dims: Dimensions, moment, shear, height, torque=0.0,
                 second_moment=None) -> tuple[np.ndarray, np.ndarray]:
    """Normal and shear stress in the web at ``height`` above the neutral axis, Pa.

    Args:
        family_id: ``"i_section"`` or ``"rectangular_tube"``.
        dims: the family's dimensions, shape ``S``.
        moment, shear, torque: M (N m), V (N), T (N m), broadcastable with ``S``.
        height: y above the neutral axis, 0 <= y <= h/2 - t_f (inside the web), m.
        second_moment: the sections' I (m^4) where the caller has it already (None:
            computed).

    Returns:
        ``(normal, shear)``: M y / I and V S(y) / (I t) + the torsion shear of the web.
    """
    depth, width, flange, total_web, wall, enclosed = _GEOMETRY[family_id](dims)
    height = np.asarray(height, dtype=float)
    family = FAMILIES[family_id]
    second = (family.sizing_properties(dims, "bending")[1]    # I, without the torsion series
              if second_moment is None else second_moment)
    inner = 0.5 * depth - flange
    # first moment about the neutral axis of the flange and of the web above ``height``
    first_moment = (width * flange * (depth - flange) / 2.0
                    + total_web * (inner**2 - height**2) / 2.0)
    normal = np.asarray(moment, dtype=float) * height / second
    transverse = np.asarray(shear, dtype=float) * first_moment / (second * total_web)
    torque = np.asarray(torque, dtype=float)
    if not np.any(torque):
        torsion: np.ndarray | float = 0.0
    elif family_id == "rectangular_tube":
        torsion = np.abs(torque) / (2.0 * enclosed * wall)            # Bredt-Batho
    else:
        torsion = (np.abs(torque) * wall                           # Saint-Venant, open web
                   / family.properties(dims).torsion_constant)
    return normal, np.abs(transverse) + torsion


def junction_stresses(family_id: str, dims: Dimensions, moment, shear, torque=0.0,
                      second_moment=None) -> tuple[np.ndarray, np.ndarray]:
    """Normal and shear stress in the web at the web-flange junction, y = h/2 - t_f, Pa
    (see :func:`web_stresses`)."""
    depth, _, flange, _, _, _ = _GEOMETRY[family_id](dims)
    return web_stresses(family_id, dims, moment, shear, 0.5 * depth - flange, torque,
                        second_moment)


def von_mises(normal, shear) -> np.ndarray:
    """sqrt(sigma^2 + 3 tau^2), Pa: von Mises equivalent stress of a beam's plane stress state
    (one normal, one shear component), compared with the yield strength of ductile materials."""
    return np.sqrt(np.asarray(normal, dtype=float) ** 2 + 3.0 * np.asarray(shear, dtype=float) ** 2)


def max_principal(normal, shear) -> np.ndarray:
    """|sigma| / 2 + sqrt(sigma^2 / 4 + tau^2), Pa: the largest principal stress magnitude
    (Rankine), compared with the tensile (or, on the compression side, compressive) strength
    of brittle materials."""
    half = 0.5 * np.abs(np.asarray(normal, dtype=float))
    return half + np.sqrt(half**2 + np.asarray(shear, dtype=float) ** 2)


def bending_shear_buckling_interaction(bending_stress, bending_critical, shear_stress,
                                       shear_critical) -> np.ndarray:
    """(sigma / sigma_cr)^2 + (tau / tau_cr)^2, 1: buckling of a web plate under bending and
    shear together when it reaches 1. The circular interaction of long simply supported
    plates (Timoshenko & Gere, Theory of Elastic Stability, 1961, sec. 9.9, after Timoshenko
    1934 and Chwalla; also Bleich, Buckling Strength of Metal Structures, 1952, from memory).

    Args: the web's edge bending stress and its critical value (the web-in-bending mode),
    the web's shear stress and its critical value, Pa, all broadcastable.
    """
    bending = np.asarray(bending_stress, dtype=float) / np.asarray(bending_critical, dtype=float)
    shear = np.asarray(shear_stress, dtype=float) / np.asarray(shear_critical, dtype=float)
    return bending**2 + shear**2
