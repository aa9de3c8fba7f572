"""The closed forms shared by the checks' minimum scales (service.core.sizing.closed_forms):
Cardano's cubic against scipy's brentq, the power roots against their own inequality."""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.optimize import brentq

from service.core.sizing.closed_forms import cubic_scale, root_scale


def test_cubic_scale_matches_brentq():
    """The closed-form root of alpha s^3 - beta s^2 - gamma against scipy's brentq (1e-12),
    over twelve decades of each coefficient (self-weight dominating, or negligible), with
    the edge cases gamma = 0 (s = beta / alpha) and beta = 0 (s = cbrt(gamma / alpha))."""
    rng = np.random.default_rng(1)
    alpha, beta, gamma = (10.0 ** rng.uniform(-6, 6, 200) for _ in range(3))
    beta[:5], gamma[5:10] = 0.0, 0.0
    ours = cubic_scale(alpha, beta, gamma)
    for a, b, c, s in zip(alpha, beta, gamma, ours, strict=True):
        if c == 0.0:
            assert math.isclose(s, b / a, rel_tol=1e-12)
            continue
        high = np.cbrt(c / a) + b / a
        reference = brentq(lambda x, a=a, b=b, c=c: a * x**3 - b * x**2 - c, 0.0, 2 * high,
                           xtol=1e-300, rtol=1e-15)
        assert math.isclose(s, reference, rel_tol=1e-12), (a, b, c)
    assert cubic_scale(np.inf, 1.0, 1.0) == 0.0


@pytest.mark.parametrize("power", [2, 3, 4])
def test_root_scale_solves_its_inequality(power):
    """capacity s^power = need at the returned s (1e-13), over twelve decades of each; no
    scale for a capacity of zero or below, none needed for an unlimited one."""
    rng = np.random.default_rng(power)
    need, capacity = (10.0 ** rng.uniform(-6, 6, 500) for _ in range(2))
    scale = root_scale(need, capacity, power)
    assert np.allclose(capacity * scale**power / need, 1.0, rtol=1e-13, atol=0.0)
    assert root_scale(1.0, np.array([0.0, -1.0]), power).tolist() == [np.inf, np.inf]
    assert root_scale(1.0, np.inf, power) == 0.0
