"""The active-set polish (service.core.sizing.polish): its linear algebra against numpy's
reference pseudo-inverse, and the polish itself never giving a heavier point than its start
(the whole search is checked against exhaustive search in tests/validation)."""

from __future__ import annotations

import numpy as np

from service.core.search import RatioBox
from service.core.sections import FAMILIES
from service.core.sizing import DesignRequest
from service.core.sizing.demand import Demand, demand_of
from service.core.sizing.polish import _pseudo_inverse, polish
from service.core.sizing.unit_bounds import bounds_at


def test_pseudo_inverse_matches_numpy():
    # Stacked full-rank and rank-deficient (an inactive row of zeros) systems; 1e-6 relative
    # is the regularisation's stated accuracy.
    rng = np.random.default_rng(3)
    matrices = rng.normal(size=(20, 6, 3))
    matrices[::2, 4:] = 0.0
    np.testing.assert_allclose(_pseudo_inverse(matrices), np.linalg.pinv(matrices),
                               rtol=1e-6, atol=1e-9)


def test_polish_never_ends_heavier_than_it_starts(demo_values):
    family = FAMILIES["i_section"]
    demand = Demand.stack([demand_of(DesignRequest(
        "simply_supported_center_load", span=2.0, load=5000.0, max_deflection=0.005,
        safety_factor=1.5, max_depth=0.12, min_wall=0.001))]).per_row(2)
    box = RatioBox.of(family.ratio_bounds)
    start = np.repeat(box.low[None, :] * 0.5 + box.high[None, :] * 0.5, 2, axis=0)
    columns = demo_values.column()
    before = bounds_at(family, np.exp(start[:, None, :]), columns, demand)
    center, after = polish(family, start, columns, demand, box.low, box.high)
    assert center.shape == start.shape
    was = np.where(before.feasible[:, 0], before.mass[:, 0], np.inf)
    now = np.where(after.feasible, after.mass, np.inf)
    assert np.all(now <= was)
    assert np.all(np.isfinite(now)), "the polish found no feasible point"


def test_trial_points_skip_only_checks_the_steps_do_not_read(demo_values, monkeypatch):
    """The trial points leave out the checks whose parts no Newton step reads: the polish
    ends exactly where it ends with every check evaluated there, on an unbraced beam (member
    buckling, interaction and bearing asked) and on a beam-column (member buckling's parts
    split, strength read by it)."""
    from service.core.sizing import polish as module

    for request in (
            DesignRequest("cantilever_end_load", span=0.9, load=44.0, max_deflection=0.004,
                          safety_factor=2.0, max_depth=0.03, max_width=0.03, min_wall=0.0005),
            DesignRequest("fixed_fixed_center_load", span=1.2, load=3000.0, safety_factor=1.5,
                          max_deflection=0.003, max_depth=0.08, axial_force=-5000.0)):
        for family_id in ("i_section", "rectangular_tube"):
            family = FAMILIES[family_id]
            rows = len(demo_values.density)
            demand = Demand.stack([demand_of(request)]).per_row(rows)
            box = RatioBox.of(family.ratio_bounds)
            start = np.repeat(box.low[None, :] * 0.4 + box.high[None, :] * 0.6, rows, axis=0)
            columns = demo_values.column()
            skipping = polish(family, start, columns, demand, box.low, box.high)
            with monkeypatch.context() as patched:
                patched.setattr(module, "_unread", lambda layout, read: {})
                every = polish(family, start, columns, demand, box.low, box.high)
            np.testing.assert_array_equal(skipping[0], every[0])
            np.testing.assert_array_equal(skipping[1].mass, every[1].mass)


def test_release_at_a_degenerate_vertex_keeps_a_bound_whose_release_would_break_it():
    """Three bounds active on (log s, log p1, log p2), as where a box's member buckling
    (sigma >= m(p), m falling with the width), its min_wall (sigma >= w(p2)) and the rule
    wall <= width / 2 meet (values near the case in test_search_crosses_the_square_tube_edge).
    Solving o = sum(mu_i g_i) by hand: mu = (-2.5, 0.5, 0.65), so the last two have the
    wrong sign. Releasing both leaves the direction along the first alone, which raises
    min_wall's row at once (g_11 . d = 0.304 > 0): no step. Releasing one of them alone
    keeps the other met: along member buckling and min_wall, d = (-0.6, 1, 0.6) with
    o . d = -0.26 (g_15 . d = -0.4), the steeper; along member buckling and the rule,
    d = (-0.6, 1, 1) with o . d = -0.2 (g_11 . d = -0.4)."""
    from service.core.sizing.polish import _release

    rows = np.array([[[-1.0, -0.6, 0.0], [-1.0, 0.0, -1.0], [0.0, -1.0, 1.0]]])
    objective = np.array([[2.0, 0.85, 0.15]])
    active = np.ones((1, 3), dtype=bool)
    multipliers = np.linalg.solve(rows[0].T, objective[0])
    np.testing.assert_allclose(multipliers, [-2.5, 0.5, 0.65])
    wrong = active & (multipliers > 0)

    def move(kept_rows):
        kept = np.where(kept_rows[:, None], rows[0], 0.0)
        return -(objective[0] - _pseudo_inverse(kept) @ kept @ objective[0])

    everything = move(np.array([True, False, False]))
    assert rows[0, 1] @ everything > 0.1 * np.linalg.norm(everything)  # breaks min_wall
    chosen, _ = _release(rows, active, wrong, objective)
    assert chosen.tolist() == [[True, True, False]]
    step = move(chosen[0])
    assert objective[0] @ step < 0                                       # descent
    assert rows[0, 2] @ step <= 1e-9 * np.linalg.norm(step)              # the rule met
    np.testing.assert_allclose(step / step[1], [-0.6, 1.0, 0.6], atol=1e-6)
