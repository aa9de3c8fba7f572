"""General member internal actions against PyCBA, an independent continuous-beam library.

PyCBA (Caprani, https://github.com/ccaprani/pycba, test-only dependency) solves a beam by the
direct stiffness method with its own load and sign handling: moments sagging positive (as
ours), shear V = dM/dx (as ours), displacement positive up (ours positive down). Random sets
of point forces and partial uniform loads on each support set are compared at PyCBA's own
output stations for bending moment, shear and deflection (E I = 1). Moment and shear are
exact in both, so their tolerance is round-off: 1e-7 of the largest value of the diagram.
PyCBA integrates the curvature numerically over its stations (scipy; a point load between
stations puts a kink inside a step), so its deflection carries a discretisation error that
shrinks with the station count towards ours: measured on these cases, up to 1e-3 of the
peak with 400 stations, 7e-5 with 1600, 4e-6 with 6400 (its error grows along the span, as
an integration drift does; ours meets y(L) = 0 exactly). With 6400 stations the deflection
tolerance is 1e-5 of the peak. Every mismatch is reported, not only the first.
"""

from __future__ import annotations

import numpy as np
import pytest

from service.core.loading.actions import Action, member_loading
from service.core.loading.internal import internal_actions

pycba = pytest.importorskip("pycba")

RESTRAINTS = {
    # PyCBA restraint vector [v_0, theta_0, v_L, theta_L]: -1 fixed, 0 free
    "cantilever": [-1, -1, 0, 0],
    "simply_supported": [-1, 0, -1, 0],
    "fixed_fixed": [-1, -1, -1, -1],
    "propped_cantilever": [-1, -1, -1, 0],
}


def _random_case(rng):
    span = float(rng.uniform(0.5, 6.0))
    actions, load_matrix = [], []
    for _ in range(rng.integers(1, 5)):
        at, value = float(rng.uniform(0.0, span)), float(rng.uniform(-5e3, 5e3))
        actions.append(Action("force", value, at=at))
        load_matrix.append([1, 2, value, at, 0])  # span 1, point load, value, position
    for _ in range(rng.integers(0, 3)):
        start, end = sorted(float(v) for v in rng.uniform(0.0, span, 2))
        value = float(rng.uniform(-2e3, 2e3))
        actions.append(Action("distributed", value, start=start, end=end))
        load_matrix.append([1, 3, value, start, end - start])  # partial UDL: w, a, length c
    return span, actions, load_matrix


@pytest.mark.parametrize("supports", list(RESTRAINTS))
def test_random_load_sets_match_pycba(supports):
    rng = np.random.default_rng(2026)
    mismatches = []
    for trial in range(12):
        span, actions, load_matrix = _random_case(rng)
        analysis = pycba.BeamAnalysis([span], 1.0, RESTRAINTS[supports], load_matrix)
        analysis.analyze(npts=6400)
        reference = analysis.beam_results.results
        # PyCBA pads each end with a zero plotting point; point-load stations are where its
        # shear takes one side or the other, so shear is compared away from them
        x = reference.x[1:-1]
        ours = internal_actions(member_loading(supports, [span], [actions]), x)
        away = np.ones_like(x, dtype=bool)
        for action in actions:
            if action.kind == "force":
                away &= np.abs(x - action.at) > 1e-9 * span
        for name, mine, theirs, where, relative in (
            ("moment", ours.moment[0], reference.M[1:-1], slice(None), 1e-7),
            ("shear", ours.shear[0], reference.V[1:-1], away, 1e-7),
            ("deflection", ours.deflection_times_stiffness[0], -reference.D[1:-1], slice(None),
             1e-5),
        ):
            tolerance = relative * np.abs(theirs).max()
            worst = np.abs(mine[where] - theirs[where]).max()
            if worst > tolerance:
                mismatches.append(f"trial {trial} {name}: worst difference {worst:.3g} "
                                  f"> {tolerance:.3g}")
    assert not mismatches, mismatches
