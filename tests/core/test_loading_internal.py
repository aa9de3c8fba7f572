"""General member loading: internal actions, lines and critical sections.

Closed forms from Roark's Formulas for Stress and Strain, 8th ed., table 8.1 (cases 1a, 1c,
1d, 1e; from memory; the same formulas are in Gere & Goodno, Mechanics of Materials, appendix
"Deflections and slopes of beams"). They are exact, so the tolerance is 1e-9 relative
(round-off). The seven shorthand load cases are checked against their general form.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from service.core import loadcases
from service.core.loading.actions import (
    SHORTHAND_FORMS,
    Action,
    attached_weight,
    combine,
    member_loading,
    point_forces,
    shorthand_actions,
    uniform_load,
)
from service.core.loading.critical import critical_sections
from service.core.loading.internal import diagram_stations, internal_actions, left_end_unknowns

SPAN, LOAD, TORQUE = 2.5, 1200.0, 80.0


def _close(ours, reference, label, mismatches, rel=1e-9):
    if not math.isclose(float(ours), float(reference), rel_tol=rel, abs_tol=1e-9):
        mismatches.append(f"{label}: ours {float(ours):.10g}, reference {float(reference):.10g}")


@pytest.mark.parametrize("case_id", [c for c, case in loadcases.LOAD_CASES.items()
                                     if case.loading in ("bending", "torsion")])
def test_shorthand_cases_equal_their_general_form(case_id):
    """Peaks of the general form = the shorthand coefficients of service.core.loadcases."""
    case = loadcases.LOAD_CASES[case_id]
    supports, actions = shorthand_actions(case_id, SPAN, LOAD, TORQUE)
    peaks = critical_sections(member_loading(supports, [SPAN], [actions]))
    mismatches = []
    _close(abs(peaks.moment[0]), loadcases.bending_moment(case, LOAD, SPAN), "moment", mismatches)
    _close(abs(peaks.shear[0]), loadcases.shear_force(case, LOAD), "shear", mismatches)
    _close(abs(peaks.deflection_times_stiffness[0]),
           loadcases.bending_deflection(case, LOAD, SPAN, 1.0, 1.0), "deflection", mismatches)
    if case.loading == "torsion":
        _close(abs(peaks.twist_times_stiffness[0]), loadcases.twist(TORQUE, SPAN, 1.0, 1.0),
               "twist", mismatches)
        _close(abs(peaks.torque[0]), TORQUE, "torque", mismatches)
    else:
        _close(peaks.torque[0], 0.0, "torque", mismatches)
    assert not mismatches, mismatches


@pytest.mark.parametrize("case_id", [c for c, case in loadcases.LOAD_CASES.items()
                                     if case.loading == "bending"])
def test_shorthand_cases_with_self_weight_equal_their_general_form(case_id):
    """loadcases.bending_response with a self-weight W equals the general form's peaks with a
    uniform load W / L added (critical_sections' ``uniform``), tolerance 1e-9."""
    case = loadcases.LOAD_CASES[case_id]
    weight = 700.0
    supports, actions = shorthand_actions(case_id, SPAN, LOAD)
    peaks = critical_sections(member_loading(supports, [SPAN], [actions]), uniform=weight / SPAN)
    shorthand = loadcases.bending_response(case, LOAD, SPAN, 1.0, 1.0, self_weight=weight)
    mismatches = []
    _close(abs(peaks.moment[0]), shorthand.moment, "moment", mismatches)
    _close(abs(peaks.shear[0]), shorthand.shear, "shear", mismatches)
    _close(abs(peaks.deflection_times_stiffness[0]), shorthand.deflection, "deflection",
           mismatches)
    assert not mismatches, mismatches


@pytest.mark.parametrize("case_id", [c for c, case in loadcases.LOAD_CASES.items()
                                     if case.loading == "bending"])
def test_sandwich_shorthand_cases_equal_their_general_form(case_id):
    """Bending plus shear deflection of a sandwich member (loadcases: Allen's coefficients)
    equals the general form with shear flexibility E I / S, tolerance 1e-9."""
    case = loadcases.LOAD_CASES[case_id]
    rigidity, shear_stiffness = 2.0e4, 5.0e4
    supports, actions = shorthand_actions(case_id, SPAN, LOAD)
    peaks = critical_sections(member_loading(supports, [SPAN], [actions]),
                              shear_flexibility=rigidity / shear_stiffness)
    shorthand = (loadcases.bending_deflection(case, LOAD, SPAN, rigidity, 1.0)
                 + loadcases.shear_deflection(case, LOAD, SPAN, shear_stiffness))
    assert math.isclose(abs(peaks.deflection_times_stiffness[0]) / rigidity, float(shorthand),
                        rel_tol=1e-9)


@pytest.mark.parametrize("supports", ["cantilever", "simply_supported"])
def test_shear_deflection_integrates_the_shear_force(supports):
    """On determinate members y_s(x) = integral of V / S from x = 0 (the sandwich beam's shear
    angle, Allen 1969): the peak with shear flexibility phi is the peak of E I y_b + phi times
    a trapezoidal integral of V. The stations hold both limits at every breakpoint, so the
    rule is exact for the piecewise linear V; the sampled peak (20001 even points) is within
    O(h^2) of the true one: tolerance 1e-7 relative."""
    rng = np.random.default_rng(8)
    loading = _random_loading(supports, rng, cases=10)
    phi = 0.3  # E I / S, m^2: shear deformation of the order of bending deformation
    x, from_left = diagram_stations(loading, 20001)
    lines = internal_actions(loading, x, from_left)
    steps = np.diff(x, axis=1) * (lines.shear[:, 1:] + lines.shear[:, :-1]) / 2
    shear_line = np.concatenate([np.zeros((10, 1)), np.cumsum(steps, axis=1)], axis=1)
    reference = np.abs(lines.deflection_times_stiffness + phi * shear_line).max(axis=1)
    ours = np.abs(critical_sections(loading, shear_flexibility=phi).deflection_times_stiffness)
    np.testing.assert_allclose(ours, reference, rtol=1e-7)


def test_every_shorthand_case_has_a_general_form():
    assert set(SHORTHAND_FORMS) == set(loadcases.LOAD_CASES)


def test_point_load_anywhere_matches_roark_table_8_1():
    """Point load W at a, b = L - a, on each support set (Roark 8th ed., table 8.1)."""
    span, load = 3.0, 1000.0
    at = np.array([0.4, 1.1, 1.5, 2.2, 2.9])
    a, b = at, span - at
    mismatches = []
    for supports in ("cantilever", "simply_supported", "fixed_fixed", "propped_cantilever"):
        loading = point_forces(supports, np.full(at.size, span), at[:, None], load)
        reaction, moment_0, _ = left_end_unknowns(loading)
        under_load = internal_actions(loading, at[:, None]).deflection_times_stiffness[:, 0]
        if supports == "cantilever":  # case 1a (fixed at x = 0 here): R = W, M = -W a
            expected = (np.full_like(a, load), -load * a, load * a**3 / 3.0)
        elif supports == "simply_supported":  # case 1e: R_A = W b / L, y = W a^2 b^2/(3 L)
            expected = (load * b / span, 0 * a, load * a**2 * b**2 / (3.0 * span))
        elif supports == "fixed_fixed":  # case 1d: R_A = W b^2 (3a + b)/L^3, M_A = -W a b^2/L^2
            expected = (load * b**2 * (3 * a + b) / span**3, -load * a * b**2 / span**2,
                        load * a**3 * b**3 / (3.0 * span**3))
        else:  # case 1c, mirrored: prop reaction W a^2 (3L - a) / (2 L^3) at x = L
            prop = load * a**2 * (3 * span - a) / (2 * span**3)
            expected = (load - prop, prop * span - load * a, None)
        for name, ours, reference in zip(("reaction", "moment_0", "deflection"),
                                         (reaction, moment_0, under_load), expected,
                                         strict=True):
            if reference is None:
                continue
            for i in range(at.size):
                _close(ours[i], reference[i], f"{supports} {name} a={at[i]}", mismatches)
    assert not mismatches, mismatches


def test_simply_supported_maximum_deflection_is_found_off_the_load():
    """Gere & Goodno appendix G, case 5: y_max = W b (L^2 - b^2)^1.5 / (9 sqrt(3) L) at
    x = sqrt((L^2 - b^2) / 3), for a >= b (from memory)."""
    span, load, a = 4.0, 500.0, 3.0
    b = span - a
    peaks = critical_sections(point_forces("simply_supported", [span], [[a]], load))
    expected = load * b * (span**2 - b**2) ** 1.5 / (9 * math.sqrt(3) * span)
    assert math.isclose(peaks.deflection_times_stiffness[0], expected, rel_tol=1e-9)
    assert math.isclose(peaks.deflection_at[0], math.sqrt((span**2 - b**2) / 3), rel_tol=1e-6)


def test_propped_cantilever_uniform_load():
    """Roark table 8.1 case 2c: R at the prop 3 w L / 8, fixed-end moment -w L^2 / 8, peak
    sagging moment 9 w L^2 / 128 at 5 L / 8 from the fixed end; y_max = w L^4 / 185 EI (the
    handbook's rounded constant; exact 0.0054161 w L^4), at 0.5785 L from the fixed end."""
    span, w = 2.0, 300.0
    peaks = critical_sections(uniform_load("propped_cantilever", [span], w))
    reaction, moment_0, _ = left_end_unknowns(uniform_load("propped_cantilever", [span], w))
    assert math.isclose(reaction[0], 5 * w * span / 8, rel_tol=1e-12)
    assert math.isclose(moment_0[0], -w * span**2 / 8, rel_tol=1e-12)
    assert math.isclose(peaks.moment[0], -w * span**2 / 8, rel_tol=1e-12)
    sagging = internal_actions(uniform_load("propped_cantilever", [span], w), [5 * span / 8])
    assert math.isclose(sagging.moment[0, 0], 9 * w * span**2 / 128, rel_tol=1e-12)
    assert math.isclose(peaks.deflection_times_stiffness[0], w * span**4 / 185, rel_tol=2e-3)
    assert math.isclose(peaks.deflection_at[0], 0.5785 * span, rel_tol=1e-4)


def _random_loading(supports, rng, cases=40):
    spans = rng.uniform(0.5, 5.0, cases)
    actions = []
    for span in spans:
        case = [Action("force", rng.uniform(-2e3, 2e3), at=rng.uniform(0, span))
                for _ in range(rng.integers(0, 4))]
        for _ in range(rng.integers(0, 3)):
            start, end = np.sort(rng.uniform(0, span, 2))
            case.append(Action("distributed", rng.uniform(-1e3, 1e3), start=start, end=end))
        case += [Action("torque", rng.uniform(-300, 300), at=rng.uniform(0, span))
                 for _ in range(rng.integers(0, 3))]
        actions.append(case)
    return member_loading(supports, spans, actions)


@pytest.mark.parametrize("supports", ["cantilever", "simply_supported", "fixed_fixed",
                                      "propped_cantilever"])
def test_critical_sections_bound_a_dense_sampling(supports):
    """The critical sections hold the true peaks: no dense sample (20001 points) exceeds them, and
    each peak is reached by the dense sampling to within one step h times the largest slope
    of that diagram (the sampling's own first-order error at a kink or a jump)."""
    rng = np.random.default_rng(13)
    loading = _random_loading(supports, rng)
    peaks = critical_sections(loading)
    x = loading.span[:, None] * np.linspace(0, 1, 20001)[None, :]
    step = loading.span / 20000
    dense = internal_actions(loading, x)
    largest_intensity = np.abs(loading.distributed_value).sum(axis=1)
    mismatches = []
    for name, field, peak, slope in (
        ("moment", dense.moment, peaks.moment, dense.shear),
        ("shear", dense.shear, peaks.shear, largest_intensity[:, None]),
        ("torque", dense.torque, peaks.torque, 0.0 * dense.torque),
        ("deflection", dense.deflection_times_stiffness, peaks.deflection_times_stiffness,
         dense.slope_times_stiffness),
        ("twist", dense.twist_times_stiffness, peaks.twist_times_stiffness, dense.torque),
    ):
        sampled = np.abs(field).max(axis=1)
        round_off = 1e-9 * (np.abs(field).max() + 1e-12)
        gap = step * np.abs(slope).max(axis=1) + round_off
        over = sampled > np.abs(peak) + round_off
        under = sampled < np.abs(peak) - gap
        mismatches += [f"{name} case {i}: sample above peak" for i in np.flatnonzero(over)]
        mismatches += [f"{name} case {i}: peak not reached" for i in np.flatnonzero(under)]
    assert not mismatches, mismatches


def test_self_weight_per_design_equals_solving_each_design_again():
    """critical_sections(loading, uniform=q) over (designs, cases) equals the member solved
    again with q added as a distributed load, design by design (superposition)."""
    rng = np.random.default_rng(21)
    for supports in ("cantilever", "simply_supported", "fixed_fixed", "propped_cantilever"):
        loading = _random_loading(supports, rng, cases=6)
        weights = rng.uniform(0.0, 3e3, (4, 6))
        peaks = critical_sections(loading, uniform=weights)
        assert peaks.moment.shape == (4, 6)
        for design in range(4):
            alone = critical_sections(combine(
                loading, uniform_load(supports, loading.span, weights[design])))
            # magnitudes: where +V and -V tie (a symmetric case) either sign is the peak
            for name in ("moment", "shear", "deflection_times_stiffness"):
                np.testing.assert_allclose(np.abs(getattr(peaks, name)[design]),
                                           np.abs(getattr(alone, name)),
                                           rtol=1e-9, atol=1e-9, err_msg=f"{supports} {name}")


def test_equilibrium_of_every_random_case():
    """Statics: the shear just inside x = L plus the right reaction balances the loads, and the
    moment at the free or pinned end is zero; twist is zero at a restrained right end."""
    rng = np.random.default_rng(5)
    for supports in ("cantilever", "simply_supported", "propped_cantilever"):
        loading = _random_loading(supports, rng)
        end = internal_actions(loading, loading.span[:, None])
        np.testing.assert_allclose(end.moment, 0.0, atol=1e-7)
    for supports in ("simply_supported", "fixed_fixed", "propped_cantilever"):
        loading = _random_loading(supports, rng)
        end = internal_actions(loading, loading.span[:, None])
        np.testing.assert_allclose(end.twist_times_stiffness, 0.0, atol=1e-8)
        np.testing.assert_allclose(end.deflection_times_stiffness, 0.0, atol=1e-7)


def test_torque_split_by_position_between_restrained_ends():
    """A torque T at a with both ends restrained: T (L - a) / L left of it, -T a / L right of
    it (compatibility with uniform G K); on a cantilever all of T goes to the root."""
    loading = member_loading("fixed_fixed", [2.0], [[Action("torque", 100.0, at=0.5)]])
    lines = internal_actions(loading, [0.25, 1.5])
    np.testing.assert_allclose(lines.torque, [[75.0, -25.0]], rtol=1e-12)
    # twist at the torque: T a (L - a) / (L G K) = 100 * 0.5 * 1.5 / 2 = 37.5
    assert math.isclose(critical_sections(loading).twist_times_stiffness[0], 37.5, rel_tol=1e-12)
    cantilever = member_loading("cantilever", [2.0], [[Action("torque", 100.0, at=0.5)]])
    np.testing.assert_allclose(internal_actions(cantilever, [0.25, 1.5]).torque, [[100.0, 0.0]])
    bearings = member_loading("fixed_fixed", [2.0], [[Action("torque", 100.0, at=0.5)]],
                              twist_free_at_right_end=True)
    np.testing.assert_allclose(internal_actions(bearings, [0.25, 1.5]).torque, [[100.0, 0.0]])


def test_shear_jumps_at_a_point_force_on_either_side():
    loading = point_forces("simply_supported", [2.0], [[0.5]], 100.0)
    lines = internal_actions(loading, [0.5, 0.5], from_left=[True, False])
    np.testing.assert_allclose(lines.shear, [[75.0, -25.0]], rtol=1e-12)


def test_attached_weight_and_superposition():
    loading = member_loading("cantilever", [1.0],
                             [[Action("mass", 2.0, at=1.0), Action("axial", -500.0)]])
    weight = attached_weight(loading)
    total = combine(loading, weight, uniform_load("cantilever", [1.0], 10.0))
    reaction, moment_0, _ = left_end_unknowns(total)
    g = loadcases.STANDARD_GRAVITY
    assert math.isclose(reaction[0], 2.0 * g + 10.0, rel_tol=1e-12)
    assert math.isclose(moment_0[0], -(2.0 * g + 5.0), rel_tol=1e-12)
    assert total.axial[0] == -500.0


def test_cyclic_parts_add_up_to_the_total():
    actions = [[Action("force", 100.0, at=0.3, cyclic="reversed"),
                Action("distributed", 40.0, start=0.2, end=0.9, cyclic="pulsating"),
                Action("torque", 30.0, at=0.7)]]
    parts = {part: member_loading("simply_supported", [1.0], actions, part)
             for part in ("total", "mean", "alternating")}
    lines = {part: internal_actions(loading, np.linspace(0, 1, 11))
             for part, loading in parts.items()}
    np.testing.assert_allclose(lines["mean"].moment + lines["alternating"].moment,
                               lines["total"].moment, rtol=1e-12)
    np.testing.assert_allclose(parts["mean"].force_value, [[0.0]])
    np.testing.assert_allclose(parts["alternating"].distributed_value, [[20.0]])
    np.testing.assert_allclose(parts["alternating"].torque_value, [[0.0]])


def test_diagram_stations_are_sorted_with_each_jump_as_a_step():
    loading = point_forces("simply_supported", [2.0], [[0.5]], 100.0)
    x, from_left = diagram_stations(loading, count=5)
    assert np.all(np.diff(x, axis=1) >= 0)
    at_load = np.flatnonzero(x[0] == 0.5)
    shear = internal_actions(loading, x, from_left).shear[0, at_load]
    assert shear[0] == pytest.approx(75.0) and shear[-1] == pytest.approx(-25.0)
