"""The smallest scale whose bearing check holds, at fixed proportions (the ``bearing`` row
of :func:`service.core.sizing.scale.scale_bounds`; the check itself:
:mod:`service.core.sizing.checks.bearing`).

Each force term asks (F + F' s^2) SF <= F_R(s): F the unfactored force, F' s^2 the
self-weight's share of a reaction (rho a g s^2 per metre times the unit reaction), F_R the
resistance of the section at scale s.

- Patch loading (I-sections, boxes) with a knife edge (s_s = 0, and c = 0 at an end) is
  homogeneous of degree 2 at fixed proportions: F_cr = 0.9 k_F E t_w^3 / h_w ~ s^2, the
  yield length l_y ~ s, lambda_F scale-free, so F_R = F_R(1) s^2 and the row is the closed
  root of :func:`~service.core.sizing.scale.shear_scale` (the same form as the transverse
  shear's). With s_s > 0 (or a force at a distance c from an end: s_s + c in type (c)) it is
  not, but F_R grows with s_s, and the clause caps s_s at h_w: F_R lies between the
  homogeneous resistances with s_s = 0 and with s_s = h_w, whose closed roots bracket the
  scale. Where the lower root already passes it is the answer (the usual case of a point
  load far from the ends); elsewhere a vectorised bisection on log s closes the bracket
  (:data:`BISECTION_STEPS`), keeping the upper (passing) end.
- Local crushing of round tubes, f t^2 s_s / R, is homogeneous of degree 1 (s_s fixed):
  F' SF s^2 - F_R(1) s + F SF <= 0, whose smaller root is closed.
"""

from __future__ import annotations

import numpy as np

from service.core.loadcases import STANDARD_GRAVITY
from service.core.sizing.checks.bearing import HOMOGENEOUS_DEGREE, RESISTANCES, requested
from service.core.sizing.demand import Demand
from service.core.sizing import scale as closed_forms
from service.core.sizing.values import MaterialValues

BISECTION_STEPS = 24
"""Halvings of the log-scale bracket between the two homogeneous roots (whose ratio is
below 4 for any practical proportions): 4^(2^-24) - 1, under 1e-7 of the scale."""


def bearing_scale(family_id: str, unit_dims: dict, area, materials: MaterialValues | None,
                  density, demand: Demand) -> np.ndarray | None:
    """The smallest scale whose bearing check holds (the largest over the force terms), or
    None where the family has no bearing check here or the request no transverse force.
    ``unit_dims``: the sections at scale 1; ``area``: their area (m^2 at scale 1)."""
    if family_id not in RESISTANCES or materials is None or not requested(demand):
        return None
    resistance = RESISTANCES[family_id]
    factor = np.asarray(demand.safety_factor, dtype=float)
    bearing = np.asarray(demand.bearing_length, dtype=float)
    offset = np.asarray(demand.bearing_offset, dtype=float)
    weight = (np.asarray(density) * area * STANDARD_GRAVITY if demand.self_weight else 0.0)
    force = np.asarray(demand.bearing_force, dtype=float)
    reaction = np.asarray(demand.bearing_reaction, dtype=float)
    terms = (   # (F, F', end distance: None within the span)
        (force, 0.0, None),
        (force, 0.0, offset),
        (reaction, np.asarray(demand.bearing_unit_reaction) * weight, 0.0),
    )
    scales = []
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        for constant, per_scale2, distance in terms:

            def capacity(scale, length, distance=distance):
                dims = {name: np.asarray(value) * scale for name, value in unit_dims.items()}
                return resistance(dims, materials, length, distance)

            if HOMOGENEOUS_DEGREE[family_id] == 1:
                scale = _linear_scale(capacity(1.0, bearing) / factor, per_scale2, constant)
            else:
                scale = _patch_scale(capacity, bearing, distance, factor, per_scale2,
                                     constant)
            # no force in this term: it asks nothing
            scales.append(np.where((constant == 0) & (np.asarray(per_scale2) == 0), 0.0,
                                   scale))
    return np.maximum.reduce(scales)


def _patch_scale(capacity, bearing, distance, factor, per_scale2, constant) -> np.ndarray:
    """The patch loading term's scale (see the module doc)."""
    def root(length):
        return closed_forms.shear_scale(capacity(1.0, length) / factor, per_scale2, constant)

    upper = root(0.0)
    effective = bearing + (0.0 if distance is None else distance)
    if not np.any(effective > 0):
        return upper
    lower = np.minimum(root(np.inf), upper)

    def passes(scale):
        with np.errstate(divide="ignore", invalid="ignore"):
            need = (constant + per_scale2 * scale**2) * factor
            return need <= capacity(scale, bearing)

    done = (lower >= upper) | passes(lower) | ~np.isfinite(upper)
    high = np.where(done, np.where(passes(lower), lower, upper), upper)
    if np.all(done):
        return high
    low = np.log(np.where(done, high, lower))
    high = np.log(high)
    for _ in range(BISECTION_STEPS):
        middle = 0.5 * (low + high)
        ok = passes(np.exp(middle))
        high = np.where(ok, middle, high)
        low = np.where(ok, low, middle)
    return np.exp(high)


def _linear_scale(capacity, per_scale2, constant) -> np.ndarray:
    """Smallest s with (F + F' s^2) <= C s: the smaller root of F' s^2 - C s + F = 0, in
    its cancellation-free form 2 F / (C + sqrt(C^2 - 4 F' F)); ``inf`` where none."""
    with np.errstate(divide="ignore", invalid="ignore"):
        discriminant = capacity**2 - 4.0 * per_scale2 * constant
        root = 2.0 * constant / (capacity + np.sqrt(np.maximum(discriminant, 0.0)))
        return np.where((discriminant >= 0) & (capacity > 0), root,
                        np.where(np.asarray(constant) > 0, np.inf, 0.0))
