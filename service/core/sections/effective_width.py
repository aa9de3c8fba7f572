"""Plate strength with the interaction of local buckling and yielding: the effective width
method of EN 1993-1-5:2006 sec. 4.4 (the Winter form), for I-section and box flanges and webs
in major-axis bending (W_eff) and in uniform compression (A_eff, EN 1993-1-5 4.3(3):
:func:`i_section_area`, :func:`rectangular_tube_area`).

Reduction factor (EN 1993-1-5 eq. 4.2 and 4.3, as amended; from memory), plate slenderness
lambda_p = sqrt(f_y / sigma_cr), stress ratio psi (edge stresses, compression positive):

    internal element:  rho = 1 for lambda_p <= 0.5 + sqrt(0.085 - 0.055 psi),
                       else (lambda_p - 0.055 (3 + psi)) / lambda_p^2 <= 1
    outstand:          rho = 1 for lambda_p <= 0.748, else (lambda_p - 0.188) / lambda_p^2 <= 1

with sigma_cr = k_sigma pi^2 E / (12 (1 - nu^2)) (t / b)^2 and k_sigma of EN 1993-1-5
tables 4.1 and 4.2 (4.0 internal at psi = 1, 0.43 outstand at psi = 1, 7.81 - 6.29 psi +
9.78 psi^2 for 0 > psi >= -1, 5.98 (1 - psi)^2 for psi < -1, scaled to be continuous). The
flange's reduction uses the gross section; the web's psi comes from the section with the
effective compression flange and the gross web (EN 1993-1-5 4.4(3)). Effective parts: an
outstand keeps rho c next to the web; an internal flange rho b_p, half at each edge; a web in
bending keeps 0.4 b_eff next to the compression flange and 0.6 b_eff next to the neutral
axis (table 4.1), b_eff = rho b_c with b_c = b_p / (1 - psi) the compressed depth.

Plate widths are the clear widths of the sharp-cornered outline: the flange outstand
(b - t_w) / 2 and web h - 2 t_f of an I-section, b - 2t and h - 2t between the walls of a box.

Imperfection assumptions: the curve is Winter's (1947) fit to tests on cold-formed and
welded steel plates, adopted by EN 1993-1-5 with k_sigma of the perfect plate. It therefore
contains the geometric imperfections (out-of-flatness of the order of b / 200, the fabrication
tolerance of EN 1090-2) and the residual stresses of such plates, and the post-buckling
reserve of a ductile metal plate. Used with the material's own f_y and E it is the steel
curve transferred to other ductile metals; EN 1999-1-1 sec. 6.1.5 gives lower curves for
welded aluminium plates (not applied here). It does not hold for brittle walls or
unidirectional laminates (no ductile post-buckling redistribution): the caller must not
apply it to them.

Every function takes dims (arrays of shape ``S``) and E, nu, f_y (Pa, broadcastable, e.g.
materials ``M x 1``) and returns arrays of the broadcast shape.
"""

from __future__ import annotations

import functools
import operator
from dataclasses import dataclass

import numpy as np

from service.core.sections.base import Dimensions, _as_float_arrays


def reduction_factor(slenderness, stress_ratio, outstand: bool) -> np.ndarray:
    """rho of EN 1993-1-5 eq. 4.2 (internal) or 4.3 (outstand), 1 (see the module docstring).

    Args:
        slenderness: lambda_p = sqrt(f_y / sigma_cr), shape ``S``.
        stress_ratio: psi, edge stress ratio (1 uniform compression, -1 pure bending).
        outstand: True for an outstand element, False for an internal one.
    """
    slenderness = np.asarray(slenderness, dtype=float)
    limit, offset = _winter_constants(stress_ratio, outstand)
    reduced = (slenderness - offset) / np.maximum(slenderness, 1e-300) ** 2
    return np.where(slenderness <= limit, 1.0, np.minimum(reduced, 1.0))


def winter_branch(slenderness, stress_ratio, outstand: bool) -> np.ndarray:
    """Winter's curve of :func:`reduction_factor` continued smoothly below its limit:
    (lambda - c) / lambda^2 at max(lambda, 2c), c the curve's offset (0.055 (3 + psi)
    internal, 0.188 outstand), whose peak lies at lambda = 2c. Between the peak and the limit
    the curve is at least 1 (the limit of an internal element, 0.5 + sqrt(0.085 - 0.055 psi),
    is exactly where it falls back to 1, the larger root of lambda^2 - lambda + c; an
    outstand's 0.748 lies just below its 0.7495), so rho = min(1, branch) at every
    slenderness: a minimum of two smooth pieces, which a gradient search over the proportions
    can follow apart (the kink where rho leaves 1 is where they meet)."""
    slenderness = np.asarray(slenderness, dtype=float)
    _, offset = _winter_constants(stress_ratio, outstand)
    lam = np.maximum(slenderness, 2.0 * offset)
    return (lam - offset) / (lam * lam)


def _winter_constants(stress_ratio, outstand: bool):
    """(limit slenderness, offset c) of EN 1993-1-5 eq. 4.2 (internal) or 4.3 (outstand)."""
    if outstand:
        return 0.748, 0.188
    psi = np.asarray(stress_ratio, dtype=float)
    return 0.5 + np.sqrt(0.085 - 0.055 * psi), 0.055 * (3.0 + psi)


BELOW_PURE_BENDING = (7.81 + 6.29 + 9.78) / (5.98 * 4.0)
"""Scale of table 4.1's expression for psi < -1, 23.88 / 23.92, so that k_sigma is continuous
at psi = -1: the table's two expressions give 23.88 and 23.92 there (it prints 23.9), and a
symmetric section in pure bending has psi = -1 only to rounding, so a jump there would make
its sizing depend on the last bit of psi. The lower value is kept (0.17 % lower below -1,
the safe side)."""


def internal_buckling_coefficient(stress_ratio) -> np.ndarray:
    """k_sigma of an internal element, EN 1993-1-5 table 4.1, for psi <= 1 (continuous at
    psi = -1: :data:`BELOW_PURE_BENDING`)."""
    psi = np.asarray(stress_ratio, dtype=float)
    return np.where(psi >= 0.0, 8.2 / (1.05 + np.maximum(psi, 0.0)),
                    np.where(psi >= -1.0, 7.81 - 6.29 * psi + 9.78 * psi**2,
                             BELOW_PURE_BENDING * 5.98 * (1.0 - psi) ** 2))


OUTSTAND_COEFFICIENT = 0.43
"""k_sigma of an outstand in uniform compression, EN 1993-1-5 table 4.2 (psi = 1)."""


def _slenderness(coefficient, youngs_modulus, poisson_ratio, strength, thickness, width):
    nu = np.asarray(poisson_ratio, dtype=float)
    critical = (coefficient * np.pi**2 * np.asarray(youngs_modulus, dtype=float)
                / (12.0 * (1.0 - nu**2)) * (thickness / width) ** 2)
    return np.sqrt(np.asarray(strength, dtype=float) / critical)


@dataclass(frozen=True)
class EffectiveSection:
    """Effective cross-section in major-axis bending, compression at the top.

    Attributes:
        section_modulus: W_eff = I_eff / (largest distance from the effective neutral axis
            to an extreme fibre), m^3. Compare with M / f_y.
        second_moment: I_eff, m^4.
        neutral_axis: height of the effective neutral axis above the bottom fibre, m.
        flange_factor: rho of the compression flange (outstands or internal flange), 1.
        web_factor: rho of the web(s), 1.
        web_stress_ratio: psi of the web from the section with the effective flange, 1.
    """

    section_modulus: np.ndarray
    second_moment: np.ndarray
    neutral_axis: np.ndarray
    flange_factor: np.ndarray
    web_factor: np.ndarray
    web_stress_ratio: np.ndarray

    def __post_init__(self) -> None:
        _as_float_arrays(self)


def _centroid(pieces):
    """Each piece's area, and the centroid height of rectangles (width, height, y_mid)."""
    areas = [w * h for w, h, _ in pieces]
    return areas, _total([a * y for a, (_, _, y) in zip(areas, pieces, strict=True)]) / _total(
        areas)


def _sum_pieces(pieces):
    """Centroid height and I about that centroid of rectangles (width, height, y_mid)."""
    areas, centroid = _centroid(pieces)
    return centroid, _total([w * h**3 / 12.0 + a * (y - centroid) ** 2
                             for a, (w, h, y) in zip(areas, pieces, strict=True)])


def _total(terms):
    """The sum of arrays, first to last (``sum`` would add them to 0 first: a step more)."""
    return functools.reduce(operator.add, terms)


def _effective(depth, flange_thickness, flange_width, effective_flange_width, web_thickness,
               webs, flange_factor, youngs_modulus, poisson_ratio, strength):
    """The steps common to the I and the box once the compression flange is reduced: the web's
    psi from the effective flange and gross web, its rho, and W_eff.

    ``web_thickness`` is one web's; ``webs`` how many (1 or 2), carried as one of ``webs``
    times the thickness (their pieces lie at the same heights).
    """
    web_depth = depth - 2.0 * flange_thickness
    top, bottom = depth - flange_thickness, flange_thickness     # the web's edges
    flanges = [(effective_flange_width, flange_thickness, depth - 0.5 * flange_thickness),
               (flange_width, flange_thickness, 0.5 * flange_thickness)]
    total_web = webs * web_thickness
    _, axis = _centroid([*flanges, (total_web, web_depth, 0.5 * depth)])
    psi = (axis - bottom) / (axis - top)                             # compression positive
    slenderness = _slenderness(internal_buckling_coefficient(psi), youngs_modulus,
                               poisson_ratio, strength, web_thickness, web_depth)
    rho = reduction_factor(slenderness, psi, outstand=False)
    compressed = np.where(psi < 0.0, web_depth / (1.0 - np.minimum(psi, 0.0)), web_depth)
    effective = rho * compressed
    # EN 1993-1-5 table 4.1: 0.4 b_eff at the flange and 0.6 b_eff towards the neutral axis
    # (psi < 0); 2 b_eff / (5 - psi) at the flange for 0 <= psi < 1.
    near_flange = np.where(psi < 0.0, 0.4, 2.0 / (5.0 - np.clip(psi, 0.0, 1.0))) * effective
    lower_height = web_depth - near_flange - (compressed - effective)
    pieces = [*flanges,
              (total_web, near_flange, top - 0.5 * near_flange),
              (total_web, lower_height, bottom + 0.5 * lower_height)]
    axis, second = _sum_pieces(pieces)
    return EffectiveSection(
        section_modulus=second / np.maximum(depth - axis, axis), second_moment=second,
        neutral_axis=axis, flange_factor=flange_factor, web_factor=rho, web_stress_ratio=psi)


def i_section(dims: Dimensions, youngs_modulus, poisson_ratio, strength) -> EffectiveSection:
    """Effective section of an I-section in major-axis bending (EN 1993-1-5 4.4)."""
    depth, width, flange, web = (np.asarray(dims[name], dtype=float) for name in (
        "depth", "flange_width", "flange_thickness", "web_thickness"))
    outstand = 0.5 * (width - web)
    slenderness = _slenderness(OUTSTAND_COEFFICIENT, youngs_modulus, poisson_ratio, strength,
                               flange, outstand)
    rho = reduction_factor(slenderness, 1.0, outstand=True)
    return _effective(depth, flange, width, web + 2.0 * rho * outstand, web, 1, rho,
                      youngs_modulus, poisson_ratio, strength)


def rectangular_tube(dims: Dimensions, youngs_modulus, poisson_ratio, strength
                     ) -> EffectiveSection:
    """Effective section of a box in major-axis bending (EN 1993-1-5 4.4): the compression
    flange an internal element between the webs, the two webs as one of thickness 2t."""
    depth, width, wall = (np.asarray(dims[name], dtype=float) for name in (
        "depth", "width", "wall"))
    between = width - 2.0 * wall
    slenderness = _slenderness(4.0, youngs_modulus, poisson_ratio, strength, wall, between)
    rho = reduction_factor(slenderness, 1.0, outstand=False)
    return _effective(depth, wall, width, 2.0 * wall + rho * between, wall, 2, rho,
                      youngs_modulus, poisson_ratio, strength)


# --- uniform compression: the effective area ----------------------------------------------


@dataclass(frozen=True)
class EffectiveArea:
    """Effective cross-section in uniform compression (EN 1993-1-5 4.3(3), 4.4; psi = 1 in
    every wall: k_sigma 4.0 internal, 0.43 outstand).

    Attributes:
        area: A_eff, m^2. Compare with N / f_y (EN 1993-1-1 6.2.4 eq. 6.11); a class 4
            column's buckling resistance is chi A_eff f_y with lambda = sqrt(A_eff f_y /
            N_cr) (EN 1993-1-1 6.3.1.1 eq. 6.48, 6.3.1.2 eq. 6.50).
        flange_factor: rho of the flange outstands (I) or of the flanges between the webs
            (box), 1.
        web_factor: rho of the web(s), 1.
        pieces: the areas with each wall's rho either 1 or its Winter branch, every
            combination, the gross area first, m^2, shape (4,) + S; A_eff is their smallest
            (see :func:`_compressed_area`).

    Both sections are doubly symmetric and reduced alike at both flanges, so the effective
    area's centroid stays at the gross one (e_N = 0, no additional moment
    N e_N of EN 1993-1-1 6.2.2.5(4)).
    """

    area: np.ndarray
    flange_factor: np.ndarray
    web_factor: np.ndarray
    pieces: np.ndarray

    def __post_init__(self) -> None:
        _as_float_arrays(self)


AREA_PIECES = 4
"""The smooth pieces of an effective area in uniform compression (:attr:`EffectiveArea.pieces`:
each of two walls' rho either 1 or its Winter branch)."""


def _compressed_area(fixed, flange, web, flange_slenderness, web_slenderness,
                     flange_outstand: bool) -> EffectiveArea:
    """A_eff = fixed + rho_f flange + rho_w web at psi = 1 (every coefficient positive), and
    its :attr:`EffectiveArea.pieces`: the same sum with each rho either 1 or its Winter
    branch (:func:`winter_branch`), every combination, the gross area first. A_eff rises
    with each rho and rho = min(1, branch), so A_eff is the smallest piece, and each piece is
    smooth in the proportions: a search that must follow A_eff across the kinks where a
    wall's rho leaves 1 reads them apart."""
    rho_f = reduction_factor(flange_slenderness, 1.0, outstand=flange_outstand)
    rho_w = reduction_factor(web_slenderness, 1.0, outstand=False)
    branch_f = winter_branch(flange_slenderness, 1.0, outstand=flange_outstand)
    branch_w = winter_branch(web_slenderness, 1.0, outstand=False)
    pieces = np.stack(np.broadcast_arrays(*(fixed + f * flange + w * web
                                            for f in (1.0, branch_f) for w in (1.0, branch_w))))
    return EffectiveArea(area=fixed + rho_f * flange + rho_w * web, flange_factor=rho_f,
                         web_factor=rho_w, pieces=pieces)


def i_section_area(dims: Dimensions, youngs_modulus, poisson_ratio, strength
                   ) -> EffectiveArea:
    """A_eff of an I-section in uniform compression: the four flange outstands
    (b - t_w) / 2 and the web h - 2 t_f (clear widths, as :func:`i_section`) each reduced
    by its rho at psi = 1; 2 t_f (t_w + 2 rho_f c) + rho_w h_w t_w."""
    depth, width, flange, web = (np.asarray(dims[name], dtype=float) for name in (
        "depth", "flange_width", "flange_thickness", "web_thickness"))
    outstand = 0.5 * (width - web)
    web_depth = depth - 2.0 * flange
    return _compressed_area(
        2.0 * flange * web, 4.0 * flange * outstand, web_depth * web,
        _slenderness(OUTSTAND_COEFFICIENT, youngs_modulus, poisson_ratio, strength, flange,
                     outstand),
        _slenderness(4.0, youngs_modulus, poisson_ratio, strength, web, web_depth),
        flange_outstand=True)


def rectangular_tube_area(dims: Dimensions, youngs_modulus, poisson_ratio, strength
                          ) -> EffectiveArea:
    """A_eff of a box in uniform compression: the flanges b - 2t and webs h - 2t between
    the walls (as :func:`rectangular_tube`), internal elements at psi = 1;
    2 t (2 t + rho_f (b - 2t)) + 2 t rho_w (h - 2t)."""
    depth, width, wall = (np.asarray(dims[name], dtype=float) for name in (
        "depth", "width", "wall"))
    between_flange, between_web = width - 2.0 * wall, depth - 2.0 * wall
    return _compressed_area(
        4.0 * wall * wall, 2.0 * wall * between_flange, 2.0 * wall * between_web,
        _slenderness(4.0, youngs_modulus, poisson_ratio, strength, wall, between_flange),
        _slenderness(4.0, youngs_modulus, poisson_ratio, strength, wall, between_web),
        flange_outstand=False)
