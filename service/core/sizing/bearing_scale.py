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
- Round tubes (:func:`~service.core.sections.bearing.round_tube_bearing`) likewise: with a
  knife edge the plate joint resistance 5 k_p f t^2 ~ s^2 (closed root); with s_s > 0 the
  bracket runs from the resistance at s_s = 0 to that at the longest plate credited
  (eta = 4), the ring mechanism f t^2 s_s / R adding within it.
"""

from __future__ import annotations

import numpy as np

from service.core.loadcases import STANDARD_GRAVITY
from service.core.sizing import scale as closed_forms
from service.core.sizing.checks.bearing import RESISTANCES, requested
from service.core.sizing.demand import Demand
from service.core.sizing.values import MaterialValues

BISECTION_STEPS = 32
"""Halvings of the log-scale bracket (at most a factor 1 / :data:`BRACKET_FLOOR`): its
width ends below ln(4096) / 2^32, 2e-9 of the scale."""

BRACKET_FLOOR = 2.0**-12
"""The bracket's lower end is at least this fraction of its upper end (a bearing so long
that it alone carries the force at a smaller scale gives that scale, which passes)."""


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

            def capacity(scale, length, distance):
                dims = {name: np.asarray(value) * scale for name, value in unit_dims.items()}
                return resistance(dims, materials, length, distance)

            scale = _term_scale(capacity, bearing, distance, factor, per_scale2, constant)
            # no force in this term: it asks nothing
            scales.append(np.where((constant == 0) & (np.asarray(per_scale2) == 0), 0.0,
                                   scale))
    return np.maximum.reduce(scales)


def _term_scale(capacity, bearing, distance, factor, per_scale2, constant) -> np.ndarray:
    """One force term's scale (see the module doc)."""
    def root(length, distance):
        return closed_forms.shear_scale(capacity(1.0, length, distance) / factor, per_scale2,
                                        constant)

    end = None if distance is None else 0.0
    upper = root(0.0, end)
    if not np.any(bearing + (0.0 if distance is None else distance) > 0):
        return upper
    # the resistance with the longest bearing credited bounds it from above (a web's
    # s_s <= h_w, a tube's eta <= 4); never below the search's floor
    lower = np.minimum(np.maximum(root(np.inf, end), upper * BRACKET_FLOOR), upper)

    def passes(scale):
        with np.errstate(divide="ignore", invalid="ignore"):
            need = (constant + per_scale2 * scale**2) * factor
            return need <= capacity(scale, bearing, distance)

    at_lower = passes(lower)
    done = at_lower | ~(lower < upper)
    if np.all(done):
        return np.where(at_lower, lower, upper)
    low = np.log(np.where(done, upper, lower))
    high = np.log(upper)
    for _ in range(BISECTION_STEPS):
        middle = 0.5 * (low + high)
        ok = passes(np.exp(middle))
        high = np.where(ok, middle, high)
        low = np.where(ok, low, middle)
    return np.where(at_lower, lower, np.exp(high))
