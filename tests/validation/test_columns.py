"""Columns and ties against an independent eigenvalue solution and classical closed forms.

Reference 1: a finite element eigenvalue solution of the column equation E I w'''' + P w'' = 0
written here (cubic Hermite elements, scipy.linalg.eigh): the theoretical effective length
factors 1.0 (pinned-pinned), 2.0 (fixed-free), 0.699 (fixed-pinned) and 0.5 (fixed-fixed)
of Timoshenko & Gere, Theory of Elastic Stability, 2nd ed. 1961, sec. 2.1-2.3 (from memory)
come out within 0.2 %; the design values used (AISC 360-16 Commentary table C-A-7.1) must
not be below them.

Reference 2: the closed-form limits of a column curve: a long slender pin-ended column
reaches the Euler load pi^2 E I / L^2 (within 2 % at lambda = 30, from below), a stocky one
the squash load A f (exactly, on the curve's plateau).

Reference 3: Hooke's law for a tie, N L / (E A), and its tension resistance A f, worked by
hand for a 10 mm steel rod below.
"""

from __future__ import annotations

import numpy as np
import pytest
from scipy.linalg import eigh

from service.core.sections import FAMILIES
from service.core.stability import columns, ties
from service.core.stability.buckling_curves import STEEL_C, STEEL_D

THEORETICAL = {"pinned_pinned": 1.0, "fixed_free": 2.0, "fixed_pinned": 0.6992,
               "fixed_fixed": 0.5}


def fe_effective_length_factor(end_conditions: str, elements: int = 40) -> float:
    """K = pi / sqrt(P_cr L^2 / (E I)) from the column's smallest buckling load (E I = L = 1)."""
    length = 1.0 / elements
    stiffness_e = np.array([[12, 6 * length, -12, 6 * length],
                            [6 * length, 4 * length**2, -6 * length, 2 * length**2],
                            [-12, -6 * length, 12, -6 * length],
                            [6 * length, 2 * length**2, -6 * length, 4 * length**2]]) / length**3
    geometric_e = np.array([[36, 3 * length, -36, 3 * length],
                            [3 * length, 4 * length**2, -3 * length, -length**2],
                            [-36, -3 * length, 36, -3 * length],
                            [3 * length, -length**2, -3 * length, 4 * length**2]]) / (30 * length)
    size = 2 * (elements + 1)
    stiffness = np.zeros((size, size))
    geometric = np.zeros((size, size))
    for element in range(elements):
        dofs = np.arange(2 * element, 2 * element + 4)
        stiffness[np.ix_(dofs, dofs)] += stiffness_e
        geometric[np.ix_(dofs, dofs)] += geometric_e
    last = size - 2
    fixed = {"pinned_pinned": [0, last], "fixed_free": [0, 1],
             "fixed_pinned": [0, 1, last], "fixed_fixed": [0, 1, last, last + 1]}[end_conditions]
    free = np.setdiff1d(np.arange(size), fixed)
    load = eigh(stiffness[np.ix_(free, free)], geometric[np.ix_(free, free)],
                eigvals_only=True).min()
    return float(np.pi / np.sqrt(load))


@pytest.mark.parametrize("end_conditions", sorted(THEORETICAL))
def test_effective_length_factors_are_at_least_the_theoretical_ones(end_conditions):
    theoretical = fe_effective_length_factor(end_conditions)
    assert theoretical == pytest.approx(THEORETICAL[end_conditions], rel=2e-3)
    assert columns.EFFECTIVE_LENGTH_FACTORS[end_conditions] >= theoretical


def test_long_slender_pin_ended_column_reaches_the_euler_load():
    family = FAMILIES["solid_round"]
    diameter, youngs, strength = 0.01, 210e9, 235e6
    props = family.properties({"diameter": diameter})
    euler = np.pi**2 * youngs * (np.pi * diameter**4 / 64) / 1.0**2   # L = 1 m
    squash = strength * np.pi * diameter**2 / 4
    span = np.sqrt(euler / squash) * 30.0     # lambda = 30
    result = columns.column_resistance(span, 1.0, youngs, strength, props.area,
                                       props.second_moment_minor, STEEL_C.imperfection,
                                       STEEL_C.plateau)
    expected_critical = euler / span**2
    assert float(result.critical_load) == pytest.approx(expected_critical, rel=1e-12)
    assert float(result.relative_slenderness) == pytest.approx(30.0, rel=1e-9)
    assert float(result.resistance) <= expected_critical
    assert float(result.resistance) == pytest.approx(expected_critical, rel=0.02)


def test_stocky_column_reaches_the_squash_load():
    family = FAMILIES["i_section"]
    dims = {"depth": 0.2, "flange_width": 0.2, "flange_thickness": 0.015, "web_thickness": 0.009}
    props = family.properties(dims)
    result = columns.column_resistance(0.3, columns.EFFECTIVE_LENGTH_FACTORS["fixed_fixed"],
                                       210e9, 355e6, props.area,
                                       np.minimum(props.second_moment_major,
                                                  props.second_moment_minor),
                                       STEEL_D.imperfection, STEEL_D.plateau)
    assert float(result.relative_slenderness) < STEEL_D.plateau
    assert float(result.resistance) == pytest.approx(float(props.area) * 355e6, rel=1e-12)


def test_column_resistance_broadcasts_materials_by_sections_by_cases():
    area = np.array([1e-4, 2e-4, 4e-4])[None, :, None]
    weaker = area**2 / 12.0
    youngs = np.array([70e9, 210e9])[:, None, None]
    strength = np.array([240e6, 355e6])[:, None, None]
    span = np.array([0.5, 1.0, 2.0, 4.0])[None, None, :]
    result = columns.column_resistance(span, 1.0, youngs, strength, area, weaker, 0.49, 0.2)
    assert result.resistance.shape == (2, 3, 4)
    for m in range(2):
        for s in range(3):
            for c in range(4):
                single = columns.column_resistance(float(span[0, 0, c]), 1.0,
                                                   float(youngs[m, 0, 0]),
                                                   float(strength[m, 0, 0]),
                                                   float(area[0, s, 0]),
                                                   float(weaker[0, s, 0]), 0.49, 0.2)
                assert float(single.resistance) == pytest.approx(result.resistance[m, s, c])


def test_tie_of_a_10_mm_steel_rod_by_hand():
    """10 kN on a 10 mm round steel rod 2 m long, E = 210 GPa, f = 235 MPa:
    A = 78.54 mm^2, extension 10e3 * 2 / (210e9 * 78.54e-6) = 1.2126 mm, A f = 18.46 kN."""
    area = FAMILIES["solid_round"].properties({"diameter": 0.01}).area
    assert float(ties.extension(10e3, 2.0, 210e9, area)) == pytest.approx(1.2126e-3, rel=1e-4)
    assert float(ties.tension_resistance(area, 235e6)) == pytest.approx(18457.0, rel=1e-4)
