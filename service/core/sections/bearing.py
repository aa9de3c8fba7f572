"""Bearing under point loads and at supports: web patch loading of I-sections and boxes, local
crushing of round tubes, and core indentation of sandwich panels. Each function returns the
characteristic resistance to a force F applied over a stiff bearing length s_s (N), with no
partial factor; the caller divides by its safety factor.

Every function takes dims (arrays of shape ``S``), material strengths and moduli (Pa,
broadcastable, e.g. materials ``M x 1``) and the bearing length (m, broadcastable; 0 for a
knife-edge load, the conservative default) and returns N of the broadcast shape.
"""

from __future__ import annotations

import numpy as np

from service.core.sections.base import Dimensions


def _arrays(dims: Dimensions, *names: str) -> tuple[np.ndarray, ...]:
    return tuple(np.asarray(dims[name], dtype=float) for name in names)


def yield_length_parameters(web_depth, web_thickness, flange_width, flange_thickness):
    """m1 = f_yf b_f / (f_yw t_w) (flange and web of one material: b_f / t_w) and the m2 =
    0.02 (h_w / t_f)^2 that holds where lambda_F > 0.5, EN 1993-1-5:2006 eq. 6.8 and 6.9
    (from memory), as :func:`patch_loading_resistance` reads them."""
    web_depth, web_thickness, flange_width, flange_thickness = (
        np.asarray(value, dtype=float) for value in (web_depth, web_thickness, flange_width,
                                                     flange_thickness))
    return flange_width / web_thickness, 0.02 * (web_depth / flange_thickness) ** 2


def patch_loading_resistance(web_depth, web_thickness, flange_width, flange_thickness,
                             youngs_modulus, strength, bearing_length, at_end,
                             flange_hinges=True) -> np.ndarray:
    """Resistance of one unstiffened web to a transverse force through a flange, N.

    EN 1993-1-5:2006 sec. 6 (eq. 6.1-6.13, from memory), long unstiffened web (a -> inf):

        k_F = 6 (load within the span, type a); 2 + 6 s_s / h_w <= 6 (at a member end,
              type c, with c = 0: the end of the member at the bearing's edge)
        F_cr = 0.9 k_F E t_w^3 / h_w
        m1 = f_yf b_f / (f_yw t_w),  m2 = 0.02 (h_w / t_f)^2 if lambda_F > 0.5 else 0
        type a: l_y = s_s + 2 t_f (1 + sqrt(m1 + m2))
        type c: l_e = k_F E t_w^2 / (2 f_yw h_w) <= s_s,
                l_y = min(l_e + t_f sqrt(m1 / 2 + (l_e / t_f)^2 + m2), l_e + t_f sqrt(m1 + m2))
        lambda_F = sqrt(l_y t_w f_yw / F_cr),  chi_F = 0.5 / lambda_F <= 1
        F_R = f_yw chi_F l_y t_w

    m2 is first taken as in force and dropped where lambda_F then comes out <= 0.5 (the
    clause's own order). s_s is capped at h_w (EN 1993-1-5 6.3(1)). Flange and web share
    the material's strength. Args: h_w, t_w, b_f, t_f (m), E and f_y (Pa), s_s (m), at_end
    (bool array: True at a support at the member's end); flange_hinges (bool array): False
    for a brittle flange, which forms no plastic hinges: m1 = m2 = 0, so the load spreads
    through the flange thickness alone, 1:1 (l_y = s_s + 2 t_f within the span, the
    clause's own formula; l_e + t_f at an end, to the one side: our conservative reading
    for materials outside its scope).
    """
    web_depth, web_thickness, flange_width, flange_thickness = (
        np.asarray(value, dtype=float) for value in (web_depth, web_thickness, flange_width,
                                                     flange_thickness))
    youngs = np.asarray(youngs_modulus, dtype=float)
    strength = np.asarray(strength, dtype=float)
    bearing = np.minimum(np.asarray(bearing_length, dtype=float), web_depth)
    at_end = np.asarray(at_end, dtype=bool)
    coefficient: np.ndarray | float = 6.0
    if at_end.any():    # (within the span only: k_F = 6 needs none of this)
        # a web of no depth (a box whose walls meet: a solid) cannot buckle, F_cr = inf, and
        # its bearing covers it whole (s_s / h_w = 1): the limit of the formulas as h_w -> 0
        filled = np.divide(bearing, web_depth, out=np.ones(np.broadcast_shapes(
            np.shape(bearing), np.shape(web_depth))), where=web_depth > 0)
        coefficient = np.where(at_end, np.minimum(2.0 + 6.0 * filled, 6.0), 6.0)
    with np.errstate(divide="ignore"):
        critical = 0.9 * coefficient * youngs * web_thickness**3 / web_depth
    hinges = np.asarray(flange_hinges, dtype=bool)
    plain_m1, plain_m2 = yield_length_parameters(web_depth, web_thickness, flange_width,
                                                 flange_thickness)
    m1 = np.where(hinges, plain_m1, 0.0)
    with np.errstate(divide="ignore"):
        end_length = np.minimum(coefficient * youngs * web_thickness**2
                                / (2.0 * strength * web_depth), bearing)

    def interior_length(m2):
        return bearing + 2.0 * flange_thickness * (1.0 + np.sqrt(m1 + m2))

    def end_yield_length(m2):
        end = np.minimum(
            end_length + flange_thickness * np.sqrt(m1 / 2.0 + (end_length / flange_thickness)
                                                    ** 2 + m2),
            end_length + flange_thickness * np.sqrt(m1 + m2))
        # without hinges, l_e plus the 1:1 spread through the flange to its one side
        return np.where(hinges, end, end_length + flange_thickness)

    def yield_length(m2):
        # each type's formula only where it is asked for (a caller asks for one type at once)
        if not at_end.any():
            return interior_length(m2)
        if at_end.all():
            return end_yield_length(m2)
        return np.where(at_end, end_yield_length(m2), interior_length(m2))

    length = yield_length(np.where(hinges, plain_m2, 0.0))
    slenderness = np.sqrt(length * web_thickness * strength / critical)
    stocky = slenderness <= 0.5
    if np.count_nonzero(stocky):    # (elsewhere the first length stands)
        length = np.where(stocky, yield_length(0.0), length)
        slenderness = np.sqrt(length * web_thickness * strength / critical)
    with np.errstate(divide="ignore"):
        reduction = np.minimum(0.5 / slenderness, 1.0)
    return strength * reduction * length * web_thickness


def i_section_web_bearing(dims: Dimensions, youngs_modulus, strength, bearing_length,
                          at_end=False, flange_hinges=True) -> np.ndarray:
    """Patch loading resistance of an I-section's web, N: h_w = h - 2 t_f, b_f the flange
    width (:func:`patch_loading_resistance`)."""
    depth, width, flange, web = _arrays(dims, "depth", "flange_width", "flange_thickness",
                                        "web_thickness")
    return patch_loading_resistance(depth - 2.0 * flange, web, width, flange, youngs_modulus,
                                    strength, bearing_length, at_end, flange_hinges)


def rectangular_tube_web_bearing(dims: Dimensions, youngs_modulus, strength, bearing_length,
                                 at_end=False, flange_hinges=True) -> np.ndarray:
    """Patch loading resistance of a box's two webs, N: twice one web of depth h - 2t and
    thickness t, each credited with half the flange width (b / 2) in m1 (our reading of
    EN 1993-1-5 sec. 6, which is written for the webs of plate girders)."""
    depth, width, wall = _arrays(dims, "depth", "width", "wall")
    return 2.0 * patch_loading_resistance(depth - 2.0 * wall, wall, 0.5 * width, wall,
                                          youngs_modulus, strength, bearing_length, at_end,
                                          flange_hinges)


def round_tube_crushing(dims: Dimensions, strength, bearing_length) -> np.ndarray:
    """Local crushing of a round tube under a load over a bearing length s_s, N.

    The plastic collapse of a ring between two rigid plates, four hinges of moment
    M_0 = f_y t^2 / 4 per unit length: P = 4 M_0 s_s / R = f_y t^2 s_s / R, R the mean radius
    (DeRuntz & Hodge, Crushing of a tube between rigid plates, J. Appl. Mech. 30, 1963, from
    memory). A beam's reaction is spread around the wall by shear, not opposite the load, and
    the tube beyond the bearing helps, so this is a lower bound; it is zero for a knife edge
    (s_s = 0): a round tube under a point load needs a saddle of stated length.
    """
    outer, wall = _arrays(dims, "outer_diameter", "wall")
    radius = 0.5 * (outer - wall)
    return (np.asarray(strength, dtype=float) * wall**2 * np.asarray(bearing_length, dtype=float)
            / radius)


PLATE_LENGTH_LIMIT = 4.0
"""EN 1993-1-8 Table 7.2 covers longitudinal plates up to eta = h_1 / d_0 = 4 (from memory):
a longer bearing is credited as 4 d."""

CHORD_STRESS_FACTOR = 0.4
"""k_p of EN 1993-1-8 7.4.2, 1 - 0.3 n_p (1 + n_p) <= 1, at n_p = 1 (a chord compressed
to its full strength where the force acts): the lowest, taken whatever the stress (the
bending stress at the force is not known to this check; conservative)."""


def round_tube_plate_bearing(dims: Dimensions, strength, bearing_length,
                             brittle=False) -> np.ndarray:
    """Resistance of a round tube to a transverse force through a longitudinal plate of
    length s_s, N.

    EN 1993-1-8:2005 Table 7.2, chord face failure under a longitudinal plate (from memory):
    N = 5 k_p f t^2 (1 + 0.25 eta), eta = s_s / d (<= :data:`PLATE_LENGTH_LIMIT`), with
    k_p = :data:`CHORD_STRESS_FACTOR`; the partial factor is the caller's. Unlike the ring
    mechanism of :func:`round_tube_crushing` it does not vanish for a knife edge (s_s = 0),
    a plate of no length: the shell around the load carries it. The formula is for ductile
    steel; a brittle wall's hinges are taken at their elastic capacity, 2/3 of the plastic
    one (:data:`ELASTIC_FACE` / :data:`PLASTIC_FACE`; our conservative reading).
    """
    outer, wall = _arrays(dims, "outer_diameter", "wall")
    ratio = np.minimum(np.asarray(bearing_length, dtype=float) / outer, PLATE_LENGTH_LIMIT)
    hinges = np.where(np.asarray(brittle, dtype=bool), ELASTIC_FACE / PLASTIC_FACE, 1.0)
    return (5.0 * CHORD_STRESS_FACTOR * hinges * np.asarray(strength, dtype=float) * wall**2
            * (1.0 + 0.25 * ratio))


def round_tube_bearing(dims: Dimensions, strength, bearing_length, brittle=False
                       ) -> np.ndarray:
    """The bearing resistance of a round tube, N: the larger of the plate joint resistance
    (:func:`round_tube_plate_bearing`) and the ring mechanism under the bearing
    (:func:`round_tube_crushing`, scaled by 2/3 for a brittle wall), each a resistance the
    tube has at least (the ring mechanism leaves out the tube beyond the bearing)."""
    hinges = np.where(np.asarray(brittle, dtype=bool), ELASTIC_FACE / PLASTIC_FACE, 1.0)
    return np.maximum(round_tube_plate_bearing(dims, strength, bearing_length, brittle),
                      hinges * round_tube_crushing(dims, strength, bearing_length))


PLASTIC_FACE = 0.25
"""Plastic moment of a face per unit width over f_f t^2 (rectangular section)."""

ELASTIC_FACE = 1.0 / 6.0
"""Elastic moment capacity of a face per unit width over f_f t^2, for brittle faces."""


def sandwich_indentation(dims: Dimensions, face_strength, core_compressive_strength,
                         bearing_length, brittle_faces=False) -> np.ndarray:
    """Core indentation load of a sandwich panel under a load over a bearing length a, N.

    Steeves & Fleck, Collapse mechanisms of sandwich beams with composite faces and a foam
    core, loaded in three-point bending, Int. J. Mech. Sci. 46 (2004), indentation mode (from
    memory): the loaded face forms hinges of moment M at the indenter's edges and a distance
    lambda away, on a core yielding at sigma_c; equilibrium of the side spans gives
    lambda = sqrt(4 M / (b sigma_c)) and

        P = b (a sigma_c + 2 lambda sigma_c) = b a sigma_c + 2 b t sqrt(sigma_f sigma_c)

    for ductile faces (M = b sigma_f t^2 / 4). For brittle faces the hinge moment is taken
    as the elastic capacity b sigma_f t^2 / 6 (derived here by the same mechanism; lower).
    Args: dims ``width``, ``core_thickness``, ``face_thickness``; face and core strengths
    (Pa); bearing length a (m); brittle_faces (bool array).
    """
    width, face = _arrays(dims, "width", "face_thickness")
    core = np.asarray(core_compressive_strength, dtype=float)
    moment = np.where(np.asarray(brittle_faces, dtype=bool), ELASTIC_FACE, PLASTIC_FACE) * (
        np.asarray(face_strength, dtype=float) * face**2)
    hinge_distance = np.sqrt(4.0 * moment / core)
    return width * core * (np.asarray(bearing_length, dtype=float) + 2.0 * hinge_distance)
