"""Material checks: each kind of bad value, the shear modulus rule, ids."""

import numpy as np
import pytest
from material_rows import demo_row, load_error, write

from service.core import materials as m

BAD_CELLS = [
    # (cell changes, column reported, words expected in the message)
    ({"density_low": ""}, "density_low", "missing"),
    ({"youngs_modulus_high": ""}, "youngs_modulus_high", "missing"),
    ({"strength_low": "0"}, "strength_low", "positive"),
    ({"price_high": "-2"}, "price_high", "positive"),
    ({"density_typical": "abc"}, "density_typical", "not a number"),
    ({"embodied_carbon_low": "inf"}, "embodied_carbon_low", "finite"),
    ({"strength_low": "5e8"}, "strength_low", "above high"),
    ({"density_typical": "9000"}, "density_typical", "outside"),
    ({"poisson_ratio_high": "0.52"}, "poisson_ratio_high", "(0, 0.5]"),
    ({"poisson_ratio_low": "0", "poisson_ratio_typical": "0.29"}, "poisson_ratio_low", "positive"),
    # G typed for E/(2(1+nu)) x 1.25: beyond the 10% tolerance.
    (
        {"shear_modulus_typical": "9.8e10", "shear_modulus_high": "1e11"},
        "shear_modulus_typical",
        "E/(2(1+nu))",
    ),
    ({"family": "unobtainium"}, "family", "unknown family"),
    ({"forms": "solid_round;hollow_star"}, "forms", "unknown form"),
    ({"family": "foam"}, "forms", "core"),
    ({"shear_strength_low": "1e8"}, "shear_strength_low", "both low and high"),
    ({"isotropic": "maybe"}, "isotropic", "true or false"),
    ({"price_year": ""}, "price_year", "whole year"),
    ({"price_year": "2024.5"}, "price_year", "whole year"),
    ({"source_price": ""}, "source_price", "source"),
    ({"id": "Bad Id"}, "id", "slug"),
    ({"name": ""}, "name", "empty"),
    # The properties that decide brittleness are required outside the core family.
    ({"fracture_toughness_low": ""}, "fracture_toughness_low", "missing"),
    ({"elongation_high": ""}, "elongation_high", "missing"),
    ({"elongation_high": "30"}, "elongation_high", "possible range"),  # 30 % typed as 30
    ({"source_toughness": ""}, "source_toughness", "source"),
    ({"fatigue_strength_low": "1e8", "fatigue_strength_high": "2e8",
      "source_fatigue": "demo data"}, "fatigue_cycles", "cycle count"),
    ({"fatigue_cycles": "1e7"}, "fatigue_cycles", "without a fatigue_strength"),
    ({"fatigue_strength_low": "1e8", "fatigue_strength_high": "2e8", "fatigue_cycles": "0.5",
      "source_fatigue": "demo data"}, "fatigue_cycles", "at least 1"),
    ({"fatigue_strength_low": "1e8", "fatigue_strength_high": "2e8", "fatigue_cycles": "1e7"},
     "source_fatigue", "source"),
    ({"compressive_strength_low": "1e8", "compressive_strength_high": "2e8"},
     "source_compression", "source"),
]


@pytest.mark.parametrize(("changes", "column", "words"), BAD_CELLS)
def test_loader_rejects_each_kind_of_bad_cell_at_its_row_and_column(
    tmp_path, changes, column, words
):
    error = load_error(tmp_path, [demo_row("good"), demo_row("bad", **changes)])
    assert (error.row, error.column) == (2, column)
    assert words in error.message
    assert len(error.problems) == 1, [str(p) for p in error.problems]


def test_isotropic_false_skips_the_shear_modulus_check(tmp_path):
    row = demo_row(
        isotropic="false",
        shear_modulus_low="4e9",
        shear_modulus_high="6e9",
        shear_modulus_typical="5e9",
    )
    table = m.load_csv(write(tmp_path, [row]))
    assert not table.isotropic[0]


def test_shear_modulus_within_tolerance_is_accepted(tmp_path):
    # 7.88e10 x 1.09 = 8.59e10: 9% off, inside the documented 10%.
    row = demo_row(shear_modulus_typical="8.59e10", shear_modulus_high="8.7e10")
    assert len(m.load_csv(write(tmp_path, [row]))) == 1


def test_duplicate_ids_are_reported_at_the_second_row(tmp_path):
    error = load_error(tmp_path, [demo_row("same"), demo_row("other"), demo_row("same")])
    assert (error.row, error.column) == (3, "id")
    assert "duplicate" in error.message


def test_cores_need_no_toughness_or_elongation(tmp_path):
    core = demo_row(
        "core", family="foam", forms="", isotropic="false", fracture_toughness_low="",
        fracture_toughness_high="", elongation_low="", elongation_high="", source_toughness="",
    )
    table = m.load_csv(write(tmp_path, [core]))
    assert np.isnan(table.typical["elongation"][0]) and not table.brittle[0]


def test_new_properties_load_with_their_sources(tmp_path):
    row = demo_row(
        fatigue_strength_low="1.5e8", fatigue_strength_high="2.5e8", fatigue_cycles="1e6",
        source_fatigue="demo fatigue", compressive_strength_low="3e8",
        compressive_strength_high="4e8", source_compression="demo compression",
    )
    table = m.load_csv(write(tmp_path, [row]))
    assert table.fatigue_cycles.tolist() == [1e6]
    assert table.low["compressive_strength"].tolist() == [3e8]
    assert "fatigue strength: demo fatigue" in table.sources[0]
    assert "compressive strength and transverse modulus: demo compression" in table.sources[0]
    assert not table.brittle[0]
