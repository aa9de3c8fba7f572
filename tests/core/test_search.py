"""The ratio-box search shared by the sizing and the rankings (service.core.search)."""

from __future__ import annotations

import numpy as np

from service.core.search import RatioBox, rounds_to, zoom
from service.core.sections.base import RatioBound


def box():
    return RatioBox.of([RatioBound("wall", 0.01, 0.5, "test"),
                        RatioBound("width", 0.2, 2.0, "test")])


def test_grid_covers_the_box_with_its_ends():
    grid = box().grid(5)
    assert grid.shape == (25, 2)
    np.testing.assert_allclose(np.exp(grid.min(axis=0)), [0.01, 0.2], rtol=1e-15)
    np.testing.assert_allclose(np.exp(grid.max(axis=0)), [0.5, 2.0], rtol=1e-15)
    # the last ratio varies fastest; steps are even in log(ratio)
    np.testing.assert_allclose(np.diff(grid[:5, 1]), box().spacing(5)[1])
    assert np.all(grid[:5, 0] == grid[0, 0])


def test_zoom_finds_a_smooth_maximum_inside_the_box():
    # Two materials, each with its own peak: -((x - a)^2 + (y - b)^2), peaks known exactly.
    peaks = np.log([[0.05, 0.5], [0.3, 1.3]])
    search = box()

    def pick(candidates):
        score = -np.sum((candidates - peaks[:, None, :]) ** 2, axis=-1)
        best = np.argmax(score, axis=-1)
        return np.take_along_axis(candidates, best[:, None, None], axis=-2)[:, 0, :]

    grid = search.grid(9)
    start = pick(np.broadcast_to(grid, (2,) + grid.shape))
    step = search.spacing(9)
    found = zoom(search, start, step, pick, points=5, shrink=0.5,
                 rounds=rounds_to(step, 1e-6, 0.5))
    np.testing.assert_allclose(found, peaks, atol=1e-6)


def test_zoom_stays_inside_the_box():
    # The best point lies outside the box: from the middle, the search ends on its corner.
    search = box()
    outside = np.log([[1.0, 3.0]])

    def pick(candidates):
        best = np.argmin(np.sum((candidates - outside[:, None, :]) ** 2, axis=-1), axis=-1)
        return np.take_along_axis(candidates, best[:, None, None], axis=-2)[:, 0, :]

    found = zoom(search, search.grid(3)[4:5], search.spacing(3), pick, points=5, shrink=0.5,
                 rounds=40)
    np.testing.assert_allclose(np.exp(found), [[0.5, 2.0]], rtol=1e-12)


def test_rounds_to_counts_the_halvings():
    assert rounds_to(np.array([1.0, 0.25]), 0.125, 0.5) == 3
    assert rounds_to(np.array([0.1]), 0.2, 0.5) == 0
