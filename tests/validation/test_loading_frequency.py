"""First bending frequency against an independent finite-element eigen-analysis.

Reference: a model of our own written here, knowing nothing of service.core.loading: 60 cubic
Hermite beam elements with consistent mass matrices (Przemieniecki, Theory of Matrix
Structural Analysis, 1968, ch. 11, from memory) plus the point masses lumped at nodes, solved
with scipy.linalg.eigh. The element model converges from above as h^4; with this mesh it is
within 1e-7 of the exact first frequency of a uniform member, up to the round-off of the
generalised eigenproblem (rotational masses ~h^3), which with numpy 2.4 and scipy 1.17 puts
the cantilever 1.7e-7 below it (40, 60 and 80 elements: +2.9e-8, -1.7e-7, -2.8e-7; the first
test, tolerance 3e-7). Finer meshes do not help: with 240 elements round-off already costs
3e-5.

Dunkerley's formula must lie below the reference and Rayleigh's quotient above it (their
published sides), with a round-off margin of 1e-7; the gaps are also bounded: Dunkerley
within 12 %, Rayleigh within 2 % on these cases (measured worst gaps over the four supports:
Dunkerley 8.7 % low, Rayleigh 1.3 % high, both on fixed-fixed members; printed with -s).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
import scipy.linalg
import scipy.optimize

from service.core.loading.actions import SUPPORTS, Action, member_loading
from service.core.loading.frequency import (
    FIRST_EIGENVALUES,
    attached_mass_terms,
    dunkerley_frequency,
    rayleigh_frequency,
    uniform_frequency,
)

ELEMENTS = 60
FIXED = {
    # supports -> restrained degrees of freedom (node, 0 = deflection / 1 = rotation)
    "cantilever": lambda n: [(0, 0), (0, 1)],
    "simply_supported": lambda n: [(0, 0), (n, 0)],
    "fixed_fixed": lambda n: [(0, 0), (0, 1), (n, 0), (n, 1)],
    "propped_cantilever": lambda n: [(0, 0), (0, 1), (n, 0)],
}


def _lowest_frequency(supports, n, k, m, masses):
    """Lowest frequency, Hz, of n equal two-node elements (element matrices k and m over
    (deflection, rotation) at each end), point masses on the deflections, the supports'
    degrees of freedom removed (scipy.linalg.eigh)."""
    size = 2 * (n + 1)
    stiffness, mass = np.zeros((size, size)), np.zeros((size, size))
    for e in range(n):
        stiffness[2 * e: 2 * e + 4, 2 * e: 2 * e + 4] += k
        mass[2 * e: 2 * e + 4, 2 * e: 2 * e + 4] += m
    for node, value in masses:
        mass[2 * node, 2 * node] += value
    fixed = {2 * node + dof for node, dof in FIXED[supports](n)}
    free = [i for i in range(size) if i not in fixed]
    eigenvalues = scipy.linalg.eigh(stiffness[np.ix_(free, free)], mass[np.ix_(free, free)],
                                    eigvals_only=True, subset_by_index=[0, 0])
    return math.sqrt(eigenvalues[0]) / (2 * math.pi)


def fe_first_frequency(supports, span, rigidity, mass_per_length, masses=()):
    """Lowest frequency, Hz, of the element model; ``masses`` are (node index, kg) pairs."""
    n, h = ELEMENTS, span / ELEMENTS
    k = rigidity / h**3 * np.array(
        [[12, 6 * h, -12, 6 * h], [6 * h, 4 * h * h, -6 * h, 2 * h * h],
         [-12, -6 * h, 12, -6 * h], [6 * h, 2 * h * h, -6 * h, 4 * h * h]])
    m = mass_per_length * h / 420 * np.array(
        [[156, 22 * h, 54, -13 * h], [22 * h, 4 * h * h, 13 * h, -3 * h * h],
         [54, 13 * h, 156, -22 * h], [-13 * h, -3 * h * h, -22 * h, 4 * h * h]])
    return _lowest_frequency(supports, n, k, m, masses)


def test_first_eigenvalues_solve_their_frequency_equations():
    """beta L from the characteristic equations (Blevins 1979, table 8-1), solved by brentq."""
    equations = {
        "cantilever": (lambda b: math.cos(b) * math.cosh(b) + 1, 1.0, 3.0),
        "simply_supported": (math.sin, 2.0, 4.0),
        "fixed_fixed": (lambda b: math.cos(b) * math.cosh(b) - 1, 4.0, 5.5),
        "propped_cantilever": (lambda b: math.tan(b) - math.tanh(b), 3.5, 4.5),
    }
    for supports, (equation, low, high) in equations.items():
        root = scipy.optimize.brentq(equation, low, high, xtol=1e-14)
        assert math.isclose(FIRST_EIGENVALUES[supports], root, rel_tol=1e-9), supports


@pytest.mark.parametrize("supports", SUPPORTS)
def test_uniform_member_matches_finite_elements(supports):
    span, rigidity, mass_per_length = 1.7, 2.3e4, 3.1
    ours = float(uniform_frequency(supports, span, rigidity, mass_per_length))
    reference = fe_first_frequency(supports, span, rigidity, mass_per_length)
    assert math.isclose(ours, reference, rel_tol=3e-7), (ours, reference)


@pytest.mark.parametrize("supports", SUPPORTS)
def test_attached_masses_are_bracketed_by_dunkerley_and_rayleigh(supports):
    rng = np.random.default_rng(7)
    span, rigidity = 1.2, 5.0e3
    mismatches, worst = [], {"dunkerley": 0.0, "rayleigh": 0.0}
    for trial in range(8):
        mass_per_length = float(rng.uniform(0.05, 3.0))
        nodes = rng.choice(np.arange(1, ELEMENTS + 1), size=rng.integers(1, 4), replace=False)
        values = rng.uniform(0.05, 2.0, nodes.size)
        actions = [Action("mass", float(v), at=float(node * span / ELEMENTS))
                   for node, v in zip(nodes, values, strict=True)]
        terms = attached_mass_terms(member_loading(supports, [span], [actions]))
        reference = fe_first_frequency(supports, span, rigidity, mass_per_length,
                                       zip(nodes, values, strict=True))
        lower = float(dunkerley_frequency(terms, rigidity, mass_per_length)[0])
        upper = float(rayleigh_frequency(terms, rigidity, mass_per_length)[0])
        worst["dunkerley"] = max(worst["dunkerley"], 1 - lower / reference)
        worst["rayleigh"] = max(worst["rayleigh"], upper / reference - 1)
        if not lower <= reference * (1 + 1e-7):
            mismatches.append(f"trial {trial}: Dunkerley {lower:.6g} above FE {reference:.6g}")
        if not upper >= reference * (1 - 1e-7):
            mismatches.append(f"trial {trial}: Rayleigh {upper:.6g} below FE {reference:.6g}")
        if lower < 0.88 * reference or upper > 1.02 * reference:
            mismatches.append(f"trial {trial}: bracket [{lower:.6g}, {upper:.6g}] too wide "
                              f"around FE {reference:.6g}")
    print(supports, "worst gaps", worst)
    assert not mismatches, mismatches


def test_one_mass_on_a_light_member_is_exact_in_both():
    """A single mass on a nearly massless member is one degree of freedom: both estimates
    equal sqrt(k / m) / 2 pi with k = 1 / delta (simply supported, mid-span:
    k = 48 E I / L^3, Roark table 8.1 case 1e)."""
    span, rigidity, mass = 2.0, 1.0e4, 5.0
    loading = member_loading("simply_supported", [span], [[Action("mass", mass, at=1.0)]])
    terms = attached_mass_terms(loading)
    exact = math.sqrt(48 * rigidity / span**3 / mass) / (2 * math.pi)
    for estimate in (dunkerley_frequency, rayleigh_frequency):
        assert math.isclose(float(estimate(terms, rigidity, 1e-9)[0]), exact, rel_tol=1e-6)


def test_broadcasts_over_designs_and_cases():
    loading = member_loading("cantilever", [1.0, 1.5],
                             [[Action("mass", 1.0, at=1.0)], [Action("mass", 0.5, at=0.7)]])
    terms = attached_mass_terms(loading)
    rigidity = np.array([[1e3], [2e3], [4e3]])  # three designs x two cases
    assert dunkerley_frequency(terms, rigidity, 0.4).shape == (3, 2)
    assert rayleigh_frequency(terms, rigidity, np.full((3, 2), 0.4)).shape == (3, 2)


@pytest.mark.parametrize(("supports", "at", "stiffness", "effective"), [
    ("cantilever", 1.0, 3.0, 33.0 / 140.0),
    ("simply_supported", 0.5, 48.0, 17.0 / 35.0),
])
def test_rayleigh_effective_mass_of_the_classic_cases(supports, at, stiffness, effective):
    """Worked closed forms: a mass M at the tip of a cantilever or the middle of a simply
    supported member of mass m L vibrates at sqrt(k / (M + c m L)) / 2 pi with k = 3 E I / L^3,
    c = 33/140 and k = 48 E I / L^3, c = 17/35 (Rayleigh's method with the point-load shape;
    Thomson & Dahleh, Theory of Vibration with Applications, 5th ed., ch. 2, effective mass,
    from memory). Our shape also carries the member's own weight, a change of order
    m L / M = 0.1 in the shape, so of order 0.01 in the stationary quotient's second-order
    error: measured 9e-6, tolerance 2e-5. Dunkerley stays below."""
    span, rigidity, mass = 1.0, 1.0e3, 1.0
    mass_per_length = 0.1 * mass / span
    terms = attached_mass_terms(member_loading(supports, [span], [[Action("mass", mass,
                                                                          at=at)]]))
    classic = math.sqrt(stiffness * rigidity / span**3 / (mass + effective * mass_per_length
                                                           * span)) / (2 * math.pi)
    ours = float(rayleigh_frequency(terms, rigidity, mass_per_length)[0])
    assert math.isclose(ours, classic, rel_tol=2e-5)
    assert float(dunkerley_frequency(terms, rigidity, mass_per_length)[0]) < classic


@pytest.mark.parametrize("supports", SUPPORTS)
def test_rayleigh_integrals_obey_maxwell_betti(supports):
    """Reciprocity (Maxwell-Betti): the work of 1 N/m through the masses' deflection line,
    integral P dx, equals the work of the masses' weights through the 1 N/m line,
    sum m_i U(a_i). Two different computations (Gauss integration over the pieces, point
    values), so the check is not circular; tolerance 1e-12 (exact quadrature)."""
    loading = member_loading(supports, [1.3, 2.0], [
        [Action("mass", 0.7, at=0.4), Action("mass", 1.9, at=1.3)],
        [Action("mass", 2.5, at=1.1)],
    ])
    terms = attached_mass_terms(loading)
    np.testing.assert_allclose(terms.uniform_masses, terms.masses_on_uniform, rtol=1e-12)


# Timoshenko members: shear deformation and rotary inertia. Reference: a second model of our
# own, 400 two-node Timoshenko elements (linear w and psi, the shear strain integrated at one
# point to avoid locking: Hughes, The Finite Element Method, 1987, sec. 5.3, from memory) with
# consistent translational and rotary masses. Measured against the exact simply supported
# frequency equation (below) it is within 2e-5; tolerance for Dunkerley's side 1e-4.
TIMOSHENKO_ELEMENTS = 400


def fe_timoshenko_frequency(supports, span, rigidity, shear_rigidity, mass_per_length,
                            rotary_inertia, masses=()):
    """Lowest frequency, Hz, of the Timoshenko element model; ``masses``: (node, kg)."""
    n, h = TIMOSHENKO_ELEMENTS, span / TIMOSHENKO_ELEMENTS
    bending = rigidity / h * np.array([[0, 0, 0, 0], [0, 1, 0, -1], [0, 0, 0, 0],
                                       [0, -1, 0, 1]], dtype=float)
    strain = np.array([-1 / h, -0.5, 1 / h, -0.5])
    k = bending + shear_rigidity * h * np.outer(strain, strain)
    line = h / 6 * np.array([[2, 1], [1, 2]], dtype=float)
    m = np.zeros((4, 4))
    m[np.ix_([0, 2], [0, 2])] = mass_per_length * line
    m[np.ix_([1, 3], [1, 3])] = rotary_inertia * line
    return _lowest_frequency(supports, n, k, m, masses)


def exact_simply_supported_timoshenko(span, rigidity, shear_rigidity, mass_per_length,
                                      rotary_inertia):
    """First frequency, Hz, of a simply supported Timoshenko member: with the mode
    w = sin(k x), psi = cos(k x), k = pi / L, the lower root in omega^2 of
    (m' w^2 - S k^2)(J w^2 - E I k^2 - S) = S^2 k^2 (Han, Benaroya & Wei, J. Sound Vib. 225,
    1999, sec. 6, from memory)."""
    k = math.pi / span
    a = mass_per_length * rotary_inertia
    b = -(mass_per_length * (rigidity * k**2 + shear_rigidity)
          + rotary_inertia * shear_rigidity * k**2)
    c = shear_rigidity * k**2 * rigidity * k**2
    omega_squared = (-b - math.sqrt(b * b - 4 * a * c)) / (2 * a)
    return math.sqrt(omega_squared) / (2 * math.pi)


def _stocky_member(rng):
    """A steel-like solid rectangle of span / depth 3 to 20 (E 200 GPa, G 77 GPa, rho 7850,
    Cowper's k 0.85 of a rectangle at nu 0.3)."""
    span = float(rng.uniform(0.5, 3.0))
    depth = span / float(rng.uniform(3.0, 20.0))
    width = depth * float(rng.uniform(0.3, 1.0))
    area, second_moment = width * depth, width * depth**3 / 12
    return (span, 200e9 * second_moment, 0.85 * 77e9 * area, 7850 * area,
            7850 * second_moment)


def test_timoshenko_element_model_meets_the_exact_simply_supported_frequency():
    rng = np.random.default_rng(11)
    for _ in range(4):
        member = _stocky_member(rng)
        exact = exact_simply_supported_timoshenko(*member)
        assert fe_timoshenko_frequency("simply_supported", *member) == pytest.approx(
            exact, rel=2e-5)


@pytest.mark.parametrize("supports", SUPPORTS)
def test_dunkerley_with_shear_and_rotary_inertia_stays_below_a_timoshenko_member(supports):
    """Dunkerley's sum with the shear and rotary inertia terms (module docstring of
    service.core.loading.frequency) lies below the Timoshenko element model for stocky
    members (span / depth 3 to 20) with and without masses, and within 20 % of it (measured
    worst gaps, printed with -s: cantilever 2.5 %, simply supported 5.5 %, propped 6.9 %,
    fixed-fixed 14.9 %; Dunkerley's sum is loosest where the modes differ most)."""
    rng = np.random.default_rng(7)
    mismatches, worst = [], 0.0
    for trial in range(6):
        span, rigidity, shear_rigidity, mass_per_length, rotary = _stocky_member(rng)
        nodes = rng.choice(np.arange(1, TIMOSHENKO_ELEMENTS + 1), size=rng.integers(0, 3),
                           replace=False)
        values = rng.uniform(0.2, 2.0, nodes.size) * mass_per_length * span
        actions = [Action("mass", float(v), at=float(node * span / TIMOSHENKO_ELEMENTS))
                   for node, v in zip(nodes, values, strict=True)]
        terms = attached_mass_terms(member_loading(supports, [span], [actions]))
        reference = fe_timoshenko_frequency(supports, span, rigidity, shear_rigidity,
                                            mass_per_length, rotary,
                                            zip(nodes, values, strict=True))
        ours = float(dunkerley_frequency(terms, rigidity, mass_per_length, shear_rigidity,
                                         rigidity / rotary * mass_per_length)[0])
        worst = max(worst, 1 - ours / reference)
        if not ours <= reference * (1 + 1e-4):
            mismatches.append(f"trial {trial}: ours {ours:.6g} above FE {reference:.6g}")
        if ours < 0.80 * reference:
            mismatches.append(f"trial {trial}: ours {ours:.6g} far below FE {reference:.6g}")
    print(supports, "worst gap", worst)
    assert not mismatches, mismatches
