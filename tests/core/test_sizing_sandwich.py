"""Sandwich panels (service.core.sizing.sandwich) against classical sandwich theory."""


from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import HealthCheck, given, reject, settings
from hypothesis import strategies as st
from sizing_cases import BENDING, numbers

from service.core.errors import InputError
from service.core.materials import load_builtin
from service.core.materials.form_limits import form_limit_of
from service.core.sections import FAMILIES
from service.core.sizing import DesignRequest, size_designs
from service.core.sizing.demand import Demand, demand_of
from service.core.sizing.engine import default_cores, made_in
from service.core.sizing.fields import at_contract_paths
from service.core.sizing.manufacturing import limited_demand
from service.core.sizing.request import validate_request
from service.core.sizing.sandwich import SandwichRun
from service.core.sizing.values import MaterialValues

TABLE = load_builtin()


def test_sandwich_panel_meets_classical_sandwich_theory(table, pick):
    """A sized panel rechecked with Allen (1969), Analysis and Design of Structural Sandwich
    Panels, ch. 2 and 8 (from memory), written out here: D = E_f b t d^2/2 + E_f b t^3/6 +
    E_c b c^3/12, S = G_c b d^2/c, deflection 5 W L^3/(384 D) + W L/(8 S) (simply supported,
    uniform), face stress M E_f (c/2 + t)/D, core shear V/(b d), wrinkling 0.5 (E_f E_c G_c)^(1/3)
    on the face mid-plane stress. Tolerance 1e-9 (round-off)."""
    request = DesignRequest("simply_supported_uniform_load", span=2.0, load=2000.0,
                            max_deflection=0.008, safety_factor=1.5, max_width=0.4,
                            sections=("sandwich_panel",))
    faces = pick(table, "al_6061_t6", "cfrp_qi_sm")
    cores = pick(table, "pvc_foam_100", "pmi_foam_75")
    result = size_designs(request, faces, cores)
    assert len(result.designs) == 2
    for design in result.designs:
        f = {n: float(faces.values(n)[design.material_index]) for n in
             ("youngs_modulus", "strength")}
        k = design.core_material_index
        c_ = {n: float(cores.values(n)[k]) for n in ("youngs_modulus", "shear_modulus",
                                                    "density")}
        core_shear_strength = float(cores.shear_strength()[k])
        b, c, t = (design.dimensions[n] for n in ("width", "core_thickness", "face_thickness"))
        d = c + t
        rigidity = f["youngs_modulus"] * b * (t * d**2 / 2 + t**3 / 6) + c_["youngs_modulus"] * (
            b * c**3 / 12)
        shear_stiffness = c_["shear_modulus"] * b * d**2 / c
        deflection = 5 * 2000.0 * 2.0**3 / (384 * rigidity) + 2000.0 * 2.0 / (8 * shear_stiffness)
        moment, shear = 2000.0 * 2.0 / 8, 2000.0 / 2
        face_stress = moment * f["youngs_modulus"] * (c / 2 + t) / rigidity
        wrinkling = 0.5 * (f["youngs_modulus"] * c_["youngs_modulus"] * c_["shear_modulus"]) ** (
            1 / 3)
        assert b == 0.4
        assert math.isclose(design.deflection, deflection, rel_tol=1e-9)
        assert deflection <= 0.008 * (1 + 1e-12)
        assert face_stress * 1.5 <= f["strength"]
        assert shear / (b * d) * 1.5 <= core_shear_strength
        assert moment * f["youngs_modulus"] * d / 2 / rigidity * 1.5 <= wrinkling
        assert design.core_material_id in cores.ids


def test_sandwich_needs_a_width(table, pick):
    # Named without a width, the panel is impossible: a 422 on the envelope's max_width.
    request = DesignRequest("cantilever_end_load", span=1.0, load=100.0,
                            sections=("sandwich_panel",))
    with pytest.raises(InputError) as caught:
        size_designs(request, pick(table, "al_6061_t6"))
    assert "sandwich_panel" in at_contract_paths(caught.value).errors["envelope.max_width"][0]
    # Taken by default, it is a rejection with the reason.
    default = DesignRequest("cantilever_end_load", span=1.0, load=100.0)
    (rejection,) = [r for r in size_designs(default, pick(table, "al_6061_t6")).rejected
                    if r.family == "sandwich_panel"]
    assert "max_width" in rejection.reason
    assert rejection.shortfall == math.inf


def test_a_panel_too_deep_for_the_envelope_says_by_how_much(table, pick):
    """The rejection names the overall depth the panel needs, and its shortfall is that depth
    over max_depth (what a sweep's reason uses to name the closest material)."""
    request = DesignRequest("simply_supported_uniform_load", span=3.0, load=5000.0,
                            max_deflection=0.005, max_depth=0.01, max_width=0.3,
                            sections=("sandwich_panel",))
    (rejection,) = size_designs(request, pick(table, "al_6061_t6")).rejected
    needed = float(rejection.reason.rsplit("at least ", 1)[1].split()[0])
    assert rejection.shortfall == pytest.approx(needed / 0.01, rel=5e-3)   # printed to 3 digits
    assert rejection.shortfall > 1.0


def _sandwich_run(request: DesignRequest, every_core: bool = False) -> SandwichRun:
    """The run the engine builds for the request's sandwich panels over every built-in face
    material, with every row sized (and with ``every_core``, every core refined)."""
    family = FAMILIES["sandwich_panel"]
    indices = np.flatnonzero(made_in(TABLE, family.id))
    limits = [form_limit_of(TABLE, int(index), family.id) for index in indices]
    demand = limited_demand(Demand.stack([demand_of(request)]), family, limits)
    run = SandwichRun.begin(family, indices, MaterialValues.from_table(
        TABLE, request.property_basis), default_cores(), demand, request.objective,
        request.property_basis)
    if every_core:
        run.floor[:] = -np.inf
    run.size(np.arange(len(indices)))
    return run


@settings(max_examples=25, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(st.sampled_from(BENDING).flatmap(lambda case: st.tuples(st.just(case), numbers(case))),
       st.booleans(), st.sampled_from(["none", "continuous"]),
       st.sampled_from(["mass", "cost"]))
def test_pruning_cores_and_rows_loses_no_panel(drawn, self_weight, restraint, objective):
    """What lets the engine leave rows and cores out: no face material's panel has an
    objective below its row's bound (SandwichRun.lower), and refining only the cores whose
    bound is below the row's lightest grid panel finds the same panel as refining every
    core. Random requests, every built-in face material and foam core."""
    load_case, values = drawn
    request = DesignRequest(load_case, self_weight=self_weight, lateral_restraint=restraint,
                            objective=objective, sections=("sandwich_panel",),
                            **{**values, "max_width": values["max_width"] or 0.1})
    try:
        validate_request(request)
    except InputError:
        reject()                     # an impossible request: not an example of the claim
    run = _sandwich_run(request)
    found = run.feasible()[0]
    objective_value = run.objective()[0]
    assert np.all(objective_value[found] >= run.lower()[0][found])
    every_core = _sandwich_run(request, every_core=True)
    assert np.array_equal(every_core.feasible()[0], found)
    assert np.array_equal(every_core.objective()[0], objective_value)
