"""Closed forms shared by the checks' minimum scales at fixed proportions (each check's
``scale_bound``, :mod:`service.core.sizing.checks`; assembled by
:func:`service.core.sizing.scale.scale_bounds`).

Fix the dimensionless proportions p of a section (every dimension but the scale dimension is a
ratio of it). At scale s the properties are A = a(p) s^2, I = i(p) s^4, Z = z(p) s^3,
K = k(p) s^4, Q = q(p) s^3, and the local buckling stress depends on p and the elastic
constants only. Each requirement then fixes a smallest s in closed form:

- bending stiffness  c_D P L^3 / (E i s^4) <= delta_max
- bending strength   M SF / (z s^3) <= sigma_f            (M = c_M P L)
- local buckling     M SF / (z s^3) <= sigma_cr(p, E, nu)
- torsion stiffness  T L / (G k s^4) <= theta_max
- torsion strength   T SF / (q s^3) <= tau_f, buckling likewise with tau_cr
- minimum wall       wall_ratio(p) s >= t_min

Self-weight adds the uniform load W = rho a g L s^2 on the same supports (superposition, see
:mod:`service.core.loadcases`): the stiffness condition becomes a quadratic in s^2, solved
exactly (:func:`timoshenko_scale`), and the moment conditions the cubic
alpha s^3 - beta s^2 - gamma >= 0, which has a single positive root (one sign change,
Descartes' rule), given in closed form by Cardano's formula (:func:`cubic_scale`).

Arrays: every array argument broadcasts to one shape; the engine uses (materials, proportions)
and a :class:`~service.core.sizing.demand.Demand` whose fields may carry a leading case axis
of shape (C, 1, 1), or a row axis of shape (R, 1) when the material rows are (case, material)
pairs (sweeps).
"""

from __future__ import annotations

from typing import TYPE_CHECKING

import numpy as np

from service.core.loadcases import STANDARD_GRAVITY
from service.core.sizing.demand import Demand
from service.core.stability.columns import BENDING_END_CONDITIONS, EFFECTIVE_LENGTH_FACTORS

if TYPE_CHECKING:
    from service.core.sizing.scale import UnitSection


def cubic_scale(alpha, beta, gamma) -> np.ndarray:
    """Smallest s >= 0 with alpha s^3 - beta s^2 - gamma >= 0, for alpha > 0, beta, gamma >= 0.

    ``alpha = inf`` (an unlimited stress) gives 0. Cardano's formula: with b = beta / alpha,
    c = gamma / alpha and s = x + b / 3, the cubic is x^3 + p x + q = 0 (p = -b^2 / 3,
    q = -(2 b^3 / 27 + c)), whose discriminant (q/2)^2 + (p/3)^3 = c (b^3 / 27 + c / 4) is
    never negative: one real root, x = u + v with u = cbrt(-q/2 + sqrt(disc)) and
    v = b^2 / (9 u) (u v = -p / 3, which avoids the cancellation in the second cube root).
    Two Newton steps then take the root to round-off. Every element is computed on its own,
    so a root does not depend on which other elements share the array.
    """
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        if not np.any(beta):
            return np.cbrt(gamma / alpha)
        alpha, beta, gamma = np.broadcast_arrays(
            *(np.asarray(x, dtype=float) for x in (alpha, beta, gamma))
        )
        unlimited = ~np.isfinite(alpha)
        alpha = np.where(unlimited, 1.0, alpha)
        b, c = beta / alpha, gamma / alpha
        half_q = b**3 / 27.0 + c / 2.0                       # -q / 2
        u = np.cbrt(half_q + np.sqrt(c * (b**3 / 27.0 + c / 4.0)))
        scale = u + np.where(u > 0, b * b / (9.0 * u), 0.0) + b / 3.0
        for _ in range(2):
            value = (scale - b) * scale**2 - c
            slope = scale * (3.0 * scale - 2.0 * b)
            scale = scale - np.divide(value, slope, out=np.zeros_like(value), where=slope > 0)
    return np.where(unlimited, 0.0, scale)


def shear_scale(capacity, shear_per_scale2, shear):
    """Smallest s with V(s) / (a_s s^2) <= allowed, V(s) = V + V' s^2: s^2 (a_s allowed - V')
    >= V. ``capacity`` is a_s x allowed / SF; no scale works when V' reaches it."""
    with np.errstate(divide="ignore", invalid="ignore"):
        margin = capacity - shear_per_scale2
        scale = np.sqrt(shear / margin)
        positive = margin > 0
        if np.count_nonzero(positive) == positive.size and positive.shape == scale.shape:
            return scale        # (every margin positive: np.where would copy it)
        return np.where(positive, scale, np.inf)


def root_scale(need, capacity, power: int) -> np.ndarray:
    """Smallest s >= 0 with capacity s^power >= need, for power 2, 3 or 4, as
    need^(1/power) x capacity^(-1/power): ``inf`` where the capacity is not positive, 0 where
    it is unlimited. The two roots are taken on their own arrays (a case's demand, a
    material's and proportion's capacity), so a grid over cases x materials x proportions
    takes them once per case and once per material and proportion."""
    with np.errstate(divide="ignore", invalid="ignore"):
        if power == 4:
            root, unit = np.sqrt(np.sqrt(need)), 1.0 / np.sqrt(np.sqrt(capacity))
        elif power == 3:
            root, unit = np.cbrt(need), np.cbrt(1.0 / capacity)
        else:
            root, unit = np.sqrt(need), 1.0 / np.sqrt(capacity)
        spent = capacity <= 0
        if not np.count_nonzero(spent) and np.shape(spent) == np.shape(unit):
            return root * unit      # (every capacity positive: np.where would copy unit)
        return root * np.where(spent, np.inf, unit)


def power_root(ratio, power: int):
    """ratio^(1 / power) (a general member's twist and torsion buckling scales)."""
    with np.errstate(divide="ignore", invalid="ignore"):
        return np.power(np.asarray(ratio, dtype=float), 1.0 / power)


def quadratic_scale(quadratic, linear, constant):
    """Smallest s with quadratic s^4 - linear s^2 - constant >= 0 (all >= 0)."""
    with np.errstate(divide="ignore", invalid="ignore"):
        return np.sqrt((linear + np.sqrt(linear**2 + 4.0 * quadratic * constant))
                       / (2.0 * quadratic))


def timoshenko_scale(capacity, weight_shear, linear, constant) -> np.ndarray:
    """Smallest s with (capacity - weight_shear) u^2 - linear u - constant >= 0, u = s^2:
    the bending stiffness E i delta u^2 >= the bending deflection's terms (the case's
    c_D P L^3, the self-weight's c_Du W' L^3 u) plus the shear deflection's (Timoshenko:
    c_S P L psi u, and the self-weight's c_Su W' L psi u^2, ``weight_shear`` u^2, which does
    not fall with the size: no scale meets the limit where it reaches the capacity)."""
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        quadratic = capacity - weight_shear
        root = np.sqrt((linear + np.sqrt(linear**2 + 4.0 * quadratic * constant))
                       / (2.0 * quadratic))
        return np.where(quadratic > 0, root, np.inf)


def amplification_term(demand: Demand, span) -> np.ndarray | float:
    """N_c L_e^2 / pi^2 (N m^2) of an axial compression N_c on a bending case, 0 without one.

    A compression amplifies the deflection by 1 / (1 - N_c / P_cr), P_cr = pi^2 E I / L_e^2
    in the plane of bending (``stability.beam_column``), so delta_0 / (1 - N_c L_e^2 /
    (pi^2 E I)) <= delta_max becomes delta_0 E I + delta_max N_c L_e^2 / pi^2 <= delta_max E I:
    the same polynomial in s with this term added to its constant (unfactored loads: a
    serviceability check)."""
    compression = np.maximum(-np.asarray(demand.axial_force, dtype=float), 0.0)
    if not np.any(compression):
        return 0.0
    factor = EFFECTIVE_LENGTH_FACTORS[BENDING_END_CONDITIONS[demand.case.id]]
    return compression * (factor * span) ** 2 / np.pi**2


def case_values(demand: Demand):
    """The load case, span, action and safety factor of ``demand`` (floats as arrays)."""
    return (demand.case, *(np.asarray(value, dtype=float)
                           for value in (demand.span, demand.action, demand.safety_factor)))


def case_peaks(demand: Demand, action, span):
    """A shorthand case's peak moment (or torque) and peak shear without self-weight, N m and
    N (shear None for torsion), for its ``action`` and ``span`` (:func:`case_values`): in
    bending M = c_M P L and V = c_V P."""
    case = demand.case
    if demand.bending:
        return case.moment_coefficient * action * span, case.shear_coefficient * action
    return action, None


def weighted_peaks(unit: UnitSection, density, demand: Demand, action, span):
    """(M, M', V, V') of a shorthand case with self-weight, for its ``action`` and ``span``
    (:func:`case_values`): the peaks M + M' s^2 and V + V' s^2 of the load and of the weight
    rho a g L s^2 on the same supports (the uniform case's coefficients); a torsion case's
    torque T with M' = V = V' = 0."""
    if not demand.bending:
        return action, 0.0, 0.0, 0.0
    case = demand.case
    weight_per_scale2 = density * unit.area * STANDARD_GRAVITY * span
    uniform = case.uniform
    return (case.moment_coefficient * action * span,
            uniform.moment_coefficient * weight_per_scale2 * span,
            case.shear_coefficient * action, uniform.shear_coefficient * weight_per_scale2)
