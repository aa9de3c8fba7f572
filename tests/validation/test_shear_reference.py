"""Shear of solid and thin-walled sections against published tables and sectionproperties.

1. Exact flexure shear peak of solid rectangles (service.core.sections.flexure_shear) against
   Timoshenko & Goodier, Theory of Elasticity, 3rd ed., sec. 124, table for nu = 1/4 (from
   memory): 1.033, 1.126, 1.396, 1.988 times 3 V / (2 A) at width/depth 1/2, 1, 2, 4.
   Tolerance: half a unit in the printed third decimal.
2. The same peak against the sectionproperties finite-element flexure solution (its own
   Saint-Venant solver, quadratic triangles, mesh A/800), at nu = 0, 0.3 and 0.45.
   Measured: within 0.2 %; tolerance 1 %. Likewise the round tube's exact peak at the bore
   (hollow circle, Timoshenko & Goodier sec. 124) at t/D 0.02 and 0.3, the
   reference a 512-gon, mesh A/6000: the bore's polygon corners are re-entrant corners of the
   material, whose local stress raisers a coarse polygon mistakes for the peak (at t/D 0.02,
   nu 0.3: 64-gon 3462, 256-gon 3320, 512-gon 3306 Pa against the exact 3299 Pa for V = 1 N).
   Measured: within 0.3 %; tolerance 1 %.
3. Cowper's Timoshenko shear areas (service.core.sections.shear_deformation) against the
   sectionproperties shear areas (energy definition from the same FE flexure solution).
   The two definitions coincide at nu = 0 (both give 5/6 for the rectangle, 6/7 for the
   circle, 1/2 for the thin tube), so the comparison is made there. Measured: solid and round
   sections within 0.2 % (the reference circle is a 64-gon), boxes within 1.5 %, a thin I
   3.5 % low and a stocky I (t_f / h = 0.1) 9 % low: Cowper's thin-walled I formula leaves
   out the flanges' own shear. Tolerances 0.5 %, 2 %, and for the I-section 10 % on the low
   side only (a smaller shear area is more shear deflection: conservative).
"""

from __future__ import annotations

import functools

import numpy as np
import pytest
from sectionproperties.analysis.section import Section
from sectionproperties.pre.library import (
    circular_hollow_section,
    circular_section,
    i_section,
    rectangular_hollow_section,
    rectangular_section,
)
from sectionproperties.pre.pre import Material

from service.core.sections import flexure_shear, shear_deformation

TIMOSHENKO_GOODIER = {0.5: "1.033", 1.0: "1.126", 2.0: "1.396", 4.0: "1.988"}


def test_rectangle_peak_against_timoshenko_goodier_table():
    ratios = np.array(list(TIMOSHENKO_GOODIER))
    ours = flexure_shear.rectangle_shear_peak_factor(ratios, 0.25)
    problems = [f"b/h {ratio}: ours {value:.5f}, table {table}"
                for ratio, value, table in zip(ratios, ours, TIMOSHENKO_GOODIER.values(),
                                               strict=True)
                if abs(value - float(table)) > 0.0005]
    assert not problems, "\n".join(problems)


@functools.cache
def _fe_section(kind: str, size: tuple[float, ...], nu: float, elements: int) -> Section:
    geometry = {
        "circle": lambda d: circular_section(d=d, n=64),
        "rectangle": lambda d, b: rectangular_section(d=d, b=b),
        "annulus": lambda d, t: circular_hollow_section(d=d, t=t, n=512),
        "box": lambda d, b, t: rectangular_hollow_section(d=d, b=b, t=t, r_out=0.0, n_r=1),
        "i": lambda d, b, tf, tw: i_section(d=d, b=b, t_f=tf, t_w=tw, r=0.0, n_r=1),
    }[kind](*size)
    geometry.material = Material("reference", 200e9, nu, 1e9, 7850.0, "grey")
    section = Section(geometry.create_mesh(mesh_sizes=[geometry.calculate_area() / elements]))
    section.calculate_geometric_properties()
    section.calculate_warping_properties()
    return section


def _peak_problems(kind, sizes, nu, elements, peak_area, dims_of, tolerance=0.01):
    """Mismatches of our peak transverse shear (V = 1 N over ``peak_area(dims, nu)``) and the
    FE flexure solution's largest |tau| for each size."""
    problems = []
    for size in sizes:
        section = _fe_section(kind, size, nu, elements)
        shear = section.calculate_stress(vy=1.0).get_stress()[0]["sig_zxy_vy"]
        reference = float(np.abs(shear).max())
        ours = 1.0 / float(peak_area(dims_of(*size), nu))
        if abs(ours / reference - 1) > tolerance:
            problems.append(f"{kind} {size} nu {nu}: ours {ours:.5g}, FE {reference:.5g}")
    return problems


@pytest.mark.parametrize("nu", [0.0, 0.3, 0.45])
def test_round_tube_peak_against_fe_flexure_solution(nu):
    problems = _peak_problems(
        "annulus", [(0.1, 0.002), (0.1, 0.03)], nu, 6000,
        flexure_shear.round_tube_peak_shear_area,
        lambda outer, wall: {"outer_diameter": outer, "wall": wall})
    assert not problems, "\n".join(problems)


def test_round_tube_peak_limits():
    """Two limits of the hollow circle (Timoshenko & Goodier sec. 124): as the wall thins the
    peak tends to 2 V / A of elementary thin-tube theory; as the bore closes to a pinhole it
    tends to twice the solid circle's centre value (the concentration factor 2 of a small
    circular hole in anti-plane shear), not to the solid circle's."""
    for nu in (0.0, 0.3, 0.45):
        solid = flexure_shear.solid_round_peak_shear_area({"diameter": 0.1}, nu)
        pinhole = flexure_shear.round_tube_peak_shear_area(
            {"outer_diameter": 0.1, "wall": 0.05 - 1e-9}, nu)
        assert pinhole == pytest.approx(solid / 2.0, rel=1e-6)
        thin = {"outer_diameter": 0.1, "wall": 1e-6}
        area = np.pi * (0.1**2 - (0.1 - 2e-6) ** 2) / 4.0
        assert flexure_shear.round_tube_peak_shear_area(thin, nu) == pytest.approx(
            area / 2.0, rel=1e-4)


@pytest.mark.parametrize("nu", [0.0, 0.3, 0.45])
def test_rectangle_peak_against_fe_flexure_solution(nu):
    problems = _peak_problems(
        "rectangle", [(1.0, width) for width in (0.5, 1.0, 2.0)], nu, 800,
        flexure_shear.solid_rectangle_peak_shear_area,
        lambda depth, width: {"depth": depth, "width": width})
    assert not problems, "\n".join(problems)


def test_solid_round_peak_against_fe_flexure_solution():
    for nu in (0.0, 0.3):
        section = _fe_section("circle", (1.0,), nu, 800)
        shear = section.calculate_stress(vy=1.0).get_stress()[0]["sig_zxy_vy"]
        ours = 1.0 / float(flexure_shear.solid_round_peak_shear_area({"diameter": 1.0}, nu))
        # the 64-gon has 0.16 % less area than the circle
        assert ours == pytest.approx(float(np.abs(shear).max()), rel=0.01)


SHEAR_AREA_CASES = {
    "solid_round": ("circle", {"diameter": 1.0}, 0.005),
    "solid_rectangle narrow": ("rectangle", {"depth": 1.0, "width": 0.5}, 0.005),
    "solid_rectangle wide": ("rectangle", {"depth": 1.0, "width": 2.0}, 0.005),
    "round_tube thin": ("annulus", {"outer_diameter": 1.0, "wall": 0.05}, 0.005),
    "round_tube thick": ("annulus", {"outer_diameter": 1.0, "wall": 0.3}, 0.005),
    "rectangular_tube": ("box", {"depth": 1.0, "width": 0.5, "wall": 0.03}, 0.02),
    "rectangular_tube square": ("box", {"depth": 1.0, "width": 1.0, "wall": 0.03}, 0.02),
    "i_section thin": ("i", {"depth": 1.0, "flange_width": 0.5, "flange_thickness": 0.04,
                             "web_thickness": 0.025}, 0.10),
    "i_section stocky": ("i", {"depth": 1.0, "flange_width": 1.0, "flange_thickness": 0.1,
                               "web_thickness": 0.06}, 0.10),
}


def test_timoshenko_shear_areas_against_fe_at_zero_poisson_ratio():
    problems = []
    for case, (kind, dims, tolerance) in SHEAR_AREA_CASES.items():
        family_id = case.split()[0]
        section = _fe_section(kind, tuple(dims.values()), 0.0, 400)
        _, reference = section.get_eas()
        reference /= 200e9     # the shear area for V_y, m^2
        ours = float(shear_deformation.TIMOSHENKO_SHEAR_AREA[family_id](dims, 0.0))
        deviation = ours / reference - 1
        one_sided = family_id == "i_section"
        if deviation > (0.005 if one_sided else tolerance) or deviation < -tolerance:
            problems.append(f"{case}: ours {ours:.5g}, FE {reference:.5g}, {deviation:+.2%}")
    assert not problems, "\n".join(problems)
