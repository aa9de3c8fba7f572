"""Shear deformation and the exact shear peak: limits, closed forms and broadcasting."""

from __future__ import annotations

import numpy as np
import pytest

from service.core.loadcases import LOAD_CASES
from service.core.sections import FAMILIES, flexure_shear, sandwich, shear_deformation


def test_catalan_constant_matches_its_series():
    k = np.arange(2_000_000, dtype=float)
    assert flexure_shear.CATALAN == pytest.approx(float(((-1.0) ** k / (2 * k + 1) ** 2).sum()),
                                                  abs=1e-12)


def test_rectangle_peak_is_elementary_at_zero_poisson_and_for_narrow_sections():
    ratios = np.array([0.1, 1.0, 5.0])
    np.testing.assert_allclose(flexure_shear.rectangle_shear_peak_factor(ratios, 0.0), 1.0)
    # Narrow sections approach 3 V / (2 A) for any nu; wide ones grow about linearly.
    narrow = flexure_shear.rectangle_shear_peak_factor(0.05, 0.45)
    assert 1.0 < float(narrow) < 1.01
    # wide ones grow linearly with slope 16 G nu / (pi^2 (1 + nu)), the series remainder gone
    wide = flexure_shear.rectangle_shear_peak_factor(np.array([4.0, 8.0]), 0.3)
    slope = 16 * flexure_shear.CATALAN * 0.3 / (np.pi**2 * 1.3)
    assert (wide[1] - wide[0]) / 4 == pytest.approx(slope, rel=1e-4)


def test_existing_rectangle_shear_area_is_the_zero_poisson_limit():
    dims = {"depth": 0.1, "width": 0.15}
    assert float(flexure_shear.solid_rectangle_peak_shear_area(dims, 0.0)) == pytest.approx(
        float(FAMILIES["solid_rectangle"].shear_area(dims)), rel=1e-12)


def test_round_peak_matches_the_library_at_nu_0_3():
    dims = {"diameter": 0.04}
    assert float(flexure_shear.solid_round_peak_shear_area(dims, 0.3)) == pytest.approx(
        float(FAMILIES["solid_round"].shear_area(dims)), rel=1e-12)


@pytest.mark.parametrize(("family_id", "dims", "limit"), [
    # Cowper's own limits: 5/6 and 6/7 at nu = 0, the thin tube 2 (1 + nu) / (4 + 3 nu).
    ("solid_rectangle", {"depth": 1.0, "width": 1.0}, 5 / 6),
    ("solid_round", {"diameter": 1.0}, 6 / 7),
])
def test_cowper_solid_coefficients_at_zero_poisson(family_id, dims, limit):
    area = FAMILIES[family_id].properties(dims).area
    assert float(shear_deformation.TIMOSHENKO_SHEAR_AREA[family_id](dims, 0.0) / area) == (
        pytest.approx(limit, rel=1e-12))


def test_thin_tube_tends_to_cowpers_thin_walled_value():
    dims = {"outer_diameter": 1.0, "wall": 1e-5}
    area = FAMILIES["round_tube"].properties(dims).area
    ratio = shear_deformation.TIMOSHENKO_SHEAR_AREA["round_tube"](dims, 0.3) / area
    assert float(ratio) == pytest.approx(2 * 1.3 / (4 + 0.9), rel=1e-4)


def test_i_and_box_shear_area_is_about_the_web_area():
    # Thin webs carry the shear: k A is within 15 % of the web area h t_w (Cowper's formula
    # for a thin I with wide flanges tends to the web area as the flanges grow).
    dims = {"depth": 0.3, "flange_width": 0.15, "flange_thickness": 0.01, "web_thickness": 0.007}
    web = (0.3 - 0.01) * 0.007
    assert float(shear_deformation.i_section(dims, 0.3)) == pytest.approx(web, rel=0.15)
    box = {"depth": 0.2, "width": 0.1, "wall": 0.004}
    webs = 2 * (0.2 - 0.004) * 0.004
    assert float(shear_deformation.rectangular_tube(box, 0.3)) == pytest.approx(webs, rel=0.15)


def test_shear_deflection_of_a_cantilever_by_hand():
    # Timoshenko beam, end load P: shear deflection P L / (k G A) (Timoshenko & Gere sec. 9.11).
    dims = {"depth": 0.1, "width": 0.05}
    g, nu, load, span = 26e9, 0.33, 1000.0, 0.5
    k = 10 * (1 + nu) / (12 + 11 * nu)
    expected = load * span / (k * g * 0.1 * 0.05)
    deflection = shear_deformation.timoshenko_shear_deflection(
        LOAD_CASES["cantilever_end_load"], load, span, "solid_rectangle", dims, g, nu)
    assert float(deflection) == pytest.approx(expected, rel=1e-12)


def test_sandwich_uses_allens_shear_stiffness():
    dims = {"width": 0.5, "core_thickness": 0.02, "face_thickness": 0.001}
    assert float(shear_deformation.shear_stiffness("sandwich_panel", dims, 70e9, 0.3, 20e6)) == (
        float(sandwich.shear_stiffness(dims, 20e6)))


def test_shear_stiffness_broadcasts_materials_against_geometry():
    dims = {"outer_diameter": np.array([0.02, 0.04, 0.06]), "wall": 0.002}
    stiffness = shear_deformation.shear_stiffness(
        "round_tube", dims, np.array([[26e9], [80e9]]), np.array([[0.33], [0.3]]))
    assert stiffness.shape == (2, 3)
