"""The search over a family's proportions, for all materials at once.

Fix the proportions p (the ratio dimensions of :attr:`SectionFamily.ratio_bounds`) and every
requirement gives the smallest scale in closed form (:mod:`service.core.sizing.scale`). The
best p per material is then found by:

1. a log-spaced grid over the ratio bounds, ends included (:mod:`service.core.search`),
   evaluated for every material at once (arrays materials x proportions); a material with
   no feasible grid point continues from its least-violating one, which may reach a
   feasible design between grid points or, failing that, names the reason;
2. for one ratio, a stencil of shrinking steps around each material's best point;
3. for two or three ratios, the active-set gradient projection of
   :mod:`service.core.sizing.polish` from the lightest local minima of the grid
   (:data:`STARTS`), because the optimum usually lies on a ridge or a vertex where several
   bounds are equal (stiffness and local buckling with the envelope, say), which a stencil
   cannot follow. The polish works on the smooth terms of the bounds
   (:attr:`ScaleBounds.parts`: each buckling mode apart, bending and shear strength apart)
   and on the smooth margins of the family's geometry rules (a wall under
   half the width), so it can land on the vertex where they meet.

Demands with arrays of shape (C, 1, 1) (a leading case axis) give results of shape (C, M, ...).
The grid is evaluated over (C, M, grid points) at once, so everything that depends on the
material and the proportions alone is computed once for every case; then each (case, material)
element continues as a row of its own (case-major, with its own demand, fields of shape
(R, 1)). Every element's search therefore depends on its own inputs alone: a case gives the
same result to the bit whichever cases and materials share the arrays.
"""

from __future__ import annotations

import dataclasses
import math
from dataclasses import dataclass

import numpy as np

from service.core.search import RatioBox, zoom
from service.core.sections.base import SectionFamily
from service.core.sizing.checks.member_buckling import applies
from service.core.sizing.demand import Demand
from service.core.sizing.polish import polish
from service.core.sizing.scale import BOUND_FIELDS, ScaleBounds
from service.core.sizing.unit_bounds import (
    along,
    bounds_at,
    pick_point,
    pressed,
    section_bounds,
    unit_dimensions,
    unit_section,
)
from service.core.sizing.values import MaterialValues

FIRST_GRID_POINTS = {1: 65, 2: 17, 3: 9}
"""Points per ratio axis of the first grid, by the number of ratio dimensions. The grid only
has to start each material in the right basin: the polish follows ridges and lands on
vertices of the bounds. 17 (not 11) per axis for two ratios keep small feasible regions
(a member that barely carries its own weight) from falling between grid points."""

STARTS = {1: 1, 2: 3, 3: 4}
"""Most grid points each material's polish starts from, by the number of ratio dimensions
(see :func:`_starts`; the starts after the first only where the grid shows another basin
near the first's mass): a local search from the single best grid point can end in the wrong
basin (the I-section's landscape has several once flange and web modes and min_wall
compete; a box's too, deep and thin-walled against squat). With two I-section starts and
one box start (and no polish from the box's lateral edge), hypothesis' search for failures
of tests/validation/test_search_brute_force.py found designs up to 34 % heavier than a dense
grid's lightest on small members where min_wall governs, and a box without a design where
the grid has one. Over 40 random requests per family of that test's generator, those left
2 boxes (up to 2.9 %) and 1 I-section (4.0 %) more than 0.2 % heavier; these starts and that
polish, 1 box (5 %, one the earlier search missed as well) and no I-section."""

START_MARGIN = 1.3
"""A start after a row's first is polished only where its grid mass is at most this factor of
the first's: the other basins' optima that a coarse grid hides were 5-27 % above the first
start on the grid where tests/validation/test_search_brute_force.py found them (1.046,
1.066, 1.091, 1.094, 1.272), and each polished start costs."""

EDGE_SCAN = 33
"""Points of the scan along a family's lateral edge (the other ratios, log-spaced, ends
included) that gives each row its start there (:func:`_edge_starts`)."""

EDGE_MARGIN = 1.5
"""A row starts a polish on its lateral edge only where the scan along it finds a mass at
most this factor of the row's lightest grid point: the polish gains on the scan's lightest
point what lies between its points and the geometry rule's boundary (up to 31 % where a
square box's wall reaches the half-width rule, tests/validation/test_search_brute_force.py;
1-5 % elsewhere)."""

START_SEPARATION = 3
"""Grid steps (along some axis) between a polish start and the ones before it, where a
local minimum that far exists: the lightest local minima of a coarse grid are often
neighbours in one basin, while another basin (walls at the minimum wall on a deep section,
say) is lighter in truth but not on the grid (tests/validation/test_search_brute_force.py)."""

STENCIL_POINTS = 33
"""Points of each local refinement stencil of a one-ratio family (spanning +-1 step)."""

REFINE_ROUNDS = 3
"""Rounds of that stencil, each taking the step down to the stencil's spacing (1/16): 3 of
them take the 1/64 grid step down to ~4e-6 of the log(ratio) range, the optimum staying
within one spacing of the best point each round. Families with more ratios use
:func:`~service.core.sizing.polish.polish` instead."""


ENVELOPE_MARGIN = 2.0
"""A grid point counts towards a row's floor (:attr:`GridStart.floor_mass`) when its smallest
scale is within this factor of the envelope's bound on it: a design's proportions lie within
half a grid step of a grid point, over which the smallest scale and the envelope's bound,
smooth power laws of the proportions, change by far less (``PRUNE_MARGIN`` in
:mod:`service.core.sizing.selfsimilar` rests on the same smoothness and is tested with it)."""


@dataclass(frozen=True)
class Optimum:
    """The searched optimum of each material (arrays (..., M)).

    Attributes:
        ratios: best ratios, shape (..., M, n_ratios).
        bounds: scale bounds there (least-violating ones where infeasible).
        unconstrained_mass: lightest grid mass ignoring the envelope, kg.
    """

    ratios: np.ndarray
    bounds: ScaleBounds
    unconstrained_mass: np.ndarray



@dataclass(frozen=True)
class GridStart:
    """What the first grid found for each (case, material) element, one row each (R,),
    case-major, for :func:`refine` to continue from.

    Attributes:
        shape: the elements' leading shape (..., M), R = prod(shape).
        points: the log ratios each row's search starts from, (R, K, n_ratios); K is
            :data:`STARTS` for two or three ratios, else 1.
        unconstrained_mass: lightest grid mass ignoring the envelope, kg (R,); ``inf`` where
            no grid point is a section.
        lightest: lightest feasible grid mass, kg (R,); ``inf`` where none is feasible.
        floor_mass: the lightest grid mass without self-weight among the points within
            :data:`ENVELOPE_MARGIN` of the envelope, kg (R,). Self-weight only adds load, and
            the envelope only removes proportions, so no design of the row is lighter than
            its continuous optimum without self-weight over the proportions the envelope
            nearly admits, which this grid value estimates from above on a landscape of
            smooth power laws (see ``PRUNE_MARGIN`` in
            :mod:`service.core.sizing.selfsimilar`).
        exact: rows whose values are those of the grid without a threshold, (R,) (see
            :func:`grid_starts`); the others' masses are at most their exact values (the
            floor a lower bound of it) and, where above the threshold, only known to be.
    """

    shape: tuple[int, ...]
    points: np.ndarray
    unconstrained_mass: np.ndarray
    lightest: np.ndarray
    floor_mass: np.ndarray
    exact: np.ndarray

    def take(self, rows: np.ndarray) -> GridStart:
        """The rows ``rows`` (their leading shape becomes (len(rows),))."""
        return GridStart((len(rows),), self.points[rows], self.unconstrained_mass[rows],
                         self.lightest[rows], self.floor_mass[rows], self.exact[rows])


def grid_starts(family: SectionFamily, materials: MaterialValues, demand: Demand,
                threshold=None) -> GridStart:
    """Step 1 of the search (see module doc) for materials (M,) and the demand's cases.

    With a ``threshold`` (kg, broadcasting with (C, M, 1); None: none), the grid points
    whose sections weigh more than it are not all sized exactly (the checks that search
    skip them: :func:`~service.core.sizing.scale.scale_bounds`), so their masses come out
    between the threshold and the exact ones. A row whose lightest feasible point and
    starts all weigh at most the threshold then has every value as without it
    (:attr:`GridStart.exact`): any point it reads at or below the threshold is exact, and
    every point above it is heavier, exact or not. Any other row's floor is a lower bound
    of its exact floor (its points' masses are, and more of them count as near the
    envelope), the exact one where at most the threshold.
    """
    columns = materials.column()
    ratio_bounds = family.ratio_bounds
    n_ratios = len(ratio_bounds)
    if n_ratios == 0:
        grid = np.ones((1, 0))
    else:
        points = FIRST_GRID_POINTS[n_ratios]
        grid = RatioBox.of(ratio_bounds).grid(points)
    section = unit_section(family, np.exp(grid), columns, demand.case.loading,
                           applies(demand), demand.member, pressed(demand))
    # only the scale and mass of each grid point are read: member buckling is searched only
    # where it sets them (scale_bounds' exact_parts=False)
    bounds = section_bounds(section, columns, demand, exact_parts=False, threshold=threshold)
    # Lightest grid point ignoring the envelope: tells "envelope" apart as the governing limit.
    real = family.holds(unit_dimensions(family, np.exp(grid)))

    def unconstrained_of(bounds: ScaleBounds) -> np.ndarray:
        if n_ratios == 0:
            return np.where(np.isfinite(bounds.mass), bounds.mass, np.inf)[..., 0]
        return np.where(real & (bounds.scale > 0) & np.isfinite(bounds.mass), bounds.mass,
                        np.inf).min(axis=-1)

    unconstrained = unconstrained_of(bounds)
    weightless = (section_bounds(section, columns, demand.replace(self_weight=False),
                                 exact_parts=False, threshold=threshold)
                  if demand.self_weight else bounds)
    with np.errstate(invalid="ignore"):
        near = weightless.scale <= ENVELOPE_MARGIN * weightless.upper
    floor = unconstrained_of(dataclasses.replace(
        weightless, mass=np.where(near, weightless.mass, np.inf)))
    lightest = np.where(bounds.feasible, bounds.mass, np.inf).min(axis=-1)
    limit = (np.full(lightest.shape, np.inf) if threshold is None else np.broadcast_to(
        np.asarray(threshold, dtype=float), lightest.shape + (1,))[..., 0])
    if n_ratios == 0:
        picks = np.zeros(bounds.scale.shape[:-1] + (1,), dtype=int)
        worth = np.ones(picks.shape, dtype=bool)
        light = ~(lightest > limit)
    else:
        picks, worth, light = _starts(bounds, points, n_ratios,
                                      STARTS[n_ratios] if n_ratios > 1 else 1, limit)
    shape = picks.shape[:-1]
    # the starts not worth a polish (see _starts) are NaN
    starts = np.where(worth[..., None], grid[picks], np.nan).reshape(
        (math.prod(shape),) + picks.shape[-1:] + (n_ratios,))
    # no threshold (inf, or NaN: no mass exceeds it) skips nothing
    exact = light | ~(limit < np.inf)
    return GridStart(shape, starts, unconstrained.reshape(-1), lightest.reshape(-1),
                     floor.reshape(-1), exact.reshape(-1))


def refine(family: SectionFamily, start: GridStart, materials: MaterialValues, demand: Demand
           ) -> Optimum:
    """Steps 2 and 3 of the search (see module doc) for the rows of ``start``, with each
    row's materials (R,) and demand (fields (R, 1) or floats). Returns the rows' optimum (R,)."""
    columns = materials.column()
    ratio_bounds = family.ratio_bounds
    n_ratios = len(ratio_bounds)
    if n_ratios == 0:
        bounds = bounds_at(family, np.ones((1, 0)), columns, demand)
        best = bounds.take(np.zeros(bounds.scale.shape[:-1], dtype=int))
        return Optimum(np.ones(best.scale.shape + (0,)), best, start.unconstrained_mass)
    box = RatioBox.of(ratio_bounds)
    log_low, log_high = box.low, box.high
    if n_ratios > 1:
        # Each start is a row of its own (the same material and demand); the lightest
        # feasible result of each element's starts wins. Starts left out (NaN, see
        # _starts) stand as infeasible results. A family with a lateral edge has one start
        # more, on the edge, whose polish stays past it (:func:`_edge_starts`).
        starts = start.points
        low = np.broadcast_to(log_low, starts.shape)
        if family.lateral_edge is not None:
            edge, edge_low = _edge_starts(family, start, columns, demand, box)
            starts = np.concatenate([starts, edge[:, None, :]], axis=1)
            low = np.concatenate([low, edge_low[:, None, :]], axis=1)
        count = starts.shape[1]
        points, low = starts.reshape(-1, n_ratios), low.reshape(-1, n_ratios)
        used = np.flatnonzero(np.isfinite(points).all(axis=-1))
        rows = np.repeat(np.arange(starts.shape[0]), count)[used]
        some, polished_some = polish(family, points[used], columns.take(rows),
                                     demand.take(rows), low[used], log_high)
        found = np.array(points, copy=True)
        found[used] = some
        polished = _unsized(polished_some, len(points)).put(used, polished_some)
        polished = polished._map(lambda a: a.reshape(a.shape[:-1] + (-1, count)))
        winner = np.argmin(np.where(polished.feasible, polished.mass, np.inf), axis=-1)
        best = polished.take(winner)
        center = along(found.reshape(-1, count, n_ratios), winner)
    else:
        # One ratio: a stencil of shrinking steps converges (no ridge to follow in 1-D).
        picked: list[ScaleBounds] = []

        def pick(candidates: np.ndarray) -> np.ndarray:
            bounds = bounds_at(family, np.exp(candidates), columns, demand,
                               exact_parts=False)
            index = pick_point(bounds)
            picked[:] = [bounds.take(index)]
            return along(candidates, index)

        center = zoom(box, start.points[:, 0], box.spacing(FIRST_GRID_POINTS[n_ratios]), pick,
                      points=STENCIL_POINTS, shrink=2.0 / (STENCIL_POINTS - 1),
                      rounds=REFINE_ROUNDS)
        (best,) = picked
    return Optimum(np.exp(center), best, start.unconstrained_mass)


def _edge_starts(family: SectionFamily, start: GridStart, columns: MaterialValues,
                 demand: Demand, box: RatioBox) -> tuple[np.ndarray, np.ndarray]:
    """Each row's start on the family's lateral edge (:attr:`SectionFamily.lateral_edge`),
    log ratios (R, n), NaN where none, and the lower ends of its ratio box (R, n), which
    keep its polish past the edge: there the member buckling check of a bent member drops
    out, so the bounds step down and the lightest design may lie on the edge, which a
    polish from the near side, following gradients, does not cross, nor one from the edge
    leave when its steps to the near side are heavier across the step. The start is the
    lightest point of a scan along the edge (:data:`EDGE_SCAN`), for the rows where that is
    within :data:`EDGE_MARGIN` of their grid's lightest."""
    assert family.lateral_edge is not None
    name, value = family.lateral_edge
    axis = [bound.dimension for bound in family.ratio_bounds].index(name)
    edge = math.log(value)
    others = RatioBox(np.delete(box.low, axis), np.delete(box.high, axis)).grid(EDGE_SCAN)
    scan = np.insert(others, axis, edge, axis=-1)
    scanned = bounds_at(family, np.exp(scan), columns, demand, exact_parts=False)
    mass = np.where(scanned.feasible, scanned.mass, np.inf)
    lightest = np.argmin(mass, axis=-1)
    scan_mass = np.take_along_axis(mass, lightest[:, None], axis=-1)[:, 0]
    near = np.isfinite(scan_mass) & ~(scan_mass > EDGE_MARGIN * start.lightest)
    points = np.where(near[:, None], scan[lightest], np.nan)
    low = np.tile(box.low, (len(points), 1))
    low[:, axis] = max(box.low[axis], edge)
    return points, low


def _unsized(like: ScaleBounds, size: int) -> ScaleBounds:
    """Bounds of ``size`` elements shaped as ``like``'s, none feasible (infinite mass)."""
    fill = {"feasible": False, "mass": np.inf}
    return ScaleBounds(**{name: np.full(getattr(like, name).shape[:-1] + (size,),
                                        fill.get(name, np.nan),
                                        dtype=getattr(like, name).dtype)
                          for name in BOUND_FIELDS}, layout=like.layout)


def _starts(bounds: ScaleBounds, points: int, n_ratios: int, count: int, limit: np.ndarray
            ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Indices (..., M, count) of the grid points the polish starts from: the lightest
    feasible local minimum of the grid (no lighter neighbour along any axis), then the
    lightest local minima within :data:`START_MARGIN` of it, distinct basins a local search
    could not cross, each where possible at least :data:`START_SEPARATION` grid steps from
    the ones before it; then the lightest feasible points; the least violating point where
    none is feasible. Also which starts are worth a polish (..., M, count): the first, and
    the local minima within the margin. And where every start worth a polish weighs at most
    ``limit`` (..., M), a grid's threshold (see :func:`grid_starts`), and is a local minimum
    or the point that stands in where none is feasible: there they are those of the exact
    grid. (Above the threshold local minima are unknown; every point's mass and violation
    there are at most the exact ones, so a local minimum, the lightest feasible point or
    the least violating point at or below it is the exact grid's, and no other feasible
    point is, nor is a feasible point missing; a start above the threshold that is not
    worth a polish would not be on the exact grid either, its exact mass being higher.)"""
    mass = np.where(bounds.feasible, bounds.mass, np.inf)
    cube = mass.reshape(mass.shape[:-1] + (points,) * n_ratios)
    minimum = np.isfinite(cube)
    for axis in range(-n_ratios, 0):
        # no lighter neighbour before or after along the axis (the grid's ends have none)
        later = (Ellipsis, slice(1, None)) + (slice(None),) * (-axis - 1)
        earlier = (Ellipsis, slice(None, -1)) + (slice(None),) * (-axis - 1)
        minimum[later] &= cube[later] <= cube[earlier]
        minimum[earlier] &= cube[earlier] <= cube[later]
    minimum = minimum.reshape(mass.shape)
    # local minima first (by mass), apart from the starts already taken where one is (see
    # :data:`START_SEPARATION`), then the other feasible points (by mass)
    coords = np.indices((points,) * n_ratios).reshape(n_ratios, -1).T            # (Q, n)
    taken = np.zeros(mass.shape, dtype=bool)
    near = np.zeros(mass.shape, dtype=bool)
    picks: list[np.ndarray] = []
    close = np.ones(mass.shape, dtype=bool)      # within START_MARGIN of the first start
    for _ in range(count):
        tier = np.where(taken, 3, np.where(minimum & close, np.where(near, 1, 0), 2))
        pick = np.lexsort((mass, tier), axis=-1)[..., 0]
        if not picks:
            close = mass <= START_MARGIN * np.take_along_axis(mass, pick[..., None], axis=-1)
        picks.append(pick)
        np.put_along_axis(taken, pick[..., None], True, axis=-1)
        near |= np.max(np.abs(coords - coords[pick][..., None, :]), axis=-1) < START_SEPARATION
    order = np.stack(picks, axis=-1)
    fallback = pick_point(bounds)[..., None]
    chosen = np.take_along_axis(mass, order, axis=-1)
    ranked = np.isfinite(chosen)
    standing = np.take_along_axis(bounds.mass, fallback, axis=-1)
    local = np.take_along_axis(minimum, order, axis=-1)
    # a start after the first is polished only where it is a local minimum whose grid mass
    # is near the first's (:data:`START_MARGIN`)
    worth = ranked & local & (chosen <= START_MARGIN * chosen[..., :1])
    worth[..., 0] = True
    light = np.all(~worth | np.where(ranked, local & ~(chosen > limit[..., None]),
                                     ~(standing > limit[..., None])), axis=-1)
    return np.where(ranked, order, fallback), worth, light
