"""Discrete sizing from a catalogue (service.core.sizing.catalog)."""


from __future__ import annotations

import dataclasses
import math

import numpy as np
import pytest

from service.core.sections import FAMILIES
from service.core.sizing import DesignRequest, size_designs


def test_catalogue_sizing_returns_the_lightest_passing_member(table, pick):
    """Brute force: every member of the EN 10365 IPE list checked one at a time with the
    section property functions and the simply supported uniform-load formulas (Roark 8th ed.
    table 8.1 case 2e, from memory); the engine's pick must be the lightest that passes."""
    from service.core.sections.base import Elastic
    from service.core.sizing import catalog_members

    # The series is steel (so aluminium would not be paired with it): here its dimensions
    # as a client's catalogue that names no material family, made in either material.
    members = tuple(dataclasses.replace(m, material_families=())
                    for m in catalog_members("ipe_en10365"))
    request = DesignRequest("simply_supported_uniform_load", span=5.0, load=30000.0,
                            max_deflection=0.02, safety_factor=1.5, max_depth=0.3,
                            catalog=members)
    steel = pick(table, "s355j2", "al_6082_t6")
    designs = {d.material_id: d for d in size_designs(request, steel).designs}
    family = FAMILIES["i_section"]
    for row, material_id in enumerate(steel.ids):
        e, g, nu, rho, strength = (float(steel.values(n)[row]) for n in (
            "youngs_modulus", "shear_modulus", "poisson_ratio", "density", "strength"))
        passing = []
        for member in members:
            dims = {k: np.asarray(v) for k, v in member.dimensions.items()}
            props = family.properties(dims)
            stress = 30000.0 * 5.0 / 8 / float(props.section_modulus_major)
            ok = (5 * 30000.0 * 5.0**3 / (384 * e * float(props.second_moment_major)) <= 0.02
                  and stress * 1.5 <= strength
                  and stress * 1.5 <= float(family.local_buckling(dims, Elastic(e, g, nu)).bending)
                  and member.dimensions["depth"] <= 0.3)
            if ok:
                passing.append((rho * float(props.area) * 5.0, member.designation))
        assert passing
        assert designs[material_id].designation == min(passing)[1]
        assert math.isclose(designs[material_id].mass, min(passing)[0], rel_tol=1e-12)


def test_builtin_catalogues_load():
    from service.core.sizing import catalog_names, load_catalog

    assert set(catalog_names()) >= {"chs_en10219", "rhs_en10219", "ipe_en10365"}
    for name in catalog_names():
        assert load_catalog(name)


def test_steel_series_are_sized_only_in_steel(table, pick):
    """EN 10219 and EN 10365 are product standards for structural steel sections (their
    titles say so): their members carry the steel family and are never sized in carbon fibre
    or aluminium, which are rejected with the reason."""
    from service.core.sizing import catalog_members
    from service.core.sizing.engine import NOT_MADE_IN_FORM

    for name in ("chs_en10219", "rhs_en10219", "ipe_en10365"):
        members = catalog_members(name)
        assert {m.material_families for m in members} == {("steel",)}
        request = DesignRequest("simply_supported_center_load", span=2.0, load=2000.0,
                                max_deflection=0.01, allow_brittle=True, catalog=members)
        result = size_designs(request, pick(table, "s355j2", "al_6082_t6", "cfrp_ud_sm"))
        assert {d.material_id for d in result.designs} == {"s355j2"}
        others = {r.material_id: r.reason for r in result.rejected
                  if r.family == members[0].family}
        assert set(others) == {"al_6082_t6", "cfrp_ud_sm"}
        assert "made only in steel" in others["al_6082_t6"]
        assert others["cfrp_ud_sm"] in (NOT_MADE_IN_FORM, others["al_6082_t6"])


def test_a_client_member_may_name_its_material_families(table, pick):
    """An inline member made in aluminium is paired with aluminium only; one that names no
    family with every material."""
    from service.core.sizing import catalog_members

    members = catalog_members([
        {"designation": "extruded 50x50x3", "family": "rectangular_tube",
         "dimensions": {"depth": 0.05, "width": 0.05, "wall": 0.003},
         "material_families": ["aluminium"]}])
    request = DesignRequest("simply_supported_center_load", span=1.0, load=500.0,
                            max_deflection=0.02, catalog=members)
    result = size_designs(request, pick(table, "s355j2", "al_6082_t6"))
    assert [d.material_id for d in result.designs] == ["al_6082_t6"]
    free = catalog_members([{**m, "material_families": []} for m in [
        {"designation": "extruded 50x50x3", "family": "rectangular_tube",
         "dimensions": {"depth": 0.05, "width": 0.05, "wall": 0.003}}]])
    result = size_designs(dataclasses.replace(request, catalog=free),
                          pick(table, "s355j2", "al_6082_t6"))
    assert {d.material_id for d in result.designs} == {"s355j2", "al_6082_t6"}


def test_a_catalogue_too_weak_says_how_close_its_best_member_comes(table, pick):
    """With no passing member, the rejection's shortfall is the closest member's worst
    utilization, the number its reason prints."""
    from service.core.sizing import catalog_members

    members = catalog_members([
        {"designation": "small", "family": "round_tube",
         "dimensions": {"outer_diameter": 0.03, "wall": 0.002}},
        {"designation": "medium", "family": "round_tube",
         "dimensions": {"outer_diameter": 0.05, "wall": 0.003}}])
    request = DesignRequest("cantilever_end_load", span=2.0, load=3000.0,
                            max_deflection=0.01, catalog=members)
    (rejection,) = size_designs(request, pick(table, "s355j2")).rejected
    assert "the closest, medium" in rejection.reason
    printed = float(rejection.reason.split(" is at ", 1)[1].split()[0])
    assert rejection.shortfall == pytest.approx(printed, rel=5e-3) and printed > 1.0  # 3 digits
