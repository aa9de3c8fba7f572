"""Local buckling of walls in uniform compression, worked by hand from the plate and shell
formulas the module cites (Timoshenko & Gere 1961 sec. 9.2-9.3 and 11.4; NASA SP-8007)."""

from __future__ import annotations

import math

import numpy as np
import pytest

from service.core.sections import FAMILIES
from service.core.sections.base import Elastic
from service.core.stability.wall_compression import compression_buckling_stress

STEEL = Elastic(210e9, 81e9, 0.3)
PLATE = math.pi**2 * 210e9 / (12 * (1 - 0.3**2))   # pi^2 E / (12 (1 - nu^2)), Pa


def test_square_tube_wall_is_an_internal_plate():
    # 100 x 100 x 2.5: b = 97.5 mm on the mid-line, sigma = 4 PLATE (2.5 / 97.5)^2
    stress = compression_buckling_stress(FAMILIES["rectangular_tube"],
                                         {"depth": 0.1, "width": 0.1, "wall": 0.0025}, STEEL)
    assert float(stress) == pytest.approx(4 * PLATE * (2.5 / 97.5) ** 2, rel=1e-12)


def test_i_section_takes_the_lower_of_flange_outstand_and_web():
    # 300 x 150 x 5 flanges x 4 web, PLATE = 189.80 GPa: outstand 0.425 PLATE (5/75)^2 =
    # 358.5 MPa, web 4 PLATE (4/295)^2 = 139.58 MPa: the web governs.
    dims = {"depth": 0.3, "flange_width": 0.15, "flange_thickness": 0.005,
            "web_thickness": 0.004}
    stress = float(compression_buckling_stress(FAMILIES["i_section"], dims, STEEL))
    assert stress == pytest.approx(min(0.425 * PLATE * (5 / 75) ** 2, 4 * PLATE * (4 / 295) ** 2))
    assert stress == pytest.approx(139.58e6, rel=1e-4)


def test_round_tube_is_the_knocked_down_classical_cylinder():
    # D = 100 mm, t = 1 mm: r = 49.5 mm, classical E t / (r sqrt(3 (1 - nu^2))) = 2.5676 GPa,
    # phi = sqrt(49.5) / 16 = 0.43973, gamma = 1 - 0.901 (1 - exp(-phi)) = 0.67944
    stress = float(compression_buckling_stress(FAMILIES["round_tube"],
                                               {"outer_diameter": 0.1, "wall": 0.001}, STEEL))
    assert stress == pytest.approx(0.67944 * 2.5676e9, rel=1e-4)


def test_solid_sections_have_no_local_mode_and_panels_no_column():
    assert np.isinf(compression_buckling_stress(FAMILIES["solid_round"], {"diameter": 0.01},
                                                STEEL))
    with pytest.raises(ValueError, match="compression"):
        compression_buckling_stress(FAMILIES["sandwich_panel"], {
            "width": 0.5, "core_thickness": 0.02, "face_thickness": 0.001}, STEEL)
