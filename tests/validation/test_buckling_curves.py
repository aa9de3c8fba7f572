"""Buckling curves against the standards' printed values and the Perry-Robertson equation.

Reference 1: chi at lambda = 1.0 for the EN 1993-1-1:2005 curves a, b, c, d (table 6.1
imperfection factors 0.21, 0.34, 0.49, 0.76), as printed to three or four figures in design
tables and read off figure 6.4: 0.666, 0.597, 0.540, 0.467 (from memory). Tolerance 0.001, the
printing precision.

Reference 2: the Perry-Robertson equation that defines every Ayrton-Perry curve (Ayrton &
Perry 1886; Robertson 1925; the background of EN 1993-1-1 6.3.1.2, Maquoi & Rondal 1978, from
memory): the member fails when the mid-length fibre of an imperfect column yields,

    (1 - chi)(1 - chi lambda^2) = alpha (lambda - lambda_0) chi,

whose smaller root is chi. Checked to 1e-12 relative over lambda = 0.2 to 5 for every curve
used, a different algebraic form from the implementation's closed root.

Reference 3: EN 1995-1-1:2004 6.3.3 eq. 6.34 k_crit for timber beams (1 up to
lambda_rel,m = 0.75, 1.56 - 0.75 lambda_rel,m up to 1.4, 1 / lambda_rel,m^2 beyond, from
memory): the column curve used for timber beams must not exceed it anywhere.
"""

from __future__ import annotations

import numpy as np
import pytest

from service.core.stability import buckling_curves as curves
from service.core.stability.buckling_curves import reduction_factor

PRINTED_AT_ONE = {0.21: 0.666, 0.34: 0.597, 0.49: 0.540, 0.76: 0.467}

USED = [curves.STEEL_C, curves.STEEL_D, curves.ALUMINIUM_CLASS_B,
        curves.ALUMINIUM_LATERAL_TORSIONAL, curves.TIMBER]


@pytest.mark.parametrize("imperfection", sorted(PRINTED_AT_ONE))
def test_european_curves_at_unit_slenderness(imperfection):
    chi = float(reduction_factor(1.0, imperfection, 0.2))
    assert chi == pytest.approx(PRINTED_AT_ONE[imperfection], abs=1e-3)


@pytest.mark.parametrize("curve", USED, ids=lambda curve: curve.name)
def test_reduction_solves_the_perry_robertson_equation(curve):
    slenderness = np.linspace(max(curve.plateau, 0.05) + 1e-3, 5.0, 200)
    chi = reduction_factor(slenderness, curve.imperfection, curve.plateau)
    left = (1.0 - chi) * (1.0 - chi * slenderness**2)
    right = curve.imperfection * (slenderness - curve.plateau) * chi
    np.testing.assert_allclose(left, right, rtol=1e-9, atol=1e-12)


@pytest.mark.parametrize("curve", USED, ids=lambda curve: curve.name)
def test_limits_squash_plateau_and_euler(curve):
    """chi = 1 on the plateau (the squash load), chi lambda^2 <= 1 always (never above the
    elastic critical load) and -> 1 for very slender members (within 1 % at lambda = 100)."""
    assert np.all(reduction_factor(np.linspace(0.0, curve.plateau, 5), curve.imperfection,
                                   curve.plateau) == 1.0)
    slenderness = np.geomspace(0.3, 100.0, 100)
    chi = reduction_factor(slenderness, curve.imperfection, curve.plateau)
    assert np.all(chi * slenderness**2 <= 1.0 + 1e-12)
    assert np.all(np.diff(chi) <= 0)
    assert chi[-1] * slenderness[-1] ** 2 == pytest.approx(1.0, abs=0.01)
    assert float(reduction_factor(np.inf, curve.imperfection, curve.plateau)) == 0.0


def test_timber_column_curve_is_below_the_beam_curve_of_en_1995():
    slenderness = np.linspace(0.0, 4.0, 401)
    k_crit = np.where(slenderness <= 0.75, 1.0,
                      np.where(slenderness <= 1.4, 1.56 - 0.75 * slenderness,
                               1.0 / np.maximum(slenderness, 1e-9) ** 2))
    chi = reduction_factor(slenderness, curves.TIMBER.imperfection, curves.TIMBER.plateau)
    assert np.all(chi <= k_crit + 1e-12)


def test_curve_choice_is_the_lower_of_the_published_options():
    assert curves.column_curve("steel", "i_section") is curves.STEEL_D
    assert curves.column_curve("steel", "round_tube") is curves.STEEL_C
    assert curves.column_curve("aluminium", "i_section") is curves.ALUMINIUM_CLASS_B
    assert curves.column_curve("composite", "rectangular_tube") is curves.STEEL_D
    assert curves.lateral_torsional_curve("steel", "i_section") is curves.STEEL_D
    assert curves.lateral_torsional_curve("wood", "solid_rectangle") is curves.TIMBER
    alpha, plateau = curves.curve_arrays([curves.STEEL_C, curves.TIMBER])
    np.testing.assert_array_equal(alpha, [0.49, 0.2])
    np.testing.assert_array_equal(plateau, [0.2, 0.3])
