"""An independent bearing check of a design from its rounded dimensions, for the property
tests: the forces written out here (a shorthand case's point load and reactions, from the
statics of Roark's Formulas for Stress and Strain, 8th ed., table 8.1, from memory; a general
member's from its actions by equilibrium), the resistances straight from the section
library's bearing functions (each checked clause by clause in
tests/validation/test_bearing_reference.py).

The reading of the service's documented choices, restated: every point force both as
EN 1993-1-5 type (a) and type (c) with s_s + c (c: its distance to the nearer end), the
smaller resistance; every support reaction type (c) with c = 0; webs of an orthotropic
material with E2 and f E2 / E1; no flange hinges in a brittle material; round tubes the
larger of EN 1993-1-8's plate resistance and the ring mechanism.
"""

from __future__ import annotations

import math

import numpy as np

from service.core.sections import bearing

GRAVITY = 9.80665  # ISO 80000-3 standard acceleration of gravity, m/s^2

SHORTHAND = {
    # case -> (point force position as a fraction of the span, or None; largest reaction
    # / load; largest reaction of a uniform load / its total)
    "cantilever_end_load": (1.0, 1.0, 1.0),
    "cantilever_uniform_load": (None, 1.0, 1.0),
    "simply_supported_center_load": (0.5, 0.5, 0.5),
    "simply_supported_uniform_load": (None, 0.5, 0.5),
    "fixed_fixed_center_load": (0.5, 0.5, 0.5),
    "fixed_fixed_uniform_load": (None, 0.5, 0.5),
}


def material(table, row: int, basis: str) -> dict:
    """E and f for the webs' bearing, and whether the material is brittle."""
    def value(name):
        return float(table.values(name, basis)[row])
    youngs, transverse = value("youngs_modulus"), value("transverse_modulus")
    across = youngs if math.isnan(transverse) else min(transverse, youngs)
    strength, compressive = value("strength"), value("compressive_strength")
    if not math.isnan(compressive):
        strength = min(strength, compressive)
    return {"youngs": across, "strength": strength * across / youngs,
            "brittle": bool(table.brittle[row])}


def resistance(family: str, dims: dict, values: dict, length: float,
               end_distance: float | None) -> float:
    """The family's bearing resistance, N (type (a) where ``end_distance`` is None)."""
    youngs, strength, brittle = values["youngs"], values["strength"], values["brittle"]
    if family == "round_tube":
        return float(bearing.round_tube_bearing(dims, strength, length, brittle))
    web = (bearing.i_section_web_bearing if family == "i_section"
           else bearing.rectangular_tube_web_bearing)
    if end_distance is None:
        return float(web(dims, youngs, strength, length, False, not brittle))
    return float(web(dims, youngs, strength, length + end_distance, True, not brittle))


def bearing_ratio(family: str, dims: dict, values: dict, length: float, factor: float,
                  forces: list[tuple[float, float]], reactions: list[float]) -> float:
    """The largest F SF / F_R over ``forces`` ((force, distance to the nearer end)) and the
    support ``reactions``."""
    ratios = [0.0]
    # a search may pass walls too thick for the section (no web left): no resistance
    with np.errstate(divide="ignore", invalid="ignore"):
        for force, distance in forces:
            if force:
                resist = min(resistance(family, dims, values, length, None),
                             resistance(family, dims, values, length, distance))
                ratios.append(abs(force) * factor / resist)
        end = resistance(family, dims, values, length, 0.0)
        ratios += [abs(reaction) * factor / end for reaction in reactions if reaction]
    return math.inf if any(math.isnan(r) for r in ratios) else max(ratios)


def shorthand_forces(case: str, span: float, load: float, weight: float):
    """(forces, reactions) of a shorthand case with its total self-weight ``weight`` (N)."""
    position, reaction, weight_reaction = SHORTHAND[case]
    forces = [] if position is None else [(load, min(position, 1.0 - position) * span)]
    return forces, [reaction * load + weight_reaction * weight]
