"""The concentrated forces a member bears (service.core.loading.bearing), against the
reactions of Roark's Formulas for Stress and Strain, 8th ed., table 8.1 (from memory):
1a/2a cantilever, 1e/2e simply supported, 1d/2d fixed-fixed, 1c/2c propped cantilever
(fixed at x = 0 here). Tolerance 1e-12 relative: the same closed forms."""

from __future__ import annotations

import pytest

from service.core.loading.actions import Action
from service.core.loading.bearing import NO_FORCES, bearing_forces

L = 2.0
P = 1000.0
W = 300.0   # N/m


@pytest.mark.parametrize("supports, at, reaction, unit_reaction", [
    # a point load P at a, b = L - a; reactions and the largest of 1 N/m over the span
    ("cantilever", 1.5, P, L),                                        # 1a, 2a: P; w L
    ("simply_supported", 0.5, P * 1.5 / L, L / 2),                    # 1e: P b / L; w L / 2
    ("fixed_fixed", 0.5, P * 1.5**2 * (3 * 0.5 + 1.5) / L**3, L / 2),  # 1d: P b^2 (3a + b) / L^3
    ("propped_cantilever", 1.0, P - P * 1.0**2 * (3 * L - 1.0) / (2 * L**3), 5 * L / 8),
    # 1c: R at the pinned end P a^2 (3L - a) / (2 L^3) (a from the fixed end); 2c: 5 w L / 8
])
def test_a_point_load_and_the_reactions_follow_the_handbook(supports, at, reaction,
                                                            unit_reaction):
    forces = bearing_forces(supports, L, [Action("force", P, at=at)])
    assert forces.force == P
    assert forces.offset == pytest.approx(min(at, L - at), rel=1e-12)
    assert forces.reaction == pytest.approx(reaction, rel=1e-12)
    assert forces.unit_reaction == pytest.approx(unit_reaction, rel=1e-12)


def test_distributed_loads_give_reactions_only():
    # simply supported, w over [0, 1] of a 2 m span: R_0 = w a (L - a / 2) / L (statics)
    forces = bearing_forces("simply_supported", L, [Action("distributed", W, start=0.0, end=1.0)])
    assert forces.force == 0.0 and forces.offset == float("inf")
    assert forces.reaction == pytest.approx(W * 1.0 * (L - 0.5) / L, rel=1e-12)


def test_an_attached_mass_bears_as_its_weight_and_an_upward_force_counts_by_size():
    # 10 kg at 0.4 m (98.0665 N, ISO 80000-3 g) and 50 N upward at 1.2 m, simply supported
    forces = bearing_forces("simply_supported", L, [Action("mass", 10.0, at=0.4),
                                                    Action("force", -50.0, at=1.2)])
    assert forces.force == pytest.approx(98.0665, rel=1e-12)
    assert forces.offset == pytest.approx(0.4, rel=1e-12)
    # R_L = (98.0665 x 0.4 - 50 x 1.2) / 2; R_0 = 98.0665 - 50 - R_L
    right = (98.0665 * 0.4 - 50.0 * 1.2) / L
    assert forces.reaction == pytest.approx(max(abs(48.0665 - right), abs(right)), rel=1e-12)


def test_nothing_transverse_bears_nothing():
    assert NO_FORCES.force == NO_FORCES.reaction == NO_FORCES.unit_reaction == 0.0
    forces = bearing_forces("cantilever", L, [Action("torque", 10.0, at=L)])
    assert (forces.force, forces.reaction) == (0.0, 0.0)
