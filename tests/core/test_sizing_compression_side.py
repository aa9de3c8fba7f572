"""The compression side of bending and columns against the compressive strength.

A unidirectional laminate is weaker in compression than in tension (the data's
compressive_strength, CMH-17 Vol. 2, from memory; 0.6 of tension for carbon, 0.2 for
aramid): both fibres of a symmetric section carry M / Z, so the compressed one governs. The
issue's finding was a unidirectional aramid bar at 5.0x its compressive design limit; here the
returned designs meet the compressive strength when it is recomputed by hand (the stress
formulas written out: M = P L / 4 and Z = b d^2 / 6, Roark's Formulas for Stress and Strain,
8th ed., table 8.1 and table A.1, from memory).
"""

from __future__ import annotations

import dataclasses

import numpy as np
import pytest

from service.core.loading.actions import shorthand_actions
from service.core.materials import load_builtin, select
from service.core.sizing import DesignRequest, size_designs
from service.core.sizing.values import MaterialValues

TABLE = load_builtin()
UNIDIRECTIONAL = select(TABLE, ids=["aramid_epoxy_ud", "cfrp_ud_sm", "s355j2"])


def _value(table, material_id: str, name: str) -> float:
    return float(table.values(name, "design")[list(table.ids).index(material_id)])


def test_the_compression_side_takes_the_lower_strength_only():
    """min(strength, compressive_strength): a compressive strength above the tensile one
    (a polymer's compressive yield, a ceramic's crushing strength) is not credited."""
    table = select(TABLE, ids=["aramid_epoxy_ud", "pc", "s355j2"])
    values = MaterialValues.from_table(table, "design")
    at = {material_id: i for i, material_id in enumerate(table.ids)}
    strength = values.strength
    compressive = values.compression_strength
    aramid = at["aramid_epoxy_ud"]
    assert compressive[aramid] == pytest.approx(_value(TABLE, "aramid_epoxy_ud",
                                                       "compressive_strength"))
    assert compressive[aramid] < 0.3 * strength[aramid]
    assert compressive[at["pc"]] == strength[at["pc"]]   # 70 MPa in compression, 58 in tension
    assert compressive[at["s355j2"]] == strength[at["s355j2"]]   # no separate value
    assert np.array_equal(values.axial_strength("tension"), strength)


def test_a_unidirectional_bar_meets_its_compressive_strength():
    request = DesignRequest("simply_supported_center_load", span=1.0, load=2000.0,
                            safety_factor=1.5, sections=("solid_rectangle",),
                            lateral_restraint="continuous", local_buckling=False)
    result = size_designs(request, UNIDIRECTIONAL)
    by_id = {d.material_id: d for d in result.designs}
    assert set(by_id) == {"aramid_epoxy_ud", "cfrp_ud_sm", "s355j2"}
    for material_id, design in by_id.items():
        width, depth = design.dimensions["width"], design.dimensions["depth"]
        stress = 2000.0 * 1.0 / 4.0 / (width * depth**2 / 6.0)
        compressive = min(_value(UNIDIRECTIONAL, material_id, "strength"),
                          np.nan_to_num(_value(UNIDIRECTIONAL, material_id,
                                               "compressive_strength"), nan=np.inf))
        assert stress * 1.5 <= compressive * (1 + 1e-9), material_id
        # the compression side is what set the size: strength at 1 (not 0.2 of it)
        assert design.governing in ("strength", "proportions", "manufacturing")
        assert design.utilization["strength"] == pytest.approx(1.0, abs=2e-3)


def test_the_general_form_judges_the_compressed_fibre_alike():
    """Superposition: the shorthand and its general form give the same aramid design (the
    general member's compressed fibre against the compressive strength too)."""
    request = DesignRequest("cantilever_end_load", span=0.8, load=500.0, safety_factor=2.0,
                            sections=("solid_rectangle", "round_tube"),
                            lateral_restraint="continuous")
    supports, actions = shorthand_actions(request.load_case, request.span, request.load, 0.0)
    general = dataclasses.replace(request, load_case="member", supports=supports,
                                  actions=tuple(actions), load=None)
    materials = select(TABLE, ids=["aramid_epoxy_ud"])
    short = {d.family: d for d in size_designs(request, materials).designs}
    full = {d.family: d for d in size_designs(general, materials).designs}
    assert set(short) == set(full) == {"solid_rectangle", "round_tube"}
    for family, design in short.items():
        assert full[family].mass == pytest.approx(design.mass, rel=5e-3), family
        assert full[family].utilization["strength"] <= 1.0


def test_a_column_is_squashed_at_its_compressive_strength():
    """P SF / A against the compressive strength (the squash load) of a stocky column."""
    request = DesignRequest("column", span=0.05, load=50_000.0, safety_factor=1.5,
                            end_conditions="fixed_fixed", sections=("solid_round",),
                            local_buckling=False)
    materials = select(TABLE, ids=["cfrp_ud_sm"])
    (design,) = size_designs(request, materials).designs
    area = np.pi * design.dimensions["diameter"] ** 2 / 4.0
    compressive = _value(materials, "cfrp_ud_sm", "compressive_strength")
    assert 50_000.0 * 1.5 / area <= compressive * (1 + 1e-9)
    # the strength entry is that ratio (the column curve's buckling, member_buckling,
    # reduces the same squash stress further and sets the size)
    assert design.utilization["strength"] == pytest.approx(
        50_000.0 * 1.5 / area / compressive, rel=1e-6)
    assert design.governing == "member_buckling"
