"""Sampled diagrams for output: consistent with the lines and the critical sections."""

from __future__ import annotations

import numpy as np

from service.core.loading.actions import Action, combine, member_loading, uniform_load
from service.core.loading.critical import critical_sections
from service.core.loading.diagrams import diagrams
from service.core.loading.internal import internal_actions


def _loading():
    return member_loading("propped_cantilever", [2.0, 3.0], [
        [Action("force", 500.0, at=0.7), Action("torque", 40.0, at=1.2),
         Action("axial", -300.0)],
        [Action("distributed", 200.0, start=0.5, end=2.5), Action("force", -100.0, at=3.0)],
    ])


def test_diagrams_of_designs_with_self_weight():
    loading = _loading()
    rigidity = np.array([[2e4, 3e4], [5e4, 6e4]])  # two designs x two cases
    weight = np.array([[10.0, 20.0], [30.0, 40.0]])
    drawn = diagrams(loading, rigidity, uniform=weight, count=21)
    # 6 breakpoints twice: the two ends, the force, the load's two limits, the torque
    assert drawn.moment.shape == drawn.deflection.shape == (2, 2, 21 + 2 * 6)
    for design in range(2):
        solved = combine(loading, uniform_load("propped_cantilever", loading.span,
                                               weight[design]))
        lines = internal_actions(solved, drawn.x[design], np.zeros_like(drawn.x[design], bool))
        np.testing.assert_allclose(drawn.deflection[design],
                                   lines.deflection_times_stiffness / rigidity[design][:, None],
                                   rtol=1e-9, atol=1e-15)
        peaks = critical_sections(loading, uniform=weight[design])
        # the sampled diagram never exceeds the critical sections and reaches the shear peak
        assert np.all(np.abs(drawn.moment[design]).max(axis=1) <= np.abs(peaks.moment) + 1e-9)
        np.testing.assert_allclose(np.abs(drawn.shear[design]).max(axis=1),
                                   np.abs(peaks.shear), rtol=1e-12)
    np.testing.assert_allclose(drawn.axial[0, 0], -300.0)
    assert np.all(np.diff(drawn.x, axis=-1) >= 0)


def test_jumps_are_drawn_as_steps():
    drawn = diagrams(_loading(), 1e4, count=11)
    at_force = np.flatnonzero(drawn.x[0] == 0.7)
    shear = drawn.shear[0, at_force]
    assert np.isclose(shear[0] - shear[-1], 500.0)


def test_sandwich_deflection_line_reaches_the_critical_deflection():
    """With shear flexibility the drawn deflection peaks at the critical sections' value (to
    the sampling error of 2001 stations, 1e-5 relative) and never above it."""
    loading = _loading()
    rigidity, phi = np.array([2e4, 3e4]), np.array([0.05, 0.4])
    drawn = diagrams(loading, rigidity, count=2001, shear_flexibility=phi)
    peaks = critical_sections(loading, shear_flexibility=phi)
    peak = np.abs(peaks.deflection_times_stiffness) / rigidity
    sampled = np.abs(drawn.deflection).max(axis=-1)
    assert np.all(sampled <= peak * (1 + 1e-12))
    np.testing.assert_allclose(sampled, peak, rtol=1e-5)
