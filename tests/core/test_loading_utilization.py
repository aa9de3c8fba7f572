"""Strength and fatigue utilization over designs x cases, recomputed independently.

The strength check is recomputed design by design from the member solved again with the
design's own weight as a distributed load, sampled densely (20001 stations), with the stress
rule written out here; the fatigue check against hand calculations and Shigley's DE-Goodman
shaft equation (10th ed., eq. 7-8, from memory), tolerance 1e-12 where the result is exact.
"""

from __future__ import annotations

import math

import numpy as np

from service.core.loadcases import STANDARD_GRAVITY
from service.core.loading.actions import Action, combine, member_loading, uniform_load
from service.core.loading.internal import internal_actions
from service.core.loading.segments import cut
from service.core.loading.utilization import (
    SectionArrays,
    fatigue_utilization,
    strength_utilization,
)


def _round_sections(diameters):
    d = np.asarray(diameters, dtype=float)[:, None]  # designs x 1 (broadcast over cases)
    area = math.pi * d**2 / 4
    return SectionArrays(area=area, section_modulus=math.pi * d**3 / 32,
                         torsion_modulus=math.pi * d**3 / 16, shear_area=0.75 * area,
                         mass_per_length=7850.0 * area)


def test_strength_utilization_matches_a_dense_recomputation():
    rng = np.random.default_rng(11)
    spans = np.array([1.0, 1.5, 2.0, 0.8])
    actions = [[Action("force", rng.uniform(-2e3, 2e3), at=rng.uniform(0, s)),
                Action("distributed", rng.uniform(-1e3, 1e3), start=0.1 * s, end=0.7 * s),
                Action("torque", rng.uniform(-200, 200), at=rng.uniform(0, s)),
                Action("axial", rng.uniform(-5e3, 5e3))] for s in spans]
    diameters = [0.02, 0.035, 0.05]
    section = _round_sections(diameters)
    strength, safety = 250e6, 1.5
    for supports in ("cantilever", "simply_supported", "fixed_fixed", "propped_cantilever"):
        loading = member_loading(supports, spans, actions)
        ours = strength_utilization(*cut(loading), section, strength, safety, False,
                                    self_weight=True)
        assert ours.shape == (3, 4)
        for i, d in enumerate(diameters):
            area, z, q = math.pi * d**2 / 4, math.pi * d**3 / 32, math.pi * d**3 / 16
            weight = uniform_load(supports, spans, 7850.0 * area * STANDARD_GRAVITY)
            lines = internal_actions(combine(loading, weight),
                                     spans[:, None] * np.linspace(0, 1, 20001))
            axial, bending = lines.axial / area, np.abs(lines.moment) / z
            torsion = np.abs(lines.torque) / q
            fibre = np.sqrt((np.abs(axial) + bending) ** 2 + 3 * torsion**2)
            neutral = np.sqrt(axial**2 + 3 * (torsion + np.abs(lines.shear) / (0.75 * area))**2)
            reference = safety * np.maximum(fibre, neutral).max(axis=1) / strength
            assert np.all(reference <= ours[i] * (1 + 1e-12)), (supports, d)
            assert np.all(reference >= ours[i] * (1 - 1e-3)), (supports, d)


def test_reversed_tip_force_with_steady_axial_by_hand():
    """Cantilever, reversed tip force P, steady tension N: sigma_a = P L / Z, sigma_m = N / A
    at the root; Goodman n (sigma_a / S_f + sigma_m / S_ut)."""
    span, force, axial = 0.5, 300.0, 2e4
    actions = [[Action("force", force, at=span, cyclic="reversed"), Action("axial", axial)]]
    parts = [cut(member_loading("cantilever", [span], actions, part))
             for part in ("mean", "alternating")]
    section = _round_sections([0.025])
    ours = fatigue_utilization(*parts, section, 200e6, 600e6, 2.0, rotating=False)
    sigma_a = force * span / float(section.section_modulus[0, 0])
    sigma_m = axial / float(section.area[0, 0])
    assert math.isclose(float(ours[0, 0]), 2.0 * (sigma_a / 200e6 + sigma_m / 600e6),
                        rel_tol=1e-12)


def test_rotating_shaft_at_the_de_goodman_diameter_is_fully_used():
    span, force, torque = 0.6, 4000.0, 300.0
    ultimate, endurance, safety = 690e6, 230e6, 1.8
    actions = [[Action("force", force, at=0.2), Action("torque", torque, at=0.2),
                Action("torque", -torque, at=0.5)]]
    parts = [cut(member_loading("simply_supported", [span], actions, part,
                                twist_free_at_right_end=True))
             for part in ("mean", "alternating")]
    moment = force * 0.2 * 0.4 / span
    d = (16 * safety / math.pi * (2 * moment / endurance
                                  + math.sqrt(3) * torque / ultimate)) ** (1 / 3)
    ours = fatigue_utilization(*parts, _round_sections([d]), endurance, ultimate, safety,
                               rotating=True)
    assert math.isclose(float(ours[0, 0]), 1.0, rel_tol=1e-12)
