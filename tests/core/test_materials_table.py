"""The material table: array access, bases, take, concat, per-material views."""

import math

import numpy as np
import pytest
from material_rows import demo_table, record

from service.core import materials as m
from service.core.errors import InputError, UnknownResource


def test_arrays_are_read_only():
    table = m.load_builtin()
    with pytest.raises(ValueError, match="read-only"):
        table.typical["density"][0] = 1.0


@pytest.fixture()
def table(tmp_path):
    return demo_table(tmp_path)


def test_conservative_basis_takes_low_stiffness_and_strength_and_high_density(table):
    for prop in ("youngs_modulus", "shear_modulus", "strength", "shear_strength"):
        np.testing.assert_array_equal(table.values(prop, "conservative"), table.low[prop])
    np.testing.assert_array_equal(table.values("density", "conservative"), table.high["density"])
    for prop in ("poisson_ratio", "tensile_strength", "price", "embodied_carbon"):
        np.testing.assert_array_equal(table.values(prop, "conservative"), table.typical[prop])
    np.testing.assert_array_equal(table.values("density"), table.typical["density"])


def test_values_rejects_unknown_property_and_basis(table):
    with pytest.raises(UnknownResource):
        table.values("hardness")
    with pytest.raises(UnknownResource):
        table.values("density", "optimistic")


def test_shear_strength_is_own_value_else_von_mises(table):
    for basis in m.BASES:
        shear = table.shear_strength(basis)
        strength = table.values("strength", basis)
        # von Mises: yield in pure shear = yield / sqrt(3).
        assert shear[0] == pytest.approx(strength[0] / math.sqrt(3), rel=1e-12)
        assert shear[1] == table.values("shear_strength", basis)[1]
    assert table.shear_strength("conservative")[1] == 1e8


def test_take_accepts_positions_and_masks(table):
    picked = table.take([2, 0])
    assert picked.ids == ("c", "a")
    assert picked.typical["density"].tolist() == [
        table.typical["density"][2],
        table.typical["density"][0],
    ]
    assert table.take(np.array([False, True, False])).ids == ("b",)
    assert len(table.take([])) == 0


def test_concat_appends_and_rejects_colliding_ids(table):
    extra = m.from_records([record("d")])
    combined = table.concat(extra)
    assert combined.ids == ("a", "b", "c", "d")
    assert combined.typical["density"][-1] == 1000.0
    with pytest.raises(InputError) as caught:
        table.concat(m.from_records([record("d"), record("b")]))
    assert list(caught.value.errors) == ["1.id"]


def test_material_and_records_round_trip(table):
    material = table.material("b")
    assert material.family == "aluminium"
    assert material.properties["shear_strength"].low == 1e8
    assert material.properties["density"].unit == "kg/m^3"
    assert material.forms == ("solid_round", "round_tube")  # contract order
    assert "shear_strength" not in table.material("a").properties
    with pytest.raises(UnknownResource):
        table.material("nope")
    again = m.from_records(table.records())
    assert again.ids == table.ids
    for prop in m.ALL_PROPERTIES:
        for end in ("low", "high", "typical"):
            np.testing.assert_array_equal(getattr(again, end)[prop], getattr(table, end)[prop])


def test_take_and_concat_carry_brittle_fatigue_cycles_and_form_limits():
    table = m.load_builtin()
    picked = table.take([table.position("sic_sintered"), table.position("s355j2")])
    assert picked.brittle.tolist() == [True, False]
    assert np.isnan(picked.fatigue_cycles[0]) and picked.fatigue_cycles[1] == 1e6
    assert picked.form_limits[1] == table.form_limits[table.position("s355j2")]
    joined = picked.concat(m.from_records([record("d")]))
    assert joined.brittle.tolist() == [True, False, False]
    assert joined.form_limits[2] == () and np.isnan(joined.fatigue_cycles[2])
    with pytest.raises(ValueError, match="read-only"):
        joined.brittle[0] = False


def test_material_record_has_the_contract_fields():
    record_ = m.load_builtin().material("al_6061_t6").record()
    assert record_["brittle"] is False
    assert record_["fatigue_cycles"] == 5e8
    tube = record_["form_limits"]["round_tube"]
    assert set(tube) == {"process", "min_wall", "max_wall_ratio", "min_size", "max_size",
                         "source"}
    assert record_["form_limits"]["solid_round"]["min_wall"] is None


def test_form_limits_survive_pickling_equal():
    # Sweeps send tables to worker processes; a limit that does not apply is None, not NaN,
    # so the copies compare equal.
    import pickle

    limits = m.load_builtin().form_limits
    assert pickle.loads(pickle.dumps(limits)) == limits
