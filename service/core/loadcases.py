"""Beam and shaft load cases: peak moment, shear, deflection and twist as coefficients.

A bending case is four numbers (Roark's Formulas for Stress and Strain, 8th ed., table 8.1,
cases 1a, 2a (uniform over the whole span), 1e/2e and 1d/2d with fixed ends; the same values
are in Young & Budynas and every strength-of-materials text, from memory):

    max bending moment   M       = moment_coefficient * P * L
    max shear force      V       = shear_coefficient * P
    max deflection       delta_b = deflection_coefficient * P * L^3 / (E * I)
    shear deflection     delta_s = shear_deflection_coefficient * P * L / S

P is the point load, or the total load W = w * L for uniform cases (N); L the span (m); E I the
bending stiffness (N m^2); S the shear stiffness of a sandwich beam (N). The shear-deflection
coefficients are those of Allen, Analysis and Design of Structural Sandwich Panels (1969),
and Zenkert, The Handbook of Sandwich Construction (1997), table of B_2 values (from memory):
delta_s = P L / (B_2 S) with B_2 = 1, 2, 4, 8, 4, 8 for the six bending cases below.

Self-weight is a uniform load on the same supports (:attr:`LoadCase.self_weight_case`) added by
superposition. That is exact for the peak values because both maxima sit at the same section in
each pair: cantilever root moment/shear and tip deflection; simply supported mid-span moment and
deflection with shear at the supports; fixed-fixed support moment (P L / 8 under a central load
equals the mid-span value, W L / 12 under a uniform load exceeds its mid-span W L / 24), mid-span
deflection and shear at the supports.

Torsion of a shaft fixed at one end with torque T at the other: twist = T L / (G K) and peak
shear stress T / Q (Saint-Venant torsion; K and Q from the section family).

A tie carries an axial tension P (stress P / A, extension P L / (E A)), a column an axial
compression P (its member buckling in ``service.core.stability.columns``); neither has moment
coefficients.

Every function broadcasts its array arguments, so a leading case axis (many loads or spans)
works unchanged.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Literal

import numpy as np

STANDARD_GRAVITY = 9.80665
"""g_n, m/s^2: standard acceleration of gravity (ISO 80000-3, conventional value)."""

Loading = Literal["bending", "torsion", "tension", "compression"]


@dataclass(frozen=True)
class LoadCase:
    """One load case as coefficients of the standard formulas (see the module docstring).

    Attributes:
        id: the contract's load case type, e.g. ``"cantilever_end_load"``.
        loading: ``"bending"``, ``"torsion"``, ``"tension"`` (a tie) or ``"compression"``
            (a column).
        description: one line for listings.
        moment_coefficient: c_M, dimensionless: max M = c_M P L (N m).
        shear_coefficient: c_V, dimensionless: max V = c_V P (N).
        deflection_coefficient: c_D, dimensionless: max deflection = c_D P L^3 / (E I) (m).
        shear_deflection_coefficient: c_S, dimensionless: shear deflection = c_S P L / S (m).
        self_weight_case: id of the uniform case on the same supports (self-weight), or None.
        source: where the coefficients come from.
    """

    id: str
    loading: Loading
    description: str
    moment_coefficient: float
    shear_coefficient: float
    deflection_coefficient: float
    shear_deflection_coefficient: float
    self_weight_case: str | None
    source: str

    @property
    def uniform(self) -> LoadCase:
        """The uniform case on the same supports, which carries the self-weight (bending
        cases only: a case without one raises ValueError)."""
        if self.self_weight_case is None:
            raise ValueError(f"{self.id} has no uniform case for self-weight")
        return LOAD_CASES[self.self_weight_case]


_ROARK = "Roark's Formulas for Stress and Strain, 8th ed., table 8.1 (from memory)"
_ALLEN = "shear deflection: Allen (1969) / Zenkert (1997) B_2 coefficients (from memory)"

LOAD_CASES: dict[str, LoadCase] = {
    case.id: case
    for case in (
        LoadCase(
            "cantilever_end_load", "bending", "cantilever with a point load at the free end",
            1.0, 1.0, 1.0 / 3.0, 1.0, "cantilever_uniform_load", f"{_ROARK}, case 1a; {_ALLEN}",
        ),
        LoadCase(
            "cantilever_uniform_load", "bending", "cantilever with a uniform load, total W",
            0.5, 1.0, 1.0 / 8.0, 0.5, "cantilever_uniform_load", f"{_ROARK}, case 2a; {_ALLEN}",
        ),
        LoadCase(
            "simply_supported_center_load", "bending", "simply supported, point load at mid-span",
            0.25, 0.5, 1.0 / 48.0, 0.25, "simply_supported_uniform_load",
            f"{_ROARK}, case 1e; {_ALLEN}",
        ),
        LoadCase(
            "simply_supported_uniform_load", "bending", "simply supported, uniform load, total W",
            0.125, 0.5, 5.0 / 384.0, 0.125, "simply_supported_uniform_load",
            f"{_ROARK}, case 2e; {_ALLEN}",
        ),
        LoadCase(
            "fixed_fixed_center_load", "bending", "both ends fixed, point load at mid-span",
            0.125, 0.5, 1.0 / 192.0, 0.25, "fixed_fixed_uniform_load",
            f"{_ROARK}, case 1d; {_ALLEN}",
        ),
        LoadCase(
            "fixed_fixed_uniform_load", "bending", "both ends fixed, uniform load, total W",
            1.0 / 12.0, 0.5, 1.0 / 384.0, 0.125, "fixed_fixed_uniform_load",
            f"{_ROARK}, case 2d; {_ALLEN}",
        ),
        LoadCase(
            "torsion", "torsion", "shaft fixed at one end, torque T at the other",
            0.0, 0.0, 0.0, 0.0, None,
            "Saint-Venant torsion: twist T L / (G K), peak shear stress T / Q (common practice)",
        ),
        LoadCase(
            "tie", "tension", "tie: axial tension P between its ends",
            0.0, 0.0, 0.0, 0.0, None,
            "axial stress P / A, extension P L / (E A) (Hooke's law; common practice)",
        ),
        LoadCase(
            "column", "compression", "column: axial compression P, with end conditions",
            0.0, 0.0, 0.0, 0.0, None,
            "squash load A f, Euler buckling about the weaker axis with the effective length "
            "factors of service.core.stability.columns, reduced by a published column curve",
        ),
    )
}
"""Load case id -> :class:`LoadCase`, in the contract's order."""


def get_load_case(case_id: str) -> LoadCase:
    """The load case with this id; ``KeyError`` if unknown (callers validate ids first)."""
    return LOAD_CASES[case_id]


def bending_moment(case: LoadCase, load, span):
    """Peak bending moment c_M P L, N m (arrays broadcast)."""
    return case.moment_coefficient * np.asarray(load, dtype=float) * np.asarray(span, dtype=float)


def shear_force(case: LoadCase, load):
    """Peak shear force c_V P, N."""
    return case.shear_coefficient * np.asarray(load, dtype=float)


def bending_deflection(case: LoadCase, load, span, youngs_modulus, second_moment):
    """Peak bending deflection c_D P L^3 / (E I), m."""
    span = np.asarray(span, dtype=float)
    return case.deflection_coefficient * np.asarray(load, dtype=float) * span**3 / (
        np.asarray(youngs_modulus, dtype=float) * np.asarray(second_moment, dtype=float)
    )


def shear_deflection(case: LoadCase, load, span, shear_stiffness):
    """Peak shear deflection c_S P L / S of a sandwich beam, m (S in N)."""
    return (
        case.shear_deflection_coefficient
        * np.asarray(load, dtype=float)
        * np.asarray(span, dtype=float)
        / np.asarray(shear_stiffness, dtype=float)
    )


def twist(torque, span, shear_modulus, torsion_constant):
    """Angle of twist T L / (G K), rad (Saint-Venant torsion)."""
    return (
        np.asarray(torque, dtype=float)
        * np.asarray(span, dtype=float)
        / (np.asarray(shear_modulus, dtype=float) * np.asarray(torsion_constant, dtype=float))
    )


def torsion_stress(torque, torsion_modulus):
    """Peak shear stress T / Q, Pa."""
    return np.asarray(torque, dtype=float) / np.asarray(torsion_modulus, dtype=float)


def self_weight_load(density, area, span):
    """Total self-weight rho A g L of a prismatic member, N (the W of a uniform case)."""
    return (
        np.asarray(density, dtype=float)
        * np.asarray(area, dtype=float)
        * STANDARD_GRAVITY
        * np.asarray(span, dtype=float)
    )


@dataclass(frozen=True)
class BendingResponse:
    """Peak response of a beam under its load case plus (optionally) its self-weight.

    Attributes:
        moment: peak bending moment, N m.
        shear: peak shear force, N.
        deflection: peak bending deflection (without the shear part), m.
    """

    moment: np.ndarray
    shear: np.ndarray
    deflection: np.ndarray


def bending_response(
    case: LoadCase, load, span, youngs_modulus, second_moment, self_weight=0.0
) -> BendingResponse:
    """Peaks of the case under ``load`` plus a uniform ``self_weight`` (total, N) by superposition.

    Valid because both peaks occur at the same section for every case and its uniform partner
    (see the module docstring).
    """
    uniform = case.uniform
    return BendingResponse(
        moment=bending_moment(case, load, span) + bending_moment(uniform, self_weight, span),
        shear=shear_force(case, load) + shear_force(uniform, self_weight),
        deflection=bending_deflection(case, load, span, youngs_modulus, second_moment)
        + bending_deflection(uniform, self_weight, span, youngs_modulus, second_moment),
    )
