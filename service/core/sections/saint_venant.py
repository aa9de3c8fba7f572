"""Saint-Venant torsion of a solid rectangle, the exact series solution.

Timoshenko & Goodier, Theory of Elasticity (3rd ed., 1970), sec. 109 "Torsion of bars with
rectangular cross section" (from memory): for a rectangle with long side ``b`` and short side
``c`` (aspect ``beta = b / c >= 1``), n running over the odd integers,

    K = c^3 b / 3 * [1 - 192 / (pi^5 beta) * sum tanh(n pi beta / 2) / n^5]
    tau_max = G theta c * [1 - 8 / pi^2 * sum 1 / (n^2 cosh(n pi beta / 2))]

with the peak at the middle of the long sides, so Q = T / tau_max = K / (c * stress factor).

The first sum converges slowly as written; using sum over odd n of 1/n^5 = (31/32) zeta(5) it
becomes ``(31/32) zeta(5) - sum (1 - tanh(x_n)) / n^5`` whose terms fall like exp(-n pi beta),
as do those of the second sum. Twelve odd terms (n <= 23) leave a truncation error below
1e-30 for every beta >= 1, far below double precision.
"""

from __future__ import annotations

import numpy as np

ZETA_5 = 1.0369277551433699263
"""Riemann zeta(5) (Abramowitz & Stegun, Handbook of Mathematical Functions, table 23.3)."""

_ODD_TERMS = np.arange(1, 24, 2, dtype=float)
_SUM_INVERSE_ODD_FIFTH = 31.0 / 32.0 * ZETA_5
_NEGLIGIBLE = 46.0
"""n pi beta / 2 beyond which a term, below exp(-46) = 1e-20, is not needed."""


def rectangle_torsion(side_a: np.ndarray, side_b: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Torsion constant and torsion modulus of solid rectangles (sides in either order).

    Args:
        side_a, side_b: the rectangle's sides, m, arrays broadcastable to one shape ``S``.

    Returns:
        ``(torsion_constant, torsion_modulus)``: K in m^4 (twist rate T / (G K)) and Q in m^3
        (peak shear stress T / Q), arrays of shape ``S``.
    """
    torsion_constant, short_side, sech_sum = _series(side_a, side_b, modulus=True)
    stress_factor = 1.0 - 8.0 / np.pi**2 * sech_sum
    return torsion_constant, torsion_constant / (short_side * stress_factor)


def rectangle_torsion_constant(side_a: np.ndarray, side_b: np.ndarray) -> np.ndarray:
    """The torsion constant K of :func:`rectangle_torsion` alone, m^4 (the same values),
    without the second sum, which only the torsion modulus reads."""
    return _series(side_a, side_b, modulus=False)[0]


def _series(side_a, side_b, *, modulus: bool) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """K of the rectangles (see the module doc), their short sides and, with ``modulus``,
    the second sum (else zeros)."""
    side_a = np.asarray(side_a, dtype=float)
    side_b = np.asarray(side_b, dtype=float)
    long_side = np.maximum(side_a, side_b)
    short_side = np.minimum(side_a, side_b)
    half_pi_beta = 0.5 * np.pi * long_side / short_side
    # Beyond n pi beta / 2 = 46 a term is below 1e-20 of the sum's leading one, so long thin
    # strips need only the first term: every rectangle gets that one, and the stubbier ones
    # (a second term not negligible) their sums again over as many terms as the flattest
    # of them needs.
    tanh_deficit, sech_sum = _sums(half_pi_beta, modulus, 1)
    stubby = half_pi_beta < _NEGLIGIBLE / _ODD_TERMS[1]
    if stubby.any():
        tanh_deficit[stubby], sech_sum[stubby] = _sums(half_pi_beta[stubby], modulus)
    tanh_sum = _SUM_INVERSE_ODD_FIFTH - tanh_deficit
    torsion_constant = (
        short_side**3 * long_side / 3.0 * (1.0 - 96.0 / np.pi**4 * tanh_sum / half_pi_beta)
    )
    return torsion_constant, short_side, sech_sum


def _sums(half_pi_beta: np.ndarray, modulus: bool, count: int | None = None
          ) -> tuple[np.ndarray, np.ndarray]:
    """The two sums of the module doc (the first as its deficit from (31/32) zeta(5); the
    second only with ``modulus``, else zeros) over the first ``count`` odd terms, or as many
    as the flattest rectangle needs, each of the shape of ``half_pi_beta``.

    The terms lie on a leading axis, vectorised over every rectangle at once. Each sum adds
    its terms in order from the largest (numpy sums over a leading axis term by term; its
    pairwise summation is only along the fast axis), so a term a rectangle does not need is
    below half an ulp of its running sum and changes nothing: every rectangle's sums are
    the same whatever the others beside it."""
    if count is None:
        with np.errstate(invalid="ignore"):
            flattest = np.min(half_pi_beta, initial=np.inf, where=~np.isnan(half_pi_beta))
        count = max(1, int(np.count_nonzero(_ODD_TERMS * flattest < _NEGLIGIBLE)))
    terms = _ODD_TERMS[:count].reshape((count,) + (1,) * half_pi_beta.ndim)
    decay = np.exp(-terms * half_pi_beta)
    square = decay**2
    denominator = 1.0 + square
    # arrays even for one rectangle (a 0-d sum is a scalar): _series writes into them
    tanh_deficit = np.asarray((2.0 * square / denominator / terms**5).sum(axis=0))
    sech_sum = (np.asarray((2.0 * decay / denominator / terms**2).sum(axis=0)) if modulus
                else np.zeros(np.shape(half_pi_beta)))
    return tanh_deficit, sech_sum


def _square_coefficients() -> tuple[float, float]:
    constant, modulus = rectangle_torsion(np.array(1.0), np.array(1.0))
    return float(constant), float(modulus)


SQUARE_TORSION_CONSTANT, SQUARE_TORSION_MODULUS = _square_coefficients()
"""K = 0.1406 a^4 and Q = 0.2081 a^3 of a solid square of side a, from the same series, so a
square's torsion shape factors are exactly 1."""
