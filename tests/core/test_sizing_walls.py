"""Walls of orthotropic materials in the sizing: their own plate and shell formulas.

The formulas themselves are checked against published solutions in
tests/validation/test_orthotropic_plate_reference.py and tests/core/test_sections_orthotropic.py;
here the sizing must use them for a material with a transverse modulus (and the isotropic ones
for every other), in the search and in the recheck alike, and leave out a form whose walls
have no sound formula for such a material.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from service.core.materials import from_records, load_builtin, select
from service.core.sections import FAMILIES
from service.core.sections.base import Elastic
from service.core.sections.orthotropic import OrthotropicElastic
from service.core.sizing import DesignRequest, size_designs
from service.core.sizing.values import MaterialValues
from service.core.sizing.walls import UNSOUND_FORMS
from service.core.sizing.walls import local_buckling as wall_buckling
from tests.core.material_rows import record

TABLE = load_builtin()


def _long_plate_compression(e1, e2, g12, nu12, thickness, width):
    """Lekhnitskii's long simply supported orthotropic plate in uniform compression, written
    out: sigma = 2 pi^2 / (b^2 t) (sqrt(D11 D22) + D12 + 2 D66) (Lekhnitskii, Anisotropic
    Plates, 1968, sec. 102; Whitney 1987 eq. 5.21, from memory)."""
    nu21 = nu12 * e2 / e1
    bend = thickness**3 / (12.0 * (1.0 - nu12 * nu21))
    d11, d22, d12, d66 = e1 * bend, e2 * bend, nu12 * e2 * bend, g12 * thickness**3 / 12.0
    return 2.0 * math.pi**2 / (width**2 * thickness) * (math.sqrt(d11 * d22) + d12 + 2.0 * d66)


def test_each_material_buckles_by_its_own_wall_model():
    """Rows with a transverse modulus take the orthotropic formulas, the others the
    isotropic ones, in one call."""
    table = select(TABLE, ids=["cfrp_ud_hm", "al_6061_t6"])
    values = MaterialValues.from_table(table, "typical").column()
    family = FAMILIES["rectangular_tube"]
    dims = {"depth": np.array([0.03]), "width": np.array([0.03]), "wall": np.array([0.001])}
    mixed = wall_buckling(family, dims, values)
    at = {material_id: i for i, material_id in enumerate(table.ids)}
    carbon, aluminium = at["cfrp_ud_hm"], at["al_6061_t6"]

    def value(name, row):
        return float(table.values(name, "typical")[row])
    iso = family.local_buckling(dims, Elastic(value("youngs_modulus", aluminium),
                                              value("shear_modulus", aluminium),
                                              value("poisson_ratio", aluminium)))
    assert mixed.bending[aluminium, 0] == iso.bending[0]
    e1, e2, g12, nu12 = (value(name, carbon) for name in (
        "youngs_modulus", "transverse_modulus", "shear_modulus", "poisson_ratio"))
    flange = _long_plate_compression(e1, e2, g12, nu12, 0.001, 0.029)
    # the compression flange's mode, over the mid-line / peak stress ratio (h - t) / h
    assert mixed.bending_modes[0][carbon, 0] == pytest.approx(flange * 0.03 / 0.029, rel=1e-12)
    # as an isotropic wall with E1 it would be about ten times stiffer (the finding)
    isotropic_carbon = family.local_buckling(dims, Elastic(e1, g12, nu12)).bending[0]
    assert mixed.bending[carbon, 0] < 0.2 * isotropic_carbon


def test_a_unidirectional_box_is_sized_on_its_orthotropic_walls():
    """The returned design's local buckling entry is its orthotropic walls' (recomputed here
    from the section library's orthotropic formulas at its rounded dimensions), and the search
    reached the proportions those walls allow (the entry at most 1)."""
    request = DesignRequest("simply_supported_center_load", span=1.5, load=800.0,
                            safety_factor=1.5, max_depth=0.05, max_width=0.05,
                            sections=("rectangular_tube", "round_tube"),
                            lateral_restraint="continuous", property_basis="typical")
    materials = select(TABLE, ids=["cfrp_ud_hm"])
    result = size_designs(request, materials)
    assert {d.family for d in result.designs} == {"rectangular_tube", "round_tube"}

    def value(name):
        return float(materials.values(name, "typical")[0])
    wall = OrthotropicElastic(value("youngs_modulus"), value("transverse_modulus"),
                              value("shear_modulus"), value("poisson_ratio"))
    for design in result.designs:
        family = FAMILIES[design.family]
        dims = {k: np.asarray(v) for k, v in design.dimensions.items()}
        buckling = family.local_buckling(dims, wall)
        stress = design.max_stress
        shear = 400.0 / float(family.shear_area(dims))
        expected = max(stress * 1.5 / float(buckling.bending),
                       shear * 1.5 / float(buckling.shear))
        assert design.utilization["local_buckling"] == pytest.approx(expected, rel=1e-9)
        assert expected <= 1.0


def test_a_form_without_a_sound_wall_formula_is_not_offered_and_says_why():
    """A client material with a transverse modulus made into sandwich faces: the faces'
    wrinkling formula is for isotropic faces, so the panel is not offered for it."""
    faces = from_records([record(
        "ortho_face", family="composite", forms=["sandwich_panel", "rectangular_tube"],
        properties={**record()["properties"],
                    "transverse_modulus": {"low": 0.5e9, "high": 0.6e9}})])
    request = DesignRequest("simply_supported_center_load", span=1.0, load=500.0,
                            max_width=0.3, allow_brittle=True)
    result = size_designs(request, faces)
    panel = [r for r in result.rejected if r.family == "sandwich_panel"]
    assert [r.reason for r in panel] == [UNSOUND_FORMS["sandwich_panel"]]
    assert "rectangular_tube" in {d.family for d in result.designs}
