"""Invariants of the general member over random actions (hypothesis).

Independent of any handbook: statics (the support reactions balance the loads), linearity
(twice the loads, twice every diagram), and mirror symmetry (a member that is the same from
both ends, simply supported or fixed-fixed, loaded by the mirror image of a load set, gives
the mirror image of every diagram: M(x) -> M(L - x), V(x) -> -V(L - x), y(x) -> y(L - x)).
The mirror check exercises the statically indeterminate solution from the other end.
Tolerance: 1e-9 of the largest value of each diagram (round-off).
"""

from __future__ import annotations

import numpy as np
from hypothesis import given, settings
from hypothesis import strategies as st

from service.core.loading.actions import Action, member_loading
from service.core.loading.internal import internal_actions, left_end_unknowns

SUPPORTS = ("cantilever", "simply_supported", "fixed_fixed", "propped_cantilever")


@st.composite
def members(draw):
    span = draw(st.floats(0.2, 10.0))
    fraction = st.floats(0.0, 1.0)
    actions = [Action("force", draw(st.floats(-1e4, 1e4)), at=draw(fraction) * span)
               for _ in range(draw(st.integers(0, 4)))]
    for _ in range(draw(st.integers(0, 3))):
        start, end = sorted((draw(fraction) * span, draw(fraction) * span))
        actions.append(Action("distributed", draw(st.floats(-5e3, 5e3)), start=start, end=end))
    return draw(st.sampled_from(SUPPORTS)), span, actions


def _mirror(action: Action, span: float) -> Action:
    if action.kind == "distributed":
        return Action("distributed", action.value, start=span - action.end,
                      end=span - action.start)
    return Action(action.kind, action.value, at=span - action.at)


def _scale(values: np.ndarray) -> float:
    return 1e-9 * (np.abs(values).max() + 1.0)


@settings(max_examples=150, deadline=None)
@given(members())
def test_reactions_balance_the_loads(member):
    supports, span, actions = member
    loading = member_loading(supports, [span], [actions])
    reaction, moment_0, _ = left_end_unknowns(loading)
    total = sum(a.value for a in actions if a.kind == "force") + sum(
        a.value * (a.end - a.start) for a in actions if a.kind == "distributed")
    moment_about_0 = sum(a.value * a.at for a in actions if a.kind == "force") + sum(
        a.value * (a.end**2 - a.start**2) / 2 for a in actions if a.kind == "distributed")
    end = internal_actions(loading, [span])
    # past every load (the limit from the right at L) the shear is minus the right reaction;
    # M(L) is the right-end moment reaction
    right_reaction = -end.shear[0, 0]
    size = abs(total) + abs(moment_about_0) / span + 1.0
    assert abs(reaction[0] + right_reaction - total) <= 1e-9 * size
    assert abs(-moment_0[0] + end.moment[0, 0] + right_reaction * span - moment_about_0) <= (
        1e-9 * size * span)


@settings(max_examples=100, deadline=None)
@given(members())
def test_diagrams_are_linear_in_the_loads(member):
    supports, span, actions = member
    doubled = [Action(a.kind, 2 * a.value, at=a.at, start=a.start, end=a.end) for a in actions]
    x = np.linspace(0, span, 41)
    once = internal_actions(member_loading(supports, [span], [actions]), x)
    twice = internal_actions(member_loading(supports, [span], [doubled]), x)
    for name in ("shear", "moment", "deflection_times_stiffness"):
        single = getattr(once, name)
        assert np.abs(getattr(twice, name) - 2 * single).max() <= 2 * _scale(single)


@settings(max_examples=150, deadline=None)
@given(members(), st.sampled_from(("simply_supported", "fixed_fixed")))
def test_mirror_image_for_members_symmetric_end_to_end(member, supports):
    _, span, actions = member
    x = np.linspace(0, span, 41)
    lines = internal_actions(member_loading(supports, [span], [actions]), x)
    mirrored = internal_actions(
        member_loading(supports, [span], [[_mirror(a, span) for a in actions]]),
        span - x, from_left=True)
    assert np.abs(mirrored.moment - lines.moment).max() <= _scale(lines.moment)
    deflection = lines.deflection_times_stiffness
    # round-off of the deflection line grows with the loads times span^3..span^4 (its
    # terms), which can cancel to a tiny line: measure it against them, not the line alone
    terms = sum(abs(a.value) for a in actions) * max(span, 1.0) ** 4
    assert np.abs(mirrored.deflection_times_stiffness - deflection).max() <= (
        _scale(deflection) + 1e-13 * terms)
    # shear changes sign; a point force on a station jumps, so compare off the forces
    away = np.all(np.abs(x[:, None] - np.array(
        [a.at for a in actions if a.kind == "force"] + [-1.0])[None, :]) > 1e-9, axis=1)
    assert np.abs(mirrored.shear[0, away] + lines.shear[0, away]).max(initial=0.0) <= _scale(
        lines.shear)
