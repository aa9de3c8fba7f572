"""Columns: effective length, Euler load about the weaker axis, and the buckling resistance.

    N_cr = pi^2 E I_min / (K L)^2               (Euler, 1744)
    lambda = sqrt(A f / N_cr),  chi = reduction_factor(lambda, alpha, lambda_0)
    N_b = chi A f                               (EN 1993-1-1:2005 6.3.1.1-6.3.1.2, from memory)

I_min = min(I_major, I_minor), the weaker axis. Both axes share the end conditions and every
family takes one curve for both axes here, so the weaker axis has the higher slenderness and
the lower resistance. A long slender column tends to N_cr (chi lambda^2 -> 1), a stocky one to
the squash load A f (chi = 1 up to lambda_0). The curve is the material family's
(``buckling_curves.column_curve``). Local buckling of the walls is a separate check.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from service.core.stability.buckling_curves import reduction_factor
from service.core.stability.lateral_torsional import relative_slenderness

EFFECTIVE_LENGTH_FACTORS: dict[str, float] = {
    "pinned_pinned": 1.0,
    "fixed_free": 2.1,
    "fixed_pinned": 0.80,
    "fixed_fixed": 0.65,
}
"""End conditions -> K, the recommended design values of AISC 360-16 Commentary table C-A-7.1
(from memory): the theoretical values 1.0, 2.0, 0.7 and 0.5 raised because real fixed ends
are never fully rigid."""

EFFECTIVE_LENGTH_SOURCE = ("AISC 360-16 Commentary, table C-A-7.1, recommended design values "
                           "(from memory)")

BENDING_END_CONDITIONS: dict[str, str] = {
    "cantilever_end_load": "fixed_free",
    "cantilever_uniform_load": "fixed_free",
    "simply_supported_center_load": "pinned_pinned",
    "simply_supported_uniform_load": "pinned_pinned",
    "fixed_fixed_center_load": "fixed_fixed",
    "fixed_fixed_uniform_load": "fixed_fixed",
}
"""The end conditions of each built-in bending case's supports, for an axial force on it."""


@dataclass(frozen=True)
class ColumnResistance:
    """Flexural buckling of columns, every field in the broadcast shape of the inputs.

    Attributes:
        critical_load: N_cr about the weaker axis, N.
        relative_slenderness: lambda, dimensionless.
        reduction: chi, dimensionless, in (0, 1].
        resistance: N_b = chi A f, N, before any safety factor.
    """

    critical_load: np.ndarray
    relative_slenderness: np.ndarray
    reduction: np.ndarray
    resistance: np.ndarray


def euler_load(youngs_modulus, second_moment, span, effective_length_factor) -> np.ndarray:
    """pi^2 E I / (K L)^2, N (arrays broadcast: E in Pa, I in m^4, L in m, K dimensionless)."""
    effective = np.asarray(effective_length_factor, dtype=float) * np.asarray(span, dtype=float)
    return np.pi**2 * np.asarray(youngs_modulus, dtype=float) * np.asarray(
        second_moment, dtype=float) / effective**2


def column_resistance(
    span, effective_length_factor, youngs_modulus, strength, area, weaker_second_moment,
    imperfection, plateau,
) -> ColumnResistance:
    """N_b of columns (see the module docstring).

    Args:
        span: L, m.
        effective_length_factor: K (:data:`EFFECTIVE_LENGTH_FACTORS`).
        youngs_modulus: E, Pa.
        strength: f, the design strength, Pa.
        area: A, m^2.
        weaker_second_moment: I_min, m^4.
        imperfection, plateau: alpha and lambda_0 of the material's column curve.

    Returns:
        :class:`ColumnResistance` in the broadcast shape of every argument.
    """
    critical = euler_load(youngs_modulus, weaker_second_moment, span, effective_length_factor)
    squash = np.asarray(strength, dtype=float) * np.asarray(area, dtype=float)
    slenderness = relative_slenderness(squash, critical)
    reduction = reduction_factor(slenderness, imperfection, plateau)
    return ColumnResistance(
        critical_load=np.broadcast_to(critical, reduction.shape),
        relative_slenderness=np.broadcast_to(slenderness, reduction.shape),
        reduction=reduction,
        resistance=reduction * squash,
    )
