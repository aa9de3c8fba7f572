"""The MaterialFilter: families, ids, exclusions and property bounds."""

import pytest
from material_rows import demo_table

from service.core import materials as m
from service.core.errors import InputError


@pytest.fixture()
def table(tmp_path):
    return demo_table(tmp_path)


def test_select_by_family_ids_exclude_and_where(table):
    assert m.select(table).ids == table.ids
    assert m.select(table, families=["steel", "polymer"]).ids == ("a", "c")
    assert m.select(table, ids=["c", "a"]).ids == ("a", "c")  # table order
    assert m.select(table, exclude=["b"]).ids == ("a", "c")
    assert m.select(table, families=["steel", "aluminium"], exclude=["a"]).ids == ("b",)
    strength = table.typical["strength"][0]
    assert len(m.select(table, where={"strength": {"min": strength}})) == 3
    assert len(m.select(table, where={"strength": {"max": strength * 0.99}})) == 0
    # Only b has a shear strength; a NaN never passes a bound.
    assert m.select(table, where={"shear_strength": {"min": 0.0}}).ids == ("b",)


@pytest.mark.parametrize(
    ("kwargs", "path"),
    [
        ({"families": ["steel", "adamantium"]}, "families.1"),
        ({"ids": ["a", "zz"]}, "ids.1"),
        ({"exclude": ["zz"]}, "exclude.0"),
        ({"where": {"hardness": {"min": 1.0}}}, "where.hardness"),
        ({"where": {"density": {"min": 2.0, "max": 1.0}}}, "where.density"),
        ({"where": {"density": {"least": 2.0}}}, "where.density"),
        ({"where": {"density": {"min": "heavy"}}}, "where.density"),
    ],
)
def test_select_rejects_unknown_names_and_bad_bounds(table, kwargs, path):
    with pytest.raises(InputError) as caught:
        m.select(table, **kwargs)
    assert list(caught.value.errors) == [path]


def test_sort_by_typical_value_stable_and_absent_last(table):
    assert m.sort_by(table, "density").ids == ("a", "b", "c")  # equal densities: table order
    # Only b has a shear strength: first either way.
    assert m.sort_by(table, "shear_strength").ids[0] == "b"
    assert m.sort_by(table, "shear_strength", descending=True).ids[0] == "b"
    with pytest.raises(InputError) as caught:
        m.sort_by(table, "hardness")
    assert list(caught.value.errors) == ["sort"]
