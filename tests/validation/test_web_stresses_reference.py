"""Web stresses of I-sections and boxes against the sectionproperties finite-element stress
field (its own Saint-Venant flexure and torsion solution, quadratic triangles, mesh A/1500).

Points on the web's mid-line (the I's centre line, the box's side-wall mid-plane) at heights
from the neutral axis up to three flange thicknesses short of the junction: measured within
0.01 % for the normal and the flexural shear stress; tolerance 0.5 %. At the junction itself
the FE shear is 18 % below elementary theory (the shear flow turns into the flange); ours must
not be below it there (conservative). Box torsion: Bredt-Batho on the mid-line against the
FE stress at the side-wall mid-plane; tolerance 3 % (thin wall, t / b = 0.04).
"""

from __future__ import annotations

import functools

import numpy as np
import pytest
from sectionproperties.analysis.section import Section
from sectionproperties.pre.library import i_section, rectangular_hollow_section

from service.core.sections import web

CASES = {
    "i_section": ({"depth": 0.3, "flange_width": 0.15, "flange_thickness": 0.01,
                   "web_thickness": 0.006},
                  lambda d: i_section(d=0.3, b=0.15, t_f=0.01, t_w=0.006, r=0.0, n_r=1)),
    "rectangular_tube": ({"depth": 0.2, "width": 0.1, "wall": 0.004},
                         lambda d: rectangular_hollow_section(d=0.2, b=0.1, t=0.004, r_out=0.0,
                                                              n_r=1)),
}
MOMENT, SHEAR, TORQUE = 1000.0, 10000.0, 500.0


@functools.cache
def _section(family_id: str) -> Section:
    geometry = CASES[family_id][1](None)
    section = Section(geometry.create_mesh(mesh_sizes=[geometry.calculate_area() / 1500]))
    section.calculate_geometric_properties()
    section.calculate_warping_properties()
    return section


def _web_x(family_id, dims, centroid_x):
    if family_id == "i_section":
        return centroid_x
    return centroid_x - (dims["width"] - dims["wall"]) / 2


@pytest.mark.parametrize("family_id", list(CASES))
def test_web_stresses_against_fe(family_id):
    dims = CASES[family_id][0]
    section = _section(family_id)
    cx, cy = section.get_c()
    flange = dims.get("flange_thickness", dims.get("wall"))
    inner = dims["depth"] / 2 - flange
    problems = []
    for height in (0.0, 0.5 * inner, inner - 3 * flange):
        (normal_fe, _, shear_fe), = section.get_stress_at_points(
            [(_web_x(family_id, dims, cx), cy + height)], mxx=MOMENT, vy=SHEAR)
        normal, shear = web.web_stresses(family_id, dims, MOMENT, SHEAR, height)
        for name, ours, reference in (("normal", normal, normal_fe), ("shear", shear, shear_fe)):
            if abs(float(ours) - reference) > 0.005 * max(abs(reference), 1.0):
                problems.append(f"{family_id} y {height:.4f} {name}: ours {float(ours):.6g}, "
                                f"FE {reference:.6g}")
    (normal_fe, _, shear_fe), = section.get_stress_at_points(
        [(_web_x(family_id, dims, cx), cy + inner)], mxx=MOMENT, vy=SHEAR)
    normal, shear = web.junction_stresses(family_id, dims, MOMENT, SHEAR)
    if abs(float(normal) / normal_fe - 1) > 0.005 or float(shear) < shear_fe:
        problems.append(f"{family_id} junction: ours {float(normal):.6g}, {float(shear):.6g}; "
                        f"FE {normal_fe:.6g}, {shear_fe:.6g}")
    assert not problems, "\n".join(problems)


def test_box_torsion_shear_against_fe():
    dims = CASES["rectangular_tube"][0]
    section = _section("rectangular_tube")
    cx, cy = section.get_c()
    (_, zx, zy), = section.get_stress_at_points([(_web_x("rectangular_tube", dims, cx), cy)],
                                                mzz=TORQUE)
    _, shear = web.web_stresses("rectangular_tube", dims, 0.0, 0.0, 0.0, TORQUE)
    assert float(shear) == pytest.approx(float(np.hypot(zx, zy)), rel=0.03)


def test_combined_stress_formulas():
    # sigma 100, tau 50: von Mises sqrt(100^2 + 3 50^2) = 132.29; principal 50 + 70.71.
    assert float(web.von_mises(100.0, 50.0)) == pytest.approx(132.2876, rel=1e-6)
    assert float(web.max_principal(-100.0, 50.0)) == pytest.approx(120.7107, rel=1e-6)
    assert float(web.bending_shear_buckling_interaction(0.8, 1.0, 0.6, 1.0)) == pytest.approx(1.0)
