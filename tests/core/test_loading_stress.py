"""Combined stress at the governing points, against closed forms for a solid round shaft.

For a solid round of diameter d, Z = pi d^3 / 32 and Q = pi d^3 / 16 (every strength of
materials text), so with bending M and torque T at the outer fibre:

- von Mises: 16 / (pi d^3) sqrt(4 M^2 + 3 T^2) (Shigley's Mechanical Engineering Design,
  10th ed., section 7-4, from memory);
- maximum principal: 16 / (pi d^3) (M + sqrt(M^2 + T^2)) (Mohr's circle; the classic
  "equivalent bending moment" of shaft design).

Exact, so the tolerance is round-off (1e-12 relative).
"""

from __future__ import annotations

import math

import numpy as np

from service.core.loading.actions import Action, member_loading
from service.core.loading.internal import internal_actions
from service.core.loading.segments import cut, moment_peaks, shear_peaks
from service.core.loading.stress import (
    combined_utilization,
    peak_principal,
    peak_von_mises,
    point_stresses,
    principal_stresses,
    von_mises,
)


def _round(diameter):
    area = math.pi * diameter**2 / 4
    return area, math.pi * diameter**3 / 32, math.pi * diameter**3 / 16


def test_shaft_bending_and_torsion_closed_forms():
    d, moment, torque = 0.03, 150.0, 90.0
    area, z, q = _round(d)
    stresses = point_stresses(moment, torque, 0.0, 0.0, area, z, q)
    scale = 16 / (math.pi * d**3)
    assert math.isclose(float(peak_von_mises(stresses)),
                        scale * math.sqrt(4 * moment**2 + 3 * torque**2), rel_tol=1e-12)
    sigma_1, sigma_2 = peak_principal(stresses)
    assert math.isclose(float(sigma_1), scale * (moment + math.hypot(moment, torque)),
                        rel_tol=1e-12)
    assert math.isclose(float(sigma_2), -scale * (moment + math.hypot(moment, torque)),
                        rel_tol=1e-12)


def test_pure_shear_and_pure_tension():
    assert math.isclose(float(von_mises(0.0, 1.0)), math.sqrt(3.0))
    np.testing.assert_allclose(principal_stresses(0.0, 5.0), (5.0, -5.0))
    np.testing.assert_allclose(principal_stresses(8.0, 0.0), (8.0, 0.0))


def test_neutral_axis_governs_a_short_beam_in_shear():
    """With V large and M small the neutral-axis point (torsion + transverse shear) governs."""
    area, z, q = _round(0.02)
    tau_v = 4.0 / 3.0 * 5000.0 / area  # solid round peak transverse shear, 4 V / (3 A)
    stresses = point_stresses(1.0, 20.0, 0.0, tau_v, area, z, q)
    assert math.isclose(float(peak_von_mises(stresses)), math.sqrt(3.0) * (20.0 / q + tau_v),
                        rel_tol=1e-12)


def test_rule_follows_the_brittle_flag_and_compressive_strength():
    area, z, q = 1e-4, 1e-6, 2e-6
    stresses = point_stresses(0.0, 0.0, -1e4, 0.0, area, z, q)  # 100 MPa compression
    ratios = combined_utilization(stresses, strength=np.array([200e6, 50e6]),
                                  safety_factor=2.0, brittle=np.array([False, True]),
                                  compressive_strength=np.array([200e6, 400e6]))
    # ductile: von Mises 100 / 200 * 2 = 1.0; brittle: compression 100 / 400 * 2 = 0.5
    np.testing.assert_allclose(ratios, [1.0, 0.5], rtol=1e-12)
    tension = point_stresses(0.0, 0.0, 1e4, 0.0, area, z, q)
    assert math.isclose(float(combined_utilization(tension, 50e6, 1.0, True)), 2.0)


def test_combined_stress_peak_is_found_piece_by_piece():
    """The largest von Mises stress along a member (dense sampling, 20001 points) equals the
    worst piece's, each piece judged by its largest |M| (outer fibre) and |V| (neutral axis)
    with its T and N (to the sampling's first-order error)."""
    rng = np.random.default_rng(3)
    area, z, q, shear_area = 3e-4, 4e-6, 8e-6, 2e-4
    for supports in ("cantilever", "simply_supported", "fixed_fixed", "propped_cantilever"):
        actions = []
        for _ in range(20):
            span = 2.0
            case = [Action("force", rng.uniform(-3e3, 3e3), at=rng.uniform(0, span))
                    for _ in range(3)]
            case.append(Action("distributed", rng.uniform(-2e3, 2e3), start=0.3, end=1.6))
            case += [Action("torque", rng.uniform(-400, 400), at=rng.uniform(0, span))
                     for _ in range(2)]
            case.append(Action("axial", rng.uniform(-2e4, 2e4)))
            actions.append(case)
        loading = member_loading(supports, np.full(20, 2.0), actions)

        def stress(moment, shear, torque, axial):
            return peak_von_mises(point_stresses(moment, torque, axial,
                                                 np.abs(shear) / shear_area, area, z, q))

        pieces, _ = cut(loading)
        per_piece = stress(moment_peaks(pieces)[0], shear_peaks(pieces)[0], pieces.torque,
                           pieces.axial)
        worst = per_piece.max(axis=1)
        lines = internal_actions(loading, np.linspace(0, 2.0, 20001))
        dense = stress(lines.moment, lines.shear, lines.torque, lines.axial).max(axis=1)
        assert np.all(dense <= worst * (1 + 1e-12)), supports
        assert np.all(dense >= worst * (1 - 1e-3)), supports
