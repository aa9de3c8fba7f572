"""Interaction: buckling with yielding, bending with shear, combined stresses, in the webs and
flanges of I-sections and boxes in bending (issue 19). The utilization is the largest of:

(a) effective width: SF (N_c / A_eff + N_t / A + M / W_eff) / f, the class 4 cross-section
    check of EN 1993-1-1:2005 6.2.9.3 eq. 6.44 (with e_N = 0: I-sections and boxes are
    doubly symmetric and both their flanges reduce alike in uniform compression), N_c a
    compression and N_t a tension; W_eff of EN 1993-1-5:2006 sec. 4.4 in bending and A_eff
    of EN 1993-1-5 4.3(3), 4.4 in uniform compression (psi = 1: k_sigma 4.0 internal, 0.43
    outstand), both by Winter's reduction curve
    (:mod:`service.core.sections.effective_width`, with its imperfection assumptions stated
    there), f the weaker fibre's strength. A column's part is SF N / (A_eff f) (EN 1993-1-1
    6.2.4 eq. 6.11 for a class 4 section); member buckling reads the same A_eff (chi A_eff
    f, EN 1993-1-1 6.3.1: :mod:`service.core.sizing.checks.member_buckling`). Only for
    ductile in-plane isotropic materials: Winter's curve is a fit to tests on ductile metal
    plates and holds their post-buckling redistribution, which neither a brittle wall nor a
    unidirectional or orthotropic one has. For those materials this part is 0 and their
    walls stay on the gross section with the elastic buckling stress as a cap (the strength
    and local buckling checks, both required: no post-buckling reserve is credited).
(b) web bending with shear buckling: SF sqrt((n_c / sigma_cr,c + sigma_b / sigma_cr,b)^2 +
    (tau / tau_cr + tau_T / tau_cr,T)^2), the circular interaction of a long simply supported
    plate under bending and shear (Timoshenko & Gere, Theory of Elastic Stability, 1961,
    sec. 9.9; Bleich, Buckling Strength of Metal Structures, 1952; from memory:
    (sigma / sigma_cr)^2 + (tau / tau_cr)^2 = 1 at buckling,
    :func:`service.core.sections.web.bending_shear_buckling_interaction`), with an axial
    compression n_c added linearly to the bending term (the linear sum of compression and
    bending is conservative for plates, Bulson 1970, as in
    :func:`service.core.sizing.member_stability.wall_compression_ratio`) and a box's Bredt
    shear flow to the web's shear (an I-section's Saint-Venant torsion puts no membrane shear
    in its web). Orthotropic walls take their own critical stresses (the circular form is
    then an assumption, not a published result for them). The square root of the sum of
    squares is reported so that the utilization stays linear in the load, as every other
    check's (the issue's 1.56 as a sum of squares is a utilization of 1.25).
(c) combined stress at the web-flange junction (:func:`service.core.sections.web
    .junction_stresses`: M y / I with |N| / A, and V S / (I t) with the torsion shear of the
    web): SF sqrt(sigma^2 + 3 tau^2) / f (von Mises) for ductile materials, SF (sigma / 2 +
    sqrt(sigma^2 / 4 + tau^2)) / f (the largest principal stress, Rankine) for brittle ones,
    f the weaker fibre's strength.

Parts (a) and (b) read buckling: they are 0 where the request turns local buckling off.

Columns (load case ``column``) are read too: their actions are the axial force alone, so (a)
is SF N / (A_eff f), (b) the walls' buckling in uniform compression (as the local buckling
check) and (c) N / A (as the strength check).

The actions are the member's peaks taken together: the peak moment with the peak shear (and a
general member's peak torque and its axial force), as if they acted at one section. That is
conservative where the peaks lie apart (a simply supported beam's mid-span moment and end
shear) and exact where they coincide (a fixed end: the peak moment and the peak shear of a
fixed-fixed beam under a central load are both at the supports); a shorthand case and a
general member use the same rule, so the search's scale and the recheck agree.

At fixed proportions every stress ratio here is scale-free (the plates' slenderness, the
junction's stress over the peak one), so the minimum scale of each part is a monotone root in
s (:func:`interaction_scale`): (a) is the strength check's cubic with W_eff; (b) and the
von Mises form of (c) are circular in the peak bending and shear stresses, a cubic in s^2
(:func:`circular_scale`) where no torque or axial force joins them; otherwise (and for the
principal stress of brittle walls) they are roots of a smooth function of the peak stresses
at s, found together for every element (:func:`monotone_root`).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import TYPE_CHECKING

import numpy as np

from service.core.loadcases import STANDARD_GRAVITY
from service.core.sections import effective_width, web
from service.core.sections.base import LocalBuckling, SectionFamily
from service.core.sizing.checks.base import Actions, Check, Found
from service.core.sizing.closed_forms import case_values, cubic_scale, shear_scale
from service.core.sizing.demand import Demand
from service.core.sizing.values import MaterialValues
from service.core.stability.member import FlatTake

if TYPE_CHECKING:
    from service.core.sizing.scale import UnitSection

FAMILIES = ("i_section", "rectangular_tube")
"""The families with webs and flanges that this check reads (I-sections and boxes)."""


@dataclass(frozen=True)
class WebSection:
    """What the interaction reads of a section, scale-free at fixed proportions (arrays
    broadcasting with the materials).

    Attributes:
        effective_ratio: Z / W_eff (>= 1) of EN 1993-1-5 4.4 for ductile in-plane isotropic
            materials, 0 where Winter's curve does not apply (see the module docstring).
        junction_normal: the web-flange junction's normal stress over the peak M / Z.
        junction_shear: the junction's transverse shear stress over the peak V / A_s.
        junction_torsion: the junction's torsion shear over the peak T / Q (0 without torque).
        web_bending_buckling: the web's bending mode against the peak M / Z, Pa.
        web_shear_buckling: the web's shear buckling against the peak V / A_s, Pa.
        web_torsion_buckling: a box web's shear buckling under the Bredt shear flow against
            the peak T / Q, Pa (``inf``: none, an open web).
        compression_buckling: the walls' buckling in uniform compression against N / A, Pa
            (``inf`` without an axial compression).
        area_ratio: A / A_eff (>= 1) in uniform compression for ductile in-plane isotropic
            materials (EN 1993-1-5 4.3(3)), 1 elsewhere and without an axial compression.
        area_ratio_pieces: A over each of the effective area's smooth pieces
            (``effective_width.EffectiveArea.pieces``; ``area_ratio`` is their largest),
            stacked on a first axis; 1 where ``area_ratio`` is.
    """

    effective_ratio: np.ndarray
    junction_normal: np.ndarray
    junction_shear: np.ndarray
    junction_torsion: np.ndarray | float
    web_bending_buckling: np.ndarray
    web_shear_buckling: np.ndarray | float
    web_torsion_buckling: np.ndarray | float
    compression_buckling: np.ndarray | float = np.inf
    area_ratio: np.ndarray | float = 1.0
    area_ratio_pieces: np.ndarray | float = 1.0


def web_section(family: SectionFamily, dims: dict, materials: MaterialValues,
                buckling: LocalBuckling, compression=np.inf, torsion: bool = False,
                known=None) -> WebSection | None:
    """The :class:`WebSection` of ``dims`` (actual or unit scale) for ``materials`` (arrays
    broadcasting with the dimensions), with the walls' ``buckling`` already computed and
    their buckling in uniform ``compression``; ``torsion``: the member carries a torque;
    ``known``: the sections' I, Z (``sizing_properties`` in bending) and ``shear_area``
    where the caller has them already. None for a family the check does not read."""
    if family.id not in FAMILIES:
        return None
    if known is None:
        _, second_moment, modulus = family.sizing_properties(dims, "bending")
        shear_area = family.shear_area(dims)
    else:
        second_moment, modulus, shear_area = known
    normal, shear = web.junction_stresses(family.id, dims, 1.0, 1.0,
                                          second_moment=second_moment)
    junction_torsion: np.ndarray | float = 0.0
    web_torsion: np.ndarray | float = np.inf
    if torsion:
        _, _, torsion_modulus = family.sizing_properties(dims, "torsion")
        junction_torsion = web.junction_stresses(family.id, dims, 0.0, 0.0, 1.0,
                                                 second_moment=second_moment)[1] * (
            torsion_modulus)
        if family.id == "rectangular_tube":
            web_torsion = buckling.torsion_modes[0]     # the webs (depth walls) in shear
    winter = (np.asarray(materials.brittle) == 0) & ~np.asarray(materials.orthotropic)
    effective = getattr(effective_width, family.id)(
        dims, materials.youngs_modulus, materials.poisson_ratio,
        materials.compression_strength).section_modulus
    area_ratio: np.ndarray | float = 1.0
    area_ratio_pieces: np.ndarray | float = 1.0
    if np.any(np.isfinite(compression)):    # an axial compression: A / A_eff
        area = family.sizing_properties(dims, "bending")[0]
        effective_area = getattr(effective_width, family.id + "_area")(
            dims, materials.youngs_modulus, materials.poisson_ratio,
            materials.compression_strength)
        area_ratio = np.where(winter, area / effective_area.area, 1.0)
        area_ratio_pieces = np.where(winter, area / effective_area.pieces, 1.0)
    return WebSection(
        effective_ratio=np.where(winter, modulus / effective, 0.0),
        junction_normal=normal * modulus, junction_shear=shear * shear_area,
        junction_torsion=junction_torsion,
        web_bending_buckling=buckling.bending_modes[1],    # the web, each family's second
        web_shear_buckling=buckling.shear, web_torsion_buckling=web_torsion,
        compression_buckling=compression, area_ratio=area_ratio,
        area_ratio_pieces=area_ratio_pieces)


def effective_part(section: WebSection, bending, shear, torsion, axial,
                   materials: MaterialValues, factor) -> np.ndarray:
    """Part (a) from the peak stresses (Pa): ``bending`` M / Z, ``shear`` V / A_s, ``torsion``
    T / Q and ``axial`` N / A (positive tension; a compression over A_eff); 0 where Winter's
    curve does not apply. The parts leave round-off warnings to their callers
    (:func:`ratios`)."""
    axial = np.asarray(axial, dtype=float)
    normal = np.where(axial < 0.0, -axial * section.area_ratio, axial)
    effective = factor * (normal + bending * section.effective_ratio) / (
        materials.compression_strength)
    return np.where(section.effective_ratio > 0, effective, 0.0)


def buckling_part(section: WebSection, bending, shear, torsion, axial,
                  materials: MaterialValues, factor) -> np.ndarray:
    """Part (b) from the peak stresses (as :func:`effective_part`)."""
    bending_term = bending / section.web_bending_buckling
    if np.any(np.asarray(axial) < 0):
        pressed = np.maximum(-np.asarray(axial, dtype=float), 0.0)
        bending_term = bending_term + np.where(
            pressed > 0, pressed / section.compression_buckling, 0.0)
    shear_term = shear / section.web_shear_buckling
    if np.any(np.asarray(torsion) > 0):
        shear_term = shear_term + torsion / section.web_torsion_buckling
    return factor * np.sqrt(bending_term**2 + shear_term**2)


def combined_part(section: WebSection, bending, shear, torsion, axial,
                  materials: MaterialValues, factor) -> np.ndarray:
    """Part (c) from the peak stresses (as :func:`effective_part`)."""
    normal = np.abs(axial) + bending * section.junction_normal
    tangential = shear * section.junction_shear
    if np.any(np.asarray(torsion) > 0):
        tangential = tangential + torsion * section.junction_torsion
    brittle = np.asarray(materials.brittle) > 0
    if not brittle.any():
        equivalent = web.von_mises(normal, tangential)
    elif brittle.all():
        equivalent = web.max_principal(normal, tangential)
    else:
        equivalent = np.where(brittle, web.max_principal(normal, tangential),
                              web.von_mises(normal, tangential))
    return factor * equivalent / materials.compression_strength


def ratios(section: WebSection, bending, shear, torsion, axial, materials: MaterialValues,
           factor, local_buckling: bool) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Parts (a), (b), (c) of the module docstring from the peak stresses (as
    :func:`effective_part`); (a) and (b) are 0 without local buckling."""
    with np.errstate(divide="ignore", invalid="ignore"):
        combined = combined_part(section, bending, shear, torsion, axial, materials, factor)
        if not local_buckling:
            return np.zeros_like(combined), np.zeros_like(combined), combined
        return (effective_part(section, bending, shear, torsion, axial, materials, factor),
                buckling_part(section, bending, shear, torsion, axial, materials, factor),
                combined)


def utilization(actions: Actions, materials: MaterialValues, demand: Demand) -> np.ndarray:
    """The largest of (a), (b), (c) (module docstring); 0 for a section it does not read."""
    section = actions.web
    if section is None:
        return np.zeros_like(actions.stress)
    bending: np.ndarray | float
    shear: np.ndarray | float
    torsion: np.ndarray | float
    axial: np.ndarray | float
    if actions.member is not None:
        member = actions.member
        bending, shear = member.bending_stress - member.compression_stress, member.shear_stress
        torsion, axial = member.torsion_stress, member.axial_stress
    elif demand.case.loading == "compression":     # a column: P / A alone, compressive
        bending, shear, torsion = 0.0, 0.0, 0.0
        axial = -np.asarray(actions.stress, dtype=float)
    else:
        bending, shear = actions.stress, actions.shear
        torsion, axial = 0.0, actions.axial_stress
    return np.maximum.reduce(ratios(section, bending, shear, torsion, axial, materials,
                                    demand.safety_factor, demand.local_buckling))


def requested(demand: Demand) -> bool:
    """Asked for in every bending case, column and general member (the safe default)."""
    return demand.member is not None or demand.bending or reads_column(demand)


def reads_column(demand: Demand) -> bool:
    """A column (load case ``column``, a shorthand case): its A_eff is read."""
    return demand.member is None and demand.case.loading == "compression"


def for_family(family: SectionFamily, demand: Demand) -> bool:
    """I-sections and boxes (:data:`FAMILIES`); a sandwich panel's faces and core are
    checked by its own face wrinkling and core shear (:mod:`service.core.sizing.sandwich`)."""
    return family.id in FAMILIES


def scale_bound(unit: UnitSection, materials: MaterialValues, demand: Demand, found: Found
                ) -> list[np.ndarray] | None:
    """The scale parts (a), (b), (c) at fixed proportions (:func:`interaction_scale`) with
    the peaks of a general member (its M, V, T and N, the self-weight's per s^2) or of a
    shorthand case (its coefficients; a bending case's ``axial_force``; a column's axial
    force alone, :func:`column_scale`); None for sections the check does not read."""
    section = unit.web
    if section is None:
        return None
    weight = (materials.density * unit.area * STANDARD_GRAVITY) if demand.self_weight else 0.0
    if demand.member is not None and unit.member is not None:
        member, general = demand.member, unit.member
        return interaction_scale(
            section, general.section_modulus, general.shear_area, general.area,
            general.torsion_modulus, materials, demand.safety_factor, demand.local_buckling,
            member.moment, member.weight_moment * weight, member.shear,
            member.weight_shear * weight, member.torque, member.axial)
    case, span, action, factor = case_values(demand)
    if case.loading == "compression":       # a column: its axial force alone
        return column_scale(section, unit.area, materials, factor, demand.local_buckling,
                            action)
    return interaction_scale(
        section, unit.strength_modulus, unit.shear_area, unit.area, np.inf, materials, factor,
        demand.local_buckling, case.moment_coefficient * action * span,
        case.uniform.moment_coefficient * weight * span * span,
        case.shear_coefficient * action, case.uniform.shear_coefficient * weight * span,
        0.0, np.asarray(demand.axial_force, dtype=float), found.floor())


INTERACTION = Check("interaction", utilization, requested,
                    "interaction of buckling, bending and shear", for_family, scale_bound)


# --- the minimum scale at fixed proportions -----------------------------------------------

ROOT_ITERATIONS = 16
"""Most Illinois (modified regula falsi) steps on log u against log s; the smooth root
converges superlinearly, and the loop stops once every element is within
:data:`ROOT_TOLERANCE`."""

ROOT_TOLERANCE = 1e-13
"""|log u| at which a root counts as found (u within 1e-13 of 1)."""

BRACKET_STEPS = (1.0, 4.0, 12.0)
"""Trial widths, in log s above the lower bound, for the feasible end of the bracket where
the first trial fails (the last: 1.6e5 times the lower bound; no root there counts as
none)."""


def monotone_root(ratio, low, shape, power: float = 1.0) -> np.ndarray:
    """Smallest s >= ``low`` with ``ratio(s) <= 1`` for a ratio falling with s, every element
    at once (``low`` a lower bound of the root, where ``ratio(low) >= 1``).

    The first trial for the feasible end of the bracket is log s = log low + log u(low) /
    ``power``: where every term of u falls at least as fast as 1 / s^power (the stresses of
    the loads: 1 / s^3 and 1 / s^2, so 2; with a self-weight's moment, 1 / s: 1) u passes
    there; where a term does not fall (a self-weight's shear), the wider
    :data:`BRACKET_STEPS` follow. Then Illinois steps on
    log u against log s, up to :data:`ROOT_ITERATIONS`, return the feasible end of the
    bracket (or a point within :data:`ROOT_TOLERANCE` of the root). ``inf`` where no trial
    passes; 0 where ``low`` is 0 (no bending and no shear: nothing for this check to hold
    apart from the strength check's torque and axial force)."""
    low = np.broadcast_to(np.asarray(low, dtype=float), shape)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore", under="ignore"):
        start = np.where(np.isfinite(low) & (low > 0), low, 1.0)
        x_low = np.log(start)
        f_low = np.log(np.broadcast_to(ratio(start), shape))
        found = f_low <= 0.0
        x_high, f_high = x_low.copy(), f_low.copy()
        for width in (None, *BRACKET_STEPS):
            if found.all():
                break
            x = x_low + (np.maximum(f_low, 1e-9) / power if width is None else width)
            value = np.log(np.broadcast_to(ratio(np.exp(x)), shape))
            take = ~found & (value <= 0.0)
            x_high, f_high = np.where(take, x, x_high), np.where(take, value, f_high)
            found = found | take
        side = np.zeros(shape)
        done = found & (f_low <= 0.0)
        for _ in range(ROOT_ITERATIONS):
            if done.all():
                break
            span = f_low - f_high
            x = np.where(span > 0, x_low + f_low * (x_high - x_low) / span,
                         0.5 * (x_low + x_high))
            x = np.clip(x, np.minimum(x_low, x_high), np.maximum(x_low, x_high))
            value = np.log(np.broadcast_to(ratio(np.exp(x)), shape))
            passes = (value <= 0.0) | (np.abs(value) < ROOT_TOLERANCE)
            # Illinois: halve the value at the end kept twice running
            f_low = np.where(passes, np.where(side > 0, f_low / 2.0, f_low), value)
            f_high = np.where(passes, value, np.where(side < 0, f_high / 2.0, f_high))
            side = np.where(passes, 1.0, -1.0)
            x_high = np.where(passes & ~done, x, x_high)
            x_low = np.where(passes | done, x_low, x)
            done = done | (np.abs(value) < ROOT_TOLERANCE) | (x_high - x_low < ROOT_TOLERANCE)
        scale = np.where(found, np.exp(x_high), np.inf)
    return np.where(low == 0, 0.0, np.where(np.isfinite(low), scale, np.inf))


def circular_scale(bending_modulus, shear_modulus, moment, moment_per_scale2, shear,
                   shear_per_scale2, floor=None) -> np.ndarray:
    """Smallest s >= 0 with (M(s) / (z s^3))^2 + (V(s) / (a s^2))^2 <= 1, M(s) = M + M' s^2,
    V(s) = V + V' s^2 (arrays broadcast): the circular form of parts (b) and (c) without a
    torque or an axial force, ``bending_modulus`` z and ``shear_modulus`` a the unit
    section's Z and A_s times the allowed stress over SF (``inf``: the term does not limit).

    With u = s^2 and A = 1 / z, B = 1 / a, multiplying by u^3 gives the cubic
    g(u) = (1 - B^2 V'^2) u^3 - (A^2 M'^2 + 2 B^2 V V') u^2 - (2 A^2 M M' + B^2 V^2) u
    - A^2 M^2 >= 0, whose coefficients change sign once (Descartes: one positive root u*;
    g < 0 below it, > 0 above). g is convex and rising above u* (u* >= c_2 / c_3, beyond the
    inflection at c_2 / (3 c_3)), so Newton's method from an upper bound falls onto u* from
    above, every iterate feasible. The bound: with r the largest of c_2 / c_3,
    sqrt(c_1 / c_3) and cbrt(c_0 / c_3) (u* >= r: each term alone is at most u^3), at
    u = k r the terms sum to at most (1 / k + 1 / k^2 + 1 / k^3) u^3, which is u^3 at
    k = :data:`TRIBONACCI`; so r <= u* <= 1.84 r. ``inf`` where the self-weight's shear
    alone reaches the capacity (B V' >= 1: no size works); 0 where nothing loads the
    section.

    With ``floor`` (m, the other checks' largest scale on a grid that reads only the
    scale: :meth:`~service.core.sizing.checks.base.Found.floor`), an element whose bound
    1.84 r is at most floor^2 cannot set the scale: it returns sqrt(r), a lower bound at most
    the floor, without Newton's steps, which run on the other elements alone."""
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        bend, cut = 1.0 / np.asarray(bending_modulus, dtype=float), 1.0 / np.asarray(
            shear_modulus, dtype=float)
        moment, moment_per_scale2, shear, shear_per_scale2 = (
            np.asarray(x, dtype=float) for x in (moment, moment_per_scale2, shear,
                                                 shear_per_scale2))
        lead = 1.0 - (cut * shear_per_scale2) ** 2
        square = ((bend * moment_per_scale2) ** 2 + 2.0 * cut * cut * shear * shear_per_scale2
                  ) / lead
        linear = (2.0 * bend * bend * moment * moment_per_scale2 + (cut * shear) ** 2) / lead
        constant = (bend * moment) ** 2 / lead
        low = np.maximum.reduce(np.broadcast_arrays(square, np.sqrt(linear),
                                                    np.cbrt(constant)))
        low = np.where(np.isfinite(low) & (lead > 0), low, 0.0)
        if floor is None:
            u = _newton_from_above(TRIBONACCI * low, square, linear, constant)
        else:
            shape = np.broadcast_shapes(low.shape, np.shape(floor))
            u = np.array(np.broadcast_to(low, shape))
            search = np.flatnonzero(~(TRIBONACCI * u <= np.broadcast_to(floor, shape) ** 2))
            if search.size:
                take = FlatTake(shape, search)
                u.reshape(-1)[search] = _newton_from_above(*(
                    take(x) for x in (TRIBONACCI * u, square, linear, constant)))
        return np.where(lead > 0, np.sqrt(u), np.inf)


def _newton_from_above(u, square, linear, constant) -> np.ndarray:
    """Newton's steps on u^3 - square u^2 - linear u - constant from ``u`` at or above its
    largest root (see :func:`circular_scale`), arrays of one shape."""
    twice = 2.0 * square
    for _ in range(CIRCULAR_ITERATIONS):
        value = ((u - square) * u - linear) * u - constant
        slope = (3.0 * u - twice) * u - linear
        step = np.divide(value, slope, out=np.zeros_like(u), where=slope > 0)
        u = u - step
        if not np.count_nonzero(step > ROOT_TOLERANCE * u):     # (cheaper than np.any)
            break
    return u


TRIBONACCI = 1.839286755214161
"""The real root of k^3 = k^2 + k + 1 (:func:`circular_scale`'s starting bound)."""

CIRCULAR_ITERATIONS = 40
"""Most Newton steps of :func:`circular_scale`: from at most 1.84 times the root, about 6
to round-off; the loop stops once no element moves by more than :data:`ROOT_TOLERANCE`
of its value."""


def interaction_scale(section: WebSection, modulus, shear_area, area, torsion_modulus,
                      materials: MaterialValues, factor, local_buckling: bool,
                      moment, moment_per_scale2, shear, shear_per_scale2, torque=0.0,
                      axial=0.0, floor=None) -> list[np.ndarray]:
    """The smallest scale of each part (a), (b), (c) at fixed proportions (arrays broadcast):
    the unit section's Z = ``modulus`` s^3, A_s = ``shear_area`` s^2, A = ``area`` s^2 and
    Q = ``torsion_modulus`` s^3, the peaks M + M' s^2, V + V' s^2 (the self-weight's parts
    per s^2), T and N (positive tension). Each part's root starts from a lower bound where
    its bending or shear term alone reaches 1 (closed forms:
    :func:`~service.core.sizing.closed_forms.cubic_scale`, :func:`~service.core.sizing.closed_forms
    .shear_scale`). ``floor``: as for :func:`circular_scale` (its closed forms use it)."""
    factor = np.asarray(factor, dtype=float)
    strength = materials.compression_strength
    shape = np.broadcast_shapes(*(np.shape(x) for x in (
        modulus, shear_area, area, strength, factor, moment, moment_per_scale2, shear,
        shear_per_scale2, section.effective_ratio, section.web_shear_buckling)))
    plain = not (np.any(torque) or np.any(axial))

    def at(s):
        """The peak stresses M / Z, V / A_s, T / Q, N / A at scales s."""
        square = s * s
        cube = square * s
        return ((moment + moment_per_scale2 * square) / (modulus * cube),
                (shear + shear_per_scale2 * square) / (shear_area * square),
                torque / (torsion_modulus * cube) if np.any(torque) else 0.0,
                axial / (area * square) if np.any(axial) else 0.0)

    def bending_root(capacity):     # M(s) / (z s^3) x SF <= capacity
        return cubic_scale(modulus * capacity / factor, moment_per_scale2, moment)

    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        brittle = np.asarray(materials.brittle) > 0
        junction = np.maximum(section.junction_normal, 1e-300)
        # (b) and (c) are circular in the peak stresses without a torque, an axial force or
        # a brittle material: closed forms, no solver (and no lower bound to start it from)
        circular = plain and not brittle.any()
        roots: dict = {}
        scales: dict = {effective_part: np.zeros(shape), buckling_part: np.zeros(shape)}
        if circular:
            scales[combined_part] = circular_scale(
                modulus * strength / (junction * factor),
                shear_area * strength / (math.sqrt(3.0) * section.junction_shear * factor),
                moment, moment_per_scale2, shear, shear_per_scale2, floor)
        else:
            # (c): sigma_eq >= |sigma| and >= sqrt(3) tau (von Mises) or tau (Rankine)
            roots[combined_part] = np.maximum(
                bending_root(strength / junction),
                shear_scale(shear_area * strength / (np.where(brittle, 1.0, math.sqrt(3.0))
                                                     * section.junction_shear * factor),
                            shear_per_scale2, shear))
        if local_buckling:
            winter = section.effective_ratio > 0
            effective = np.where(winter, bending_root(
                strength / np.where(winter, section.effective_ratio, 1.0)), 0.0)
            if plain:
                scales[effective_part] = effective      # the closed form: no other term
            else:
                roots[effective_part] = effective
            if circular:
                scales[buckling_part] = circular_scale(
                    modulus * section.web_bending_buckling / factor,
                    shear_area * section.web_shear_buckling / factor,
                    moment, moment_per_scale2, shear, shear_per_scale2, floor)
            else:
                roots[buckling_part] = np.maximum(
                    bending_root(section.web_bending_buckling),
                    shear_scale(shear_area * section.web_shear_buckling / factor,
                                shear_per_scale2, shear))
        if not roots:
            return [np.broadcast_to(scales[part], shape)
                    for part in (effective_part, buckling_part, combined_part)]
        # every other part's root at once (stacked on a first axis: one pass of the solver)
        parts = list(roots)

        def ratio(s):
            stresses = at(s)
            return np.stack([np.broadcast_to(part(section, *(
                x[k] if np.ndim(x) else x for x in stresses), materials, factor), shape)
                for k, part in enumerate(parts)])
        found = monotone_root(ratio, np.stack([np.broadcast_to(roots[part], shape)
                                               for part in parts]), (len(parts), *shape),
                              power=1.0 if np.any(moment_per_scale2) else 2.0)
        scales.update(zip(parts, found, strict=True))
    return [np.broadcast_to(scales[part], shape)
            for part in (effective_part, buckling_part, combined_part)]


def column_scale(section: WebSection, area, materials: MaterialValues, factor,
                 local_buckling: bool, force) -> list[np.ndarray]:
    """The smallest scale of each part (a), (b), (c) of a column (compressive ``force`` P > 0,
    the unit section's area A s^2): each part is SF P / (A s^2) over a capacity, so
    s = sqrt(SF P / (A x capacity)) with the capacities f / (A / A_eff) (a), the walls'
    buckling in uniform compression (b) and f (c); (a) and (b) are 0 without local
    buckling, (a) also where Winter's curve does not apply."""
    factor = np.asarray(factor, dtype=float)
    strength = materials.compression_strength
    need = factor * np.asarray(force, dtype=float) / area

    def root(capacity):
        with np.errstate(divide="ignore", invalid="ignore"):
            return np.sqrt(need / capacity)

    shape = np.broadcast_shapes(np.shape(need), np.shape(strength),
                                np.shape(section.area_ratio),
                                np.shape(section.compression_buckling),
                                np.shape(section.effective_ratio))
    combined = np.broadcast_to(root(strength), shape)
    if not local_buckling:
        return [np.zeros(shape), np.zeros(shape), combined]
    winter = section.effective_ratio > 0
    effective = np.where(winter, root(strength / section.area_ratio), 0.0)
    return [np.broadcast_to(effective, shape),
            np.broadcast_to(root(section.compression_buckling), shape), combined]
