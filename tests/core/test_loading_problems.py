"""Bad input of a general member: every problem named by its path, none missed."""

from __future__ import annotations

import math

import pytest

from service.core.errors import InputError
from service.core.loading.actions import Action
from service.core.loading.problems import check_member, member_problems, requirement_problems


def test_a_valid_member_has_no_problems():
    actions = [Action("force", 100.0, at=0.0), Action("force", 100.0, at=2.0),
               Action("distributed", 50.0, start=0.0, end=2.0, cyclic="pulsating"),
               Action("torque", -20.0, at=1.0, cyclic="reversed"), Action("axial", -1e3),
               Action("mass", 0.0, at=1.5)]
    assert member_problems("propped_cantilever", 2.0, actions) == {}
    check_member("propped_cantilever", 2.0, actions)


def test_every_problem_is_reported_by_its_path():
    actions = [
        Action("force", 100.0, at=2.5),                       # outside the span
        Action("distributed", 10.0, start=1.5, end=0.5),      # ends before it starts
        Action("mass", -1.0, at=1.0),                         # negative mass
        Action("torque", 5.0),                                # no position
        Action("distributed", 10.0, start=-0.1, end=1.0),     # start outside
        Action("force", math.nan, at=1.0),                    # not a number
        Action("force", 1.0, at=1.0, cyclic="random"),        # unknown cyclic kind
        Action("spring", 1.0, at=1.0),                        # unknown kind
        Action("distributed", 10.0, start=1.0, end=1.0),      # no length
        Action("mass", 1.0, at=1.0, cyclic="reversed"),       # masses do not cycle
    ]
    problems = member_problems("simply_supported", 2.0, actions)
    assert set(problems) == {
        "actions.0.at", "actions.1.to", "actions.2.value", "actions.3.at", "actions.4.from",
        "actions.5.value", "actions.6.cyclic", "actions.7.kind", "actions.8.to",
        "actions.9.cyclic",
    }
    assert "outside the span" in problems["actions.0.at"][0]
    assert "before it starts" in problems["actions.1.to"][0]
    assert "negative" in problems["actions.2.value"][0]


def test_unknown_supports_and_bad_span():
    problems = member_problems("pinned_pinned_free", -1.0, [Action("force", 1.0, at=0.5)])
    assert set(problems) == {"supports", "span"}
    # with no valid span, positions are not judged against it
    assert "actions.0.at" not in problems


def test_check_member_raises_an_input_error_the_api_can_prefix():
    with pytest.raises(InputError) as raised:
        check_member("cantilever", 1.0, [Action("force", 1.0, at=1.2)])
    assert raised.value.prefixed("load_case").errors == {
        "load_case.actions.0.at": ["1.2 m is outside the span [0, 1] m"]}


def test_requirement_problems():
    assert requirement_problems(min_frequency=10.0, fatigue_cycles=1e6) == {}
    assert set(requirement_problems(min_frequency=0.0, fatigue_cycles=0.5)) == {
        "min_frequency", "fatigue_cycles"}
