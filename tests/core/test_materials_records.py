"""Client materials: defaults and every problem at its JSON path."""

import math

import numpy as np
import pytest
from material_rows import record, with_property

from service.core import materials as m
from service.core.errors import InputError


def test_client_material_defaults():
    table = m.from_records([record()])
    # tensile_strength defaults to the strength range; temperature unknown (NaN).
    np.testing.assert_array_equal(table.low["tensile_strength"], table.low["strength"])
    assert np.isnan(table.typical["max_service_temperature"][0])
    assert table.typical["youngs_modulus"][0] == pytest.approx(math.sqrt(6e18), rel=1e-12)
    assert table.isotropic[0]
    assert not m.from_records([record(family="composite")]).isotropic[0]
    assert len(m.from_records([])) == 0


LIMIT = {"process": "extruded", "min_size": 0.003, "max_size": 0.3, "source": "demo data"}

BAD_RECORDS = [
    (with_property("density", {"low": -1.0, "high": 1100.0}), "0.properties.density", "positive"),
    (
        with_property("density", {"low": 1200.0, "high": 1100.0}),
        "0.properties.density",
        "above high",
    ),
    (
        with_property("density", {"low": "heavy", "high": 1100.0}),
        "0.properties.density.low",
        "number",
    ),
    (
        with_property("density", {"low": 900.0, "high": 1100.0, "unit": "g/cm^3"}),
        "0.properties.density.unit",
        "kg/m^3",
    ),
    (with_property("density", 1000.0), "0.properties.density", "object"),
    (
        with_property("hardness", {"low": 1.0, "high": 2.0}),
        "0.properties.hardness",
        "unknown property",
    ),
    (
        with_property("poisson_ratio", {"low": 0.35, "high": 0.6}),
        "0.properties.poisson_ratio",
        "(0, 0.5]",
    ),
    (
        with_property("shear_modulus", {"low": 2e9, "high": 3e9}),
        "0.properties.shear_modulus",
        "E/(2(1+nu))",
    ),
    (with_property("shear_strength", {"high": 3e7}), "0.properties.shear_strength", "both"),
    ({k: v for k, v in record().items() if k != "family"}, "0.family", "missing"),
    (record(family="unobtainium"), "0.family", "unknown family"),
    (record(forms=["solid_round", 3]), "0.forms.1", "string"),
    (record(forms=["hollow_star"]), "0.forms", "unknown form"),
    (record(family="foam", isotropic=False), "0.forms", "core"),
    (record(id="Not A Slug"), "0.id", "slug"),
    (record(isotropic="yes"), "0.isotropic", "true or false"),
    (record(colour="red"), "0.colour", "unknown field"),
    ("not an object", "0", "object"),
    (record(brittle="no"), "0.brittle", "true or false"),
    (with_property("fatigue_strength", {"low": 1e7, "high": 2e7}), "0.fatigue_cycles",
     "cycle count"),
    (record(fatigue_cycles=1e7), "0.fatigue_cycles", "without a fatigue_strength"),
    (record(fatigue_cycles="many"), "0.fatigue_cycles", "number"),
    (with_property("elongation", {"low": 5.0, "high": 50.0}), "0.properties.elongation",
     "possible range"),
    (record(form_limits={"hollow_star": {}}), "0.form_limits.hollow_star", "unknown"),
    (record(form_limits={"round_tube": {}}), "0.form_limits.round_tube", "not made"),
    (record(form_limits=[]), "0.form_limits", "object"),
    (record(form_limits={"solid_round": dict(LIMIT, process="forged")}),
     "0.form_limits.solid_round.process", "unknown process"),
    (record(form_limits={"solid_round": dict(LIMIT, max_size=0.001)}),
     "0.form_limits.solid_round.min_size", "above max_size"),
    (record(form_limits={"solid_round": dict(LIMIT, min_size="big")}),
     "0.form_limits.solid_round.min_size", "number"),
    (record(form_limits={"solid_round": dict(LIMIT, min_wall=0.001)}),
     "0.form_limits.solid_round.min_wall", "does not apply"),
    (record(form_limits={"solid_round": dict(LIMIT, colour="red")}),
     "0.form_limits.solid_round.colour", "unknown field"),
]


@pytest.mark.parametrize(("bad", "path", "words"), BAD_RECORDS)
def test_from_records_reports_each_problem_at_its_path(bad, path, words):
    with pytest.raises(InputError) as caught:
        m.from_records([bad])
    errors = caught.value.errors
    assert list(errors) == [path], errors
    assert any(words in message for message in errors[path])


def test_from_records_reports_missing_properties_and_duplicates_together():
    missing = record("x")
    del missing["properties"]["strength"]
    with pytest.raises(InputError) as caught:
        m.from_records([record("a"), missing, record("a")])
    assert set(caught.value.errors) == {"1.properties.strength", "2.id"}
    prefixed = caught.value.prefixed("custom_materials")
    assert "custom_materials.1.properties.strength" in prefixed.errors


def test_from_records_needs_a_list():
    with pytest.raises(InputError):
        m.from_records({"id": "x"})


def test_client_brittle_flag_is_derived_unless_given():
    tough = with_property("elongation", {"low": 0.3, "high": 0.5})
    glassy = with_property("elongation", {"low": 0.01, "high": 0.02})
    ceramic = record("c", family="ceramic")
    table = m.from_records([tough, dict(glassy, id="g"), ceramic, dict(glassy, id="s",
                                                                      brittle=False)])
    # Rule of data/README.md "Brittle": stretches -> ductile; 1-2 % strain and unknown
    # toughness -> brittle (safe side); a ceramic with neither value -> brittle; stated wins.
    assert table.brittle.tolist() == [False, True, True, False]


def test_client_form_limits_and_fatigue_cycles_load():
    rec = with_property("fatigue_strength", {"low": 1e7, "high": 2e7}, fatigue_cycles=1e7,
                        form_limits={"solid_round": LIMIT})
    table = m.from_records([rec])
    assert table.fatigue_cycles.tolist() == [1e7]
    (limit,) = table.form_limits[0]
    assert (limit.form, limit.process, limit.max_size) == ("solid_round", "extruded", 0.3)
    assert limit.min_wall is None
    again = m.from_records(table.records())
    assert again.material("custom").record() == table.material("custom").record()
