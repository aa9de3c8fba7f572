"""Bad input of a general member, named by field path, for the API's 422 answers.

Paths use the contract's field names below the load case (``supports``, ``span``,
``actions.2.at``, ``actions.0.from``, ``actions.0.to``, ``actions.3.value``); the API puts
them under ``load_case`` with ``InputError.prefixed("load_case")``. Requirement paths
(``min_frequency``, ``fatigue_cycles``) go under ``requirements`` the same way. Every
problem is reported, not only the first.
"""

from __future__ import annotations

import math
import numbers
from collections.abc import Sequence

from service.core.errors import InputError
from service.core.loading.actions import ACTION_KINDS, CYCLIC_PARTS, SUPPORTS, Action

Problems = dict[str, list[str]]

POSITION_FIELDS = {"force": ("at",), "torque": ("at",), "mass": ("at",),
                   "distributed": ("start", "end"), "axial": ()}
"""Action kind -> the position fields it needs (core names)."""

CONTRACT_NAMES = {"at": "at", "start": "from", "end": "to"}
"""Core field name of an action -> its name in the contract and its JSON path."""


def _finite(value) -> bool:
    return (isinstance(value, numbers.Real) and not isinstance(value, bool)
            and math.isfinite(value))


def _add(problems: Problems, path: str, message: str) -> None:
    problems.setdefault(path, []).append(message)


def _action_problems(problems: Problems, index: int, action: Action, span: float | None):
    prefix = f"actions.{index}"
    if action.kind not in ACTION_KINDS:
        _add(problems, f"{prefix}.kind",
             f"unknown action kind {action.kind!r}; one of {', '.join(ACTION_KINDS)}")
        return
    if not _finite(action.value):
        _add(problems, f"{prefix}.value", "must be a finite number")
    elif action.kind == "mass" and action.value < 0:
        _add(problems, f"{prefix}.value", "a mass cannot be negative")
    if action.kind == "mass":
        if action.cyclic != "steady":
            _add(problems, f"{prefix}.cyclic", "a mass has no cyclic kind")
    elif action.cyclic not in CYCLIC_PARTS:
        _add(problems, f"{prefix}.cyclic",
             f"unknown cyclic kind {action.cyclic!r}; one of {', '.join(CYCLIC_PARTS)}")
    positions = {}
    for field in POSITION_FIELDS[action.kind]:
        path = f"{prefix}.{CONTRACT_NAMES[field]}"
        value = getattr(action, field)
        if value is None:
            _add(problems, path, f"required for a {action.kind} action")
        elif not _finite(value):
            _add(problems, path, "must be a finite number")
        elif span is not None and not 0.0 <= value <= span:
            _add(problems, path, f"{value:g} m is outside the span [0, {span:g}] m")
        else:
            positions[field] = value
    if "start" in positions and "end" in positions:
        if positions["end"] < positions["start"]:
            _add(problems, f"{prefix}.to",
                 f"ends at {positions['end']:g} m, before it starts at {positions['start']:g} m")
        elif positions["end"] == positions["start"]:
            _add(problems, f"{prefix}.to", "a distributed load needs a length (to > from)")


def member_problems(supports: str, span, actions: Sequence[Action]) -> Problems:
    """Every problem of one general member, by path (empty when the member is valid).

    Checks: supports one of the stable sets in ``SUPPORTS`` (each of them fixes the member
    against rigid-body motion in bending and twist; any other name is refused); a finite
    positive span; known action kinds and cyclic kinds; finite values; masses not negative;
    each position present and within [0, span]; a distributed load ending after it starts.
    """
    problems: Problems = {}
    if supports not in SUPPORTS:
        _add(problems, "supports", f"unknown or unstable supports {supports!r}; "
                                   f"one of {', '.join(SUPPORTS)}")
    valid_span = _finite(span) and span > 0
    if not valid_span:
        _add(problems, "span", "must be a finite length above 0")
    for index, action in enumerate(actions):
        _action_problems(problems, index, action, span if valid_span else None)
    return problems


def requirement_problems(min_frequency=None, fatigue_cycles=None) -> Problems:
    """Problems of the vibration and fatigue requirements (None: not requested)."""
    problems: Problems = {}
    if min_frequency is not None and not (_finite(min_frequency) and min_frequency > 0):
        _add(problems, "min_frequency", "must be a finite frequency above 0 Hz")
    if fatigue_cycles is not None and not (_finite(fatigue_cycles) and fatigue_cycles >= 1):
        _add(problems, "fatigue_cycles", "must be a finite count of at least 1 cycle")
    return problems


def check_member(supports: str, span, actions: Sequence[Action]) -> None:
    """Raise :class:`~service.core.errors.InputError` with every problem of the member."""
    problems = member_problems(supports, span, actions)
    if problems:
        raise InputError(problems)
