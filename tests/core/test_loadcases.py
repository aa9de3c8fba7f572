"""Load case coefficients checked against an independent Euler-Bernoulli finite element solution.

The reference is a cubic Hermite beam element model (Przemieniecki, Theory of Matrix Structural
Analysis, 1968, ch. 5, from memory) solved with scipy.linalg. With nodal point loads and
consistent nodal loads for a uniform load, cubic elements reproduce the exact nodal deflections
and end moments of Euler-Bernoulli theory, so the comparison tolerance is 1e-9 relative
(round-off only). The FE model knows nothing of the coefficients in service.core.loadcases.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
import scipy.linalg

from service.core import loadcases
from service.core.loadcases import LOAD_CASES

BENDING = [c for c, case in LOAD_CASES.items() if case.loading == "bending"]

SUPPORTS = {
    # case prefix -> fixed degrees of freedom (node, 0 = deflection / 1 = rotation), node 0 and n
    "cantilever": lambda n: [(n, 0), (n, 1)],
    "simply_supported": lambda n: [(0, 0), (n, 0)],
    "fixed_fixed": lambda n: [(0, 0), (0, 1), (n, 0), (n, 1)],
}


def fe_beam_fields(support, uniform, span, load, stiffness, elements=40):
    """Signed nodal deflections, element end moments and shears (for superposition)."""
    n = elements
    h = span / n
    k = stiffness / h**3 * np.array(
        [[12, 6 * h, -12, 6 * h], [6 * h, 4 * h * h, -6 * h, 2 * h * h],
         [-12, -6 * h, 12, -6 * h], [6 * h, 2 * h * h, -6 * h, 4 * h * h]]
    )
    size = 2 * (n + 1)
    global_k = np.zeros((size, size))
    force = np.zeros(size)
    element_load = np.zeros((n, 4))
    if uniform:
        element_load[:] = load / span * np.array([h / 2, h * h / 12, h / 2, -h * h / 12])
    for e in range(n):
        global_k[2 * e: 2 * e + 4, 2 * e: 2 * e + 4] += k
        force[2 * e: 2 * e + 4] += element_load[e]
    if not uniform:
        # cantilever: load at the free end (node 0); otherwise at the mid-span node n / 2
        force[0 if support == "cantilever" else 2 * (n // 2)] += load
    fixed = [2 * node + dof for node, dof in SUPPORTS[support](n)]
    free = [i for i in range(size) if i not in fixed]
    u = np.zeros(size)
    u[free] = scipy.linalg.solve(global_k[np.ix_(free, free)], force[free])
    end_forces = np.array([k @ u[2 * e: 2 * e + 4] - element_load[e] for e in range(n)])
    # sign convention: moment at the element's left end is -M, right end +M (sagging positive)
    moments = np.concatenate([-end_forces[:, 1], end_forces[:, 3]])
    shears = np.concatenate([end_forces[:, 0], -end_forces[:, 2]])
    return u[0::2], moments, shears


def fe_peaks(support, uniform, span, load, stiffness):
    """Peak |deflection|, |moment| and |shear| from :func:`fe_beam_fields`."""
    fields = fe_beam_fields(support, uniform, span, load, stiffness)
    return [np.abs(field).max() for field in fields]


@pytest.mark.parametrize("case_id", BENDING)
def test_bending_coefficients_match_finite_elements(case_id):
    case = LOAD_CASES[case_id]
    support = case_id.rsplit("_", 2)[0]
    span, load, stiffness = 2.0, 1000.0, 5.0e4
    deflection, moment, shear = fe_peaks(support, case_id.endswith("uniform_load"), span, load,
                                         stiffness)
    mismatches = []
    for name, ours, reference in [
        ("deflection", loadcases.bending_deflection(case, load, span, stiffness, 1.0), deflection),
        ("moment", loadcases.bending_moment(case, load, span), moment),
        ("shear", loadcases.shear_force(case, load), shear),
    ]:
        if not math.isclose(float(ours), reference, rel_tol=1e-9):
            mismatches.append(f"{name}: ours {float(ours):.9g}, FE {reference:.9g}")
    assert not mismatches, mismatches


@pytest.mark.parametrize("case_id", BENDING)
def test_self_weight_superposition_matches_combined_finite_elements(case_id):
    """Peak of (case + self-weight) equals the sum of peaks: both maxima at the same section."""
    case = LOAD_CASES[case_id]
    support = case_id.rsplit("_", 2)[0]
    span, load, weight, stiffness = 2.0, 1000.0, 300.0, 5.0e4
    # the combined FE solution: superpose the signed fields of the two load cases
    point = fe_beam_fields(support, case_id.endswith("uniform_load"), span, load, stiffness)
    uniform = fe_beam_fields(support, True, span, weight, stiffness)
    combined = [np.abs(a + b).max() for a, b in zip(point, uniform, strict=True)]
    ours = loadcases.bending_response(case, load, span, stiffness, 1.0, self_weight=weight)
    for value, reference in zip(
        (ours.deflection, ours.moment, ours.shear), combined, strict=True
    ):
        assert math.isclose(float(value), reference, rel_tol=1e-9)


def test_textbook_values():
    """The best-known closed forms (every strength-of-materials text): 5/384, 1/48, 1/3, 1/8."""
    cases = LOAD_CASES
    assert cases["simply_supported_uniform_load"].deflection_coefficient == 5 / 384
    assert cases["simply_supported_center_load"].deflection_coefficient == 1 / 48
    assert cases["cantilever_end_load"].deflection_coefficient == 1 / 3
    assert cases["cantilever_uniform_load"].deflection_coefficient == 1 / 8
    assert cases["fixed_fixed_uniform_load"].moment_coefficient == 1 / 12


def test_shear_deflection_coefficients_integrate_the_shear_force():
    """delta_s = integral V v / S dx with the unit-load shear v (virtual work, Timoshenko beam).

    For the determinate cases the shear-force diagram is known by statics; for fixed-fixed the
    shear diagram equals the simply supported one by symmetry. Checked by trapezoidal
    integration over 20001 points, tolerance 1e-6 relative (discretisation).
    """
    x = np.linspace(0.0, 1.0, 20001)
    shear_diagrams = {
        "cantilever_end_load": (np.ones_like(x), np.ones_like(x)),
        "cantilever_uniform_load": (x, np.ones_like(x)),
        "simply_supported_center_load": (np.where(x < 0.5, 0.5, -0.5),) * 2,
        "simply_supported_uniform_load": (0.5 - x, np.where(x < 0.5, 0.5, -0.5)),
        "fixed_fixed_center_load": (np.where(x < 0.5, 0.5, -0.5),) * 2,
        "fixed_fixed_uniform_load": (0.5 - x, np.where(x < 0.5, 0.5, -0.5)),
    }
    for case_id, (shear, unit_shear) in shear_diagrams.items():
        reference = np.trapezoid(shear * unit_shear, x)
        ours = float(loadcases.shear_deflection(LOAD_CASES[case_id], 1.0, 1.0, 1.0))
        assert math.isclose(ours, reference, rel_tol=1e-6), case_id


def test_torsion_and_self_weight_formulas():
    # 1 kN m on 2 m of G = 80 GPa, K = 1e-6 m^4: 2000 / 8e4 = 0.025 rad (hand calculation)
    assert math.isclose(float(loadcases.twist(1000.0, 2.0, 80e9, 1e-6)), 0.025)
    assert math.isclose(float(loadcases.torsion_stress(1000.0, 1e-5)), 1e8)
    # steel 7850 kg/m^3, 0.01 m^2, 3 m: 7850*0.01*9.80665*3 = 2309.466 N (hand calculation)
    assert math.isclose(float(loadcases.self_weight_load(7850.0, 0.01, 3.0)), 2309.466075)
    assert loadcases.STANDARD_GRAVITY == 9.80665  # ISO 80000-3 conventional value


def test_broadcasts_over_a_case_axis():
    case = LOAD_CASES["cantilever_end_load"]
    loads = np.array([1.0, 2.0, 3.0])[:, None]
    spans = np.array([1.0, 2.0])[None, :]
    assert loadcases.bending_moment(case, loads, spans).shape == (3, 2)
