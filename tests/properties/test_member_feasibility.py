"""Every returned general-member design meets its requirements, rechecked independently.

Hypothesis draws general members (any supports, point forces, partial distributed loads,
torques, an axial force, attached masses, self-weight, deflection and frequency limits) and
sizes solid rounds and round tubes of a few ductile built-in materials. Each design is then
rechecked here from its rounded dimensions with nothing from the sizing engine:

- section properties of a circle and an annulus written out (Roark's Formulas for Stress and
  Strain, 8th ed., table A.1, from memory), the elementary peak transverse shear stress
  V Q / (I b) (Gere & Goodno, Mechanics of Materials, section 5.9, from memory);
- bending moment, shear and deflection from PyCBA (Caprani, direct stiffness method, a
  test-only dependency), plus the Timoshenko shear deflection (M(x) - M(0) - c x) / (k G A)
  with Cowper's k (the integral of V / (k G A) from a support; Timoshenko & Gere, Mechanics of
  Materials, sec. 9.11, from memory), with the attached masses' weights and the self-weight
  rho A g as loads, at 6400 stations; the torque by statics (a member restrained in twist at
  both ends shares a torque T at a as T (L - a) / L and T a / L, Gere & Goodno section 3.8);
- von Mises at both outer fibres and at the neutral axis of every station (Shigley's
  Mechanical Engineering Design, 10th ed., eq. 5-15), each against the strength of its
  normal stress's sign (the compressive strength where the data give a lower one), and the
  neutral-axis shear against the shear strength;
- the first bending frequency by a finite-element eigen analysis of our own (Hermite cubic
  beam elements with consistent mass, Przemieniecki, Theory of Matrix Structural Analysis,
  1968, from memory; the point masses lumped at their nodes), which converges from above:
  it must reach the requirement that Dunkerley's estimate (a lower bound) was sized for.

Tolerances: stresses 1e-6 relative (PyCBA's moment and shear are exact; the stations only
sample, so a sampled peak can only be lower than the engine's exact one); deflection 1e-4
(PyCBA integrates the curvature numerically: 4e-6 of the peak at 6400 stations, see
tests/validation/test_loading_pycba.py); frequency 1e-3 (the finite-element model's
discretisation, from above).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import HealthCheck, assume, given, settings
from hypothesis import strategies as st

from service.core.loading.actions import Action
from service.core.materials import load_builtin, select
from service.core.sizing import DesignRequest, size_designs

pycba = pytest.importorskip("pycba")
scipy_linalg = pytest.importorskip("scipy.linalg")

GRAVITY = 9.80665  # ISO 80000-3 standard acceleration of gravity, m/s^2
TABLE = select(load_builtin(), ids=["s355j2", "al_6061_t6", "ti_6al_4v_annealed", "pa66_gf30",
                                    "mg_az31b_h24"])
"""Ductile materials; the wrought magnesium's compressive yield is below its tensile one
(its compressed fibres are judged against it)."""
RESTRAINTS = {
    # PyCBA restraint vector [v_0, theta_0, v_L, theta_L]: -1 fixed, 0 free
    "cantilever": [-1, -1, 0, 0],
    "simply_supported": [-1, 0, -1, 0],
    "fixed_fixed": [-1, -1, -1, -1],
    "propped_cantilever": [-1, -1, -1, 0],
}


def magnitudes(low, high):
    """Values from low to high, zero or at least 1e-3 in size (no subnormal loads)."""
    return st.floats(low, high).map(lambda v: 0.0 if abs(v) < 1e-3 else v)


@st.composite
def members(draw):
    supports = draw(st.sampled_from(list(RESTRAINTS)))
    span = draw(st.floats(0.3, 3.0))
    position = st.floats(0.0, 1.0).map(lambda f: min(round(f * span, 6), span))
    # point forces and masses inside the span: one at a support goes straight into it, where
    # PyCBA's first station would still count it as shear in the member
    inside = st.floats(0.01, 0.99).map(lambda f: round(f * span, 6))
    actions = [Action("force", draw(magnitudes(-3000.0, 3000.0)), at=draw(inside))
               for _ in range(draw(st.integers(1, 3)))]
    for _ in range(draw(st.integers(0, 2))):
        start, end = sorted((draw(position), draw(position)))
        assume(end - start > 1e-3)
        actions.append(Action("distributed", draw(magnitudes(-2000.0, 2000.0)), start=start,
                              end=end))
    for _ in range(draw(st.integers(0, 2))):
        actions.append(Action("torque", draw(magnitudes(-200.0, 200.0)), at=draw(position)))
    if draw(st.booleans()):
        actions.append(Action("axial", draw(magnitudes(0.0, 5000.0))))
    for _ in range(draw(st.integers(0, 2))):
        actions.append(Action("mass", draw(magnitudes(0.0, 3.0)), at=draw(inside)))
    return DesignRequest(
        "member", span=span, supports=supports, actions=tuple(actions),
        twist_free_at_right_end=supports != "cantilever" and draw(st.booleans()),
        max_deflection=draw(st.one_of(st.none(), st.floats(100.0, 500.0).map(
            lambda ratio: span / ratio))),
        min_frequency=draw(st.one_of(st.none(), st.floats(2.0, 60.0))),
        safety_factor=draw(st.floats(1.0, 2.0)), self_weight=draw(st.booleans()),
        sections=("solid_round", "round_tube"))


def _section(design):
    """(A, I, Z, Q torsion, peak shear stress per newton of V) of a circle or an annulus."""
    if design.family == "solid_round":
        outer, inner = design.dimensions["diameter"] / 2, 0.0
    else:
        outer = design.dimensions["outer_diameter"] / 2
        inner = outer - design.dimensions["wall"]
    area = math.pi * (outer**2 - inner**2)
    second_moment = math.pi * (outer**4 - inner**4) / 4
    first_moment = 2.0 / 3.0 * (outer**3 - inner**3)       # of the half section
    shear_per_newton = first_moment / (second_moment * 2.0 * (outer - inner))
    return area, second_moment, second_moment / outer, 2 * second_moment / outer, \
        shear_per_newton


def _cowper_area(design, nu: float) -> float:
    """k A of a circle or an annulus with Cowper's k (J. Appl. Mech. 33, 1966, table 1, from
    memory): 6 (1 + nu) (1 + m^2)^2 / ((7 + 6 nu)(1 + m^2)^2 + (20 + 12 nu) m^2), m the ratio
    of the radii (0 for the circle)."""
    area, *_ = _section(design)
    if design.family == "solid_round":
        m2 = 0.0
    else:
        outer = design.dimensions["outer_diameter"]
        m2 = ((outer - 2 * design.dimensions["wall"]) / outer) ** 2
    return 6 * (1 + nu) * (1 + m2) ** 2 / ((7 + 6 * nu) * (1 + m2) ** 2
                                           + (20 + 12 * nu) * m2) * area


def _torque(request: DesignRequest, x: np.ndarray) -> np.ndarray:
    """Largest |T| at each station, taking both sides of a torque's position (statics)."""
    torques = [(a.at, a.value) for a in request.actions if a.kind == "torque"]
    both_ends = request.supports != "cantilever" and not request.twist_free_at_right_end
    right_reaction = -sum(t * a / request.span for a, t in torques) if both_ends else 0.0
    after = right_reaction + sum(np.where(a > x, t, 0.0) for a, t in torques)
    # the side before x = 0 is outside the member (a torque there goes into the support)
    before = right_reaction + sum(np.where((a >= x) & (x > 0), t, 0.0) for a, t in torques)
    return np.maximum(np.abs(after), np.abs(before))


def _frequency(request: DesignRequest, rigidity: float, mass_per_length: float) -> float:
    """First bending frequency, Hz, of a Hermite beam-element model with lumped masses."""
    span = request.span
    masses = [(a.at, a.value) for a in request.actions if a.kind == "mass"]
    # a node at every mass (moving the nearest mesh node there instead could move one node
    # twice for two close masses, shifting the first mass); the regular nodes within 0.3 of
    # an element of a mass node are left out, so no element is much shorter than the mesh's
    # (a 1.1e-4 L element next to a regular node put the frequency 3-7 % low: the eigenproblem
    # lost its conditioning); a mass within 1e-4 of the span of another mass or of an end
    # sits on it (the shift moves the frequency by under 1e-4)
    regular = np.linspace(0.0, span, 81)
    placed = [0.0, span]
    for at, _ in masses:
        if np.min(np.abs(np.array(placed) - at)) > 1e-4 * span:
            placed.append(at)
    spacing = span / 80
    keep = [x for x in regular[1:-1]
            if np.min(np.abs(np.array(placed) - x)) > 0.3 * spacing]
    nodes = np.unique(np.array(placed + keep))
    count = len(nodes)
    stiffness = np.zeros((2 * count, 2 * count))
    mass = np.zeros_like(stiffness)
    for e in range(count - 1):
        h = nodes[e + 1] - nodes[e]
        if h <= 0:
            continue
        k = rigidity / h**3 * np.array([
            [12, 6 * h, -12, 6 * h], [6 * h, 4 * h * h, -6 * h, 2 * h * h],
            [-12, -6 * h, 12, -6 * h], [6 * h, 2 * h * h, -6 * h, 4 * h * h]])
        m = mass_per_length * h / 420 * np.array([
            [156, 22 * h, 54, -13 * h], [22 * h, 4 * h * h, 13 * h, -3 * h * h],
            [54, 13 * h, 156, -22 * h], [-13 * h, -3 * h * h, -22 * h, 4 * h * h]])
        dofs = [2 * e, 2 * e + 1, 2 * e + 2, 2 * e + 3]
        stiffness[np.ix_(dofs, dofs)] += k
        mass[np.ix_(dofs, dofs)] += m
    for at, value in masses:
        node = int(np.argmin(np.abs(nodes - at)))
        mass[2 * node, 2 * node] += value
    v0, t0, vl, tl = RESTRAINTS[request.supports]
    fixed = [dof for dof, held in ((0, v0), (1, t0), (2 * count - 2, vl), (2 * count - 1, tl))
             if held]
    free = [dof for dof in range(2 * count) if dof not in fixed]
    values = scipy_linalg.eigh(stiffness[np.ix_(free, free)], mass[np.ix_(free, free)],
                               eigvals_only=True, subset_by_index=[0, 0])
    return math.sqrt(values[0]) / (2 * math.pi)


@settings(max_examples=25, deadline=None,
          suppress_health_check=[HealthCheck.too_slow, HealthCheck.filter_too_much])
@given(members())
def test_every_member_design_meets_its_requirements(member):
    loads = [a for a in member.actions if a.kind != "mass" and a.value != 0]
    assume(loads)
    result = size_designs(member, TABLE)
    failures = []
    for design in result.designs:
        index = list(TABLE.ids).index(design.material_id)
        e = float(TABLE.values("youngs_modulus")[index])
        rho = float(TABLE.values("density")[index])
        strength = float(TABLE.values("strength")[index])
        # a compressed point against the compressive strength where the data give a lower one
        compressive = min(strength, float(np.nan_to_num(
            TABLE.values("compressive_strength")[index], nan=strength)))
        shear_strength = float(TABLE.shear_strength()[index])
        area, second_moment, modulus, torsion_modulus, shear_per_newton = _section(design)
        load_matrix = []
        for a in member.actions:
            if a.kind == "force":
                load_matrix.append([1, 2, a.value, a.at, 0])
            elif a.kind == "mass" and a.value > 0:
                load_matrix.append([1, 2, a.value * GRAVITY, a.at, 0])
            elif a.kind == "distributed":
                load_matrix.append([1, 3, a.value, a.start, a.end - a.start])
        if member.self_weight:
            load_matrix.append([1, 1, rho * area * GRAVITY, 0, 0])
        analysis = pycba.BeamAnalysis([member.span], e * second_moment,
                                      RESTRAINTS[member.supports], load_matrix)
        analysis.analyze(npts=6400)
        lines = analysis.beam_results.results
        x, moment, shear, deflection = (np.asarray(v)[1:-1] for v in (
            lines.x, lines.M, lines.V, lines.D))
        # Timoshenko: the shear deflection (M(x) - M(0) - c x) / (k G A), y_s = 0 at the
        # supports (c = 0 on a cantilever), in PyCBA's sign (up positive, sagging M positive)
        full_x, full_moment = np.asarray(lines.x), np.asarray(lines.M)
        chord = (0.0 if member.supports == "cantilever"
                 else (full_moment[-1] - full_moment[0]) / (full_x[-1] - full_x[0]))
        deflection = deflection - (moment - full_moment[0] - chord * x) / (
            float(TABLE.values("shear_modulus")[index]) * _cowper_area(
                design, float(TABLE.values("poisson_ratio")[index])))
        axial = sum(a.value for a in member.actions if a.kind == "axial")
        tau_torsion = _torque(member, x) / torsion_modulus
        tau_shear = np.abs(shear) * shear_per_newton
        points = [(axial / area + np.abs(moment) / modulus, tau_torsion),
                  (axial / area - np.abs(moment) / modulus, tau_torsion),
                  (np.full_like(moment, axial / area), tau_torsion + tau_shear)]
        von_mises = max((np.sqrt(normal**2 + 3 * shear**2)
                         / np.where(normal < 0, compressive, strength)).max()
                        for normal, shear in points)
        factor = member.safety_factor
        checks = {
            "von Mises": factor * von_mises,
            "shear": factor * (tau_torsion + tau_shear).max() / shear_strength,
        }
        if member.max_deflection is not None:
            checks["deflection"] = np.abs(deflection).max() / member.max_deflection / (
                1 + 1e-4)
        if member.min_frequency is not None:
            frequency = _frequency(member, e * second_moment, rho * area)
            checks["frequency"] = member.min_frequency / frequency / (1 + 1e-3)
            checks["frequency vs Dunkerley"] = design.frequency / frequency / (1 + 1e-3)
        for name, ratio in checks.items():
            if ratio > 1 + 1e-6:
                failures.append(f"{design.material_id} {design.family} {design.dimensions}: "
                                f"{name} {ratio:.6g}")
        if max(u for u in design.utilization.values() if u is not None) > 1.0:
            failures.append(f"{design.material_id} {design.family}: {design.utilization}")
    assert not failures, (repr(member), failures)
