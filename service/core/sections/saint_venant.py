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

import functools

import numpy as np

ZETA_5 = 1.0369277551433699263
"""Riemann zeta(5) (Abramowitz & Stegun, Handbook of Mathematical Functions, table 23.3)."""

_ODD_TERMS = np.arange(1, 24, 2, dtype=float)
_SUM_INVERSE_ODD_FIFTH = 31.0 / 32.0 * ZETA_5
_NEGLIGIBLE = 46.0
"""Decay exponent beyond which a term is not needed. With x = pi beta / 2, term n of the
first sum is at most 2 exp(-2 (n - 1) x) / n^5 of the sum's first term, and of the second
at most 2 exp(-(n - 1) x) / n^2: once that exponent, 2 (n - 1) x or (n - 1) x, reaches 46,
below 2 exp(-46) = 2e-20 of the running sum, far below half its ulp (1.1e-16 of it), so
adding the term changes nothing. Likewise a whole sum, at most 2 exp(-2 x) or 2 exp(-x),
is not needed once that exponent, 2 x or x, reaches 46: it is below 2e-20 of the
(31/32) zeta(5) or the 1 it is taken from, which it leaves as they are."""


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
    # Thin strips need no sum at all (:data:`_NEGLIGIBLE`): only the stubbier rectangles
    # get the first term, and the stubbier still (a second term needed) their sums again
    # over as many terms as the flattest of them needs.
    tanh_deficit = np.zeros(half_pi_beta.shape)
    sech_sum = np.zeros(half_pi_beta.shape)
    for exponent, count in ((1.0, 1), (_ODD_TERMS[1] - 1.0, None)):
        needed = half_pi_beta * (_decay(modulus) * exponent) < _NEGLIGIBLE
        if needed.any():
            tanh_deficit[needed], sech_sum[needed] = _sums(half_pi_beta[needed], modulus,
                                                           count)
    tanh_sum = _SUM_INVERSE_ODD_FIFTH - tanh_deficit
    torsion_constant = (
        short_side**3 * long_side / 3.0 * (1.0 - 96.0 / np.pi**4 * tanh_sum / half_pi_beta)
    )
    return torsion_constant, short_side, sech_sum


def _decay(modulus: bool) -> float:
    """How fast the terms of the sums read fall with n x (:data:`_NEGLIGIBLE`): like
    exp(-2 n x) for the first sum alone, exp(-n x) with the second."""
    return 1.0 if modulus else 2.0


def _sums(half_pi_beta: np.ndarray, modulus: bool, count: int | None = None
          ) -> tuple[np.ndarray, np.ndarray]:
    """The two sums of the module doc (the first as its deficit from (31/32) zeta(5); the
    second only with ``modulus``, else zeros) over the first ``count`` odd terms, or as many
    as the flattest rectangle needs (:data:`_NEGLIGIBLE`), for rectangles ``half_pi_beta``
    of shape (R,) (none NaN), each (R,).

    The terms lie on a leading axis, vectorised over every rectangle at once. Each sum adds
    its terms one after the other from the largest (never numpy's pairwise summation, which
    a lone rectangle's sum along that axis would get), so a term a rectangle does not need
    changes nothing: every rectangle's sums are those of all twelve terms in order,
    whatever the others beside it."""
    if count is None:
        count = max(1, int(np.count_nonzero(
            _decay(modulus) * (_ODD_TERMS - 1.0) * half_pi_beta.min() < _NEGLIGIBLE)))
    terms = _ODD_TERMS[:count, None]
    decay = np.exp(-terms * half_pi_beta)
    square = decay**2
    denominator = 1.0 + square
    tanh_deficit = functools.reduce(np.add, 2.0 * square / denominator / terms**5)
    sech_sum = (functools.reduce(np.add, 2.0 * decay / denominator / terms**2) if modulus
                else np.zeros(np.shape(half_pi_beta)))
    return tanh_deficit, sech_sum


def _square_coefficients() -> tuple[float, float]:
    constant, modulus = rectangle_torsion(np.array(1.0), np.array(1.0))
    return float(constant), float(modulus)


SQUARE_TORSION_CONSTANT, SQUARE_TORSION_MODULUS = _square_coefficients()
"""K = 0.1406 a^4 and Q = 0.2081 a^3 of a solid square of side a, from the same series, so a
square's torsion shape factors are exactly 1."""
