"""The active-set polish: the proportion search of two- and three-ratio families.

The optimum usually lies on a ridge or a vertex where several scale bounds are equal
(stiffness and local buckling with the envelope, say), which a stencil cannot follow.
:func:`polish` works in y = (log s, log p) on the smooth terms of the bounds
(:attr:`ScaleBounds.parts`: each buckling mode apart, bending and shear strength apart) and on
the smooth margins of the family's geometry rules, so it can land on the vertex where they
meet. Every row (one (case, material) element and one start) is independent.

Array shapes (R rows, n ratios, S gradient samples, T trial points, R0 model rows of one
sample: the lower-bound terms, depth, width and the rule margins; the model adds 2 n rows of
the ratio box):

=====================  =====================================================================
``center``             (R, n) log ratios
``values``             (R, S, n + 1, R0) log bound terms at the point and its n
                       finite-difference neighbours, for each gradient sample
``log_area``           (R, S, n + 1) log a(p) at the same points
``bounds``             :class:`ScaleBounds` of (R,) at the point
``step``               (R, 1) trust length in log(ratio); ``stalled`` (R,) failures in a row
``rows``               (R, S R0 + 2 n, n + 1) the linear model: d sigma and d p of each term
``residual``           (R, S R0 + 2 n) constraint values of the model (<= 0 when met)
``active``             (R, S R0 + 2 n) the terms held at equality
``inverse``            (R, n + 1, S R0 + 2 n) pseudo-inverse of the active rows
``trial_points``       (R, T, n) the line-search points, T = len(POLISH_LENGTHS)
=====================  =====================================================================
"""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass

import numpy as np

from service.core.sizing.checks import CHECK_NAMES
from service.core.sizing.manufacturing import RATIO_PAIRS, wall_ratio_margins
from service.core.sizing.scale import ScaleBounds
from service.core.sizing.unit_bounds import (
    along,
    bounds_at,
    pick_point,
    unit_dimensions,
    violation,
)

POLISH_ITERATIONS = 10
"""Most iterations of the active-set gradient projection (:func:`polish`); rows leave as
they converge, usually after 4 to 6."""

POLISH_PATIENCE = 1
"""A row stops after this many iterations in a row without progress (each failure cuts its
trust length tenfold). One is enough where the bounds are smooth: an iteration's line
search already tries steps down to 0.5 % of the full one (:data:`POLISH_LENGTHS`); where
a family has kinks, a failure is retried once with samples around the point."""

POLISH_GAIN = 1e-4
"""Smallest relative mass gain that counts as progress (0.01 %, well inside the 0.5 % the
search must reach)."""

APPROACH_GAIN = 1e-3
"""Smallest relative cut in the envelope violation that keeps an infeasible row searching
(one that cannot reach a feasible design leaves within a few iterations; its reason then
quotes the least violating size found, to about this precision). Small feasible regions
(a member that barely carries its own weight) are reached by many small cuts."""

STATIONARY_TOLERANCE = 1e-6
"""A projected gradient below this fraction of the mass gradient counts as zero (see
:func:`_stationary`); at a vertex it is ~1e-12, the regularisation of the projection."""

POLISH_MIN_STEP = 1e-5
"""The polish stops when every material's step is below this (log(ratio))."""

POLISH_START = 0.15
"""First trust length of the polish, in log(ratio)."""

POLISH_LENGTHS = (1.0, 0.7, 0.45, 0.25, 0.12, 0.05, 0.02, 0.005)
"""Trial fractions of the step to the first blocking bound: a line search over 2.3 decades
in one evaluation (the cost of an evaluation is mostly per call, not per point)."""

FD_STEP = 1e-6
"""Finite-difference step in log(ratio) for the polish's gradients."""

RESTORE_MARGIN = 1e-6
"""Target slack (in log) of the active bounds after a polish step."""

KINK_SAMPLE = 1e-3
"""Distance (log(ratio)) of the gradient samples that detect kinks in a bound."""

KINK_TOLERANCE = 0.05
"""Relative gradient change across a sample that counts as a kink, not curvature."""

_LARGEST = np.finfo(float).max

ACTIVE_TOLERANCE = 1e-3
"""A bound within this (in log) of binding counts as active in the polish."""


@dataclass(frozen=True)
class _Polish:
    """The polish's state per material: the point (log ratios), the row values and log a at
    it and its gradient samples, its bounds, the trust length and the failures in a row."""

    center: np.ndarray
    values: np.ndarray
    log_area: np.ndarray
    bounds: ScaleBounds
    step: np.ndarray
    stalled: np.ndarray

    def take(self, rows: np.ndarray) -> _Polish:
        return _Polish(self.center[rows], self.values[rows], self.log_area[rows],
                       self.bounds._map(lambda a: a[..., rows]), self.step[rows],
                       self.stalled[rows])

    def put(self, rows: np.ndarray, part: _Polish) -> _Polish:
        def put(whole, piece):
            whole = np.array(whole, copy=True)
            whole[rows] = piece
            return whole
        return _Polish(put(self.center, part.center), put(self.values, part.values),
                       put(self.log_area, part.log_area), self.bounds.put(rows, part.bounds),
                       put(self.step, part.step), put(self.stalled, part.stalled))


def polish(family, center, columns, demand, log_low, log_high):
    """Active-set gradient projection in y = (log s, log p), vectorised over materials,
    within the ratio box ``log_low`` to ``log_high`` ((n,), or (R, n): a box per row).

    In logarithms the mass and every scale bound are close to linear in the proportions, and
    the optimum usually sits where several bounds are equal (a ridge, or a vertex with the
    envelope or a ratio limit) that a stencil search cannot follow. Each iteration takes
    finite-difference gradients of log a(p) and of every bound, keeps the bounds within
    1e-3 of active (releasing those whose Lagrange multiplier is negative), tries a few
    step lengths along the projected gradient together with the Gauss-Newton step back onto
    the active set, then corrects each trial point once more onto the active set (the
    bounds are curved). A point is accepted only when it is feasible and its closed-form mass
    is lower. A row stops after POLISH_PATIENCE failures in a row or when its trust length
    is below POLISH_MIN_STEP, and leaves the arrays. ``center`` holds one row per element
    (R, n), with ``columns`` (R, 1) and the demand's arrays (R, 1). Returns the (log) ratios
    and their bounds.
    """
    values, log_area, bounds = _probe(family, center[..., None, :], columns, demand, kinks=False)
    kinks = demand.case.loading in family.kinked_loadings or (
        demand.member is not None and "torque" in demand.member.flags
        and "torsion" in family.kinked_loadings)
    extra = len(family.rule_margins(unit_dimensions(family, np.exp(center[:1])))) + len(
        RATIO_PAIRS.get(family.id, ()))
    # the state keeps room for the kink samples where the family's terms have kinks
    samples = 1 + 2 * center.shape[-1] if kinks else 1
    state = _Polish(center, np.repeat(values[..., 0, :, :, :], samples, axis=-3),
                    np.repeat(log_area[..., 0, :, :], samples, axis=-2),
                    bounds.take(np.zeros(center.shape[:-1], dtype=int)),
                    np.full(center.shape[:-1] + (1,), POLISH_START),
                    np.zeros(center.shape[:-1], dtype=int))
    for _ in range(POLISH_ITERATIONS):
        done = ((state.stalled >= POLISH_PATIENCE + kinks)
                | (state.step[..., 0] < POLISH_MIN_STEP))
        if done.all():
            break
        if done.any():
            rows = np.flatnonzero(~done)
            low, high = (box if np.ndim(box) == 1 else box[rows] for box in (log_low, log_high))
            state = state.put(rows, _polish_step(family, state.take(rows), columns.take(rows),
                                                 demand.take(rows), low, high, extra))
        else:
            state = _polish_step(family, state, columns, demand, log_low, log_high, extra)
    return state.center, state.bounds


def _polish_step(family, state: _Polish, columns, demand, log_low, log_high, extra: int
                 ) -> _Polish:
    """One iteration of :func:`polish` for every material of ``state``; its rows end with
    ``extra`` margins of the family's geometry rules and of the materials' wall-ratio limits
    (:func:`~service.core.sizing.manufacturing.wall_ratio_margins`)."""
    center, values, log_area, bounds, step = (state.center, state.values, state.log_area,
                                              state.bounds, state.step)
    stuck = state.stalled > 0
    if stuck.any() and state.values.shape[-3] > 1:
        # A failed step may be a kink (two buckling modes meeting): sample the gradients
        # around the point, so the next step can follow the ridge. Only the stuck rows are
        # sampled (a row's values depend on its own inputs alone).
        rows = np.flatnonzero(stuck)
        sampled, sampled_area, _ = _probe(family, center[rows][:, None, :], columns.take(rows),
                                          demand.take(rows), kinks=True)
        values, log_area = values.copy(), log_area.copy()
        values[rows] = sampled[:, 0]
        log_area[rows] = sampled_area[:, 0]
    n = center.shape[-1]
    eye = np.eye(n)
    box = np.concatenate([np.zeros((2 * n, 1)), np.concatenate([eye, -eye])], axis=-1)
    lengths = np.array(POLISH_LENGTHS)
    width = values.shape[-1]                       # R0: the rows of one gradient sample
    count = width - 2 - extra                                            # lower-bound rows
    samples = values.shape[-3]

    def residual_of(row_values, sigma_now, points):
        """Residuals of the rows: the bounds once per gradient sample, then the ratio box."""
        single = _residual(row_values, sigma_now, points, log_low, log_high, extra)
        general_part = np.concatenate([single[..., :width]] * samples, axis=-1)
        return np.concatenate([general_part, single[..., width:]], axis=-1)

    sigma = values[..., 0, 0, :count].max(axis=-1)                   # (..., M)
    with np.errstate(invalid="ignore"):
        # gradients of every row at the point and at the kink samples: (..., M, S, n, R0)
        gradient = (values[..., 1:, :] - values[..., :1, :]) / FD_STEP
        change = np.sqrt(np.sum((gradient - gradient[..., :1, :, :]) ** 2, axis=-2))
        size = np.sqrt(np.sum(gradient[..., :1, :, :] ** 2, axis=-2))
    # A sample whose gradient differs from the point's marks a kink (a min of buckling
    # modes, say): its gradient enters as a row of its own, so the step follows the ridge.
    kinked = change > KINK_TOLERANCE * (size + 1e-3)                 # (..., M, S, R0)
    kinked[..., 0, :] = True
    general = _general_rows(gradient, count, extra)                  # (..., M, S R0, n+1)
    rows = np.concatenate([general, np.broadcast_to(box, general.shape[:-2] + box.shape)],
                          axis=-2)                                   # (..., M, R, n+1)
    residual = residual_of(values[..., 0, 0, :], sigma, center)
    kinked_rows = np.concatenate(
        [kinked.reshape(kinked.shape[:-2] + (-1,)),
         np.ones(kinked.shape[:-2] + (2 * n,), dtype=bool)], axis=-1)
    active = (np.isfinite(residual) & (residual >= -ACTIVE_TOLERANCE) & kinked_rows
              & np.all(np.isfinite(rows), axis=-1))
    objective = np.concatenate(
        [np.full(center.shape[:-1] + (1,), 2.0),
         (log_area[..., 0, 1:] - log_area[..., 0, :1]) / FD_STEP], axis=-1)
    inverse = _pseudo_inverse(np.where(active[..., None], rows, 0.0))
    wrong = active & (np.einsum("...dr,...d->...r", inverse, objective) > 1e-12)
    released = np.flatnonzero(wrong.any(axis=-1))
    if len(released):
        # Only the rows that released a bound have a new matrix (the others keep theirs).
        active, inverse = active.copy(), inverse.copy()
        active[released], inverse[released] = _release(rows[released], active[released],
                                                       wrong[released], objective[released])
    matrix = np.where(active[..., None], rows, 0.0)
    projected = objective - np.einsum("...dr,...rk,...k->...d", inverse, matrix, objective)

    # The model is linear, so the step runs to the first inactive bound it meets (an
    # active-set step), capped by a trust length in log units.
    with np.errstate(divide="ignore", invalid="ignore"):
        rate = -np.einsum("...rd,...d->...r", rows, projected)
        reaches = np.where(~active & kinked_rows & (rate > 0) & np.isfinite(residual),
                           -residual / rate, np.inf)
    blocking = np.argmin(reaches, axis=-1)
    reach = np.take_along_axis(reaches, blocking[..., None], axis=-1)[..., 0]
    norm = np.sqrt(np.sum(projected[..., 1:] ** 2, axis=-1)) + 1e-300
    length = np.minimum(reach, step[..., 0] / norm)                  # (..., M)
    # The full step ends on the bound that blocked it: its correction (below) also keeps
    # that bound active, so a step into a vertex lands on it instead of stopping short of it.
    joined = active | ((np.arange(active.shape[-1]) == blocking[..., None])
                       & (reach <= step[..., 0] / norm)[..., None])
    restore = _restore(inverse, active, residual[..., None, :])      # (..., M, 1, n+1)
    if samples == 1 and np.all(_stationary(bounds, objective, projected, restore[..., 0, :])):
        # Every row sits on a vertex of its bounds with no descent direction left: the trial
        # (which could only fail) is skipped, and every row stops.
        return dataclasses.replace(state, stalled=np.maximum(state.stalled, POLISH_PATIENCE))
    moves = restore - (length[..., None] * lengths)[..., None] * projected[..., None, :]
    trial_sigma = sigma[..., None] + moves[..., 0]
    trial_points = np.clip(center[..., None, :] + moves[..., 1:], *_boxed(log_low, log_high))
    # The trial points come with their own gradients: the Newton step back onto the active
    # bounds then uses the bounds' slopes where it starts, so long steps along curved
    # bounds land (with the centre's slopes they fall short, and progress is geometric).
    # Those steps read the active and blocking rows alone (the others enter as zeros): a
    # check with none of its parts among them in any row is not evaluated there.
    trial_values, _, _ = _probe(family, trial_points, columns, demand, kinks=False,
                                skip=_unread(bounds.layout, joined[..., :width]))
    with np.errstate(invalid="ignore"):
        trial_gradient = (trial_values[..., 0, 1:, :] - trial_values[..., 0, :1, :]) / FD_STEP
    trial_rows = np.concatenate(
        [_general_rows(trial_gradient[..., None, :, :], count, extra),
         np.broadcast_to(rows[..., None, width:, :],
                         trial_gradient.shape[:-2] + rows[..., width:, :].shape[-2:])],
        axis=-2)                                                     # (..., M, T, R, n+1)
    trial_residual = residual_of(trial_values[..., 0, 0, :], trial_sigma, trial_points)
    correction = _newton(trial_rows, active[..., None, :], trial_residual)
    landing = _newton(trial_rows[..., :1, :, :], joined[..., None, :], trial_residual[..., :1, :])
    corrected_points = np.clip(
        np.concatenate([trial_points, trial_points[..., :1, :]], axis=-2)
        + np.concatenate([correction, landing], axis=-2)[..., 1:], *_boxed(log_low, log_high))
    # The corrected points are evaluated with their finite-difference neighbours, so the
    # next iteration's gradients come with them.
    corrected_values, corrected_area, corrected = _probe(
        family, corrected_points, columns, demand, kinks=False)
    pick = pick_point(corrected)
    chosen = corrected.take(pick)
    # A feasible row takes a lighter feasible point; an infeasible one (a least-violating
    # start) takes a feasible point or one that violates the envelope less, so it can reach
    # a small feasible region over several iterations.
    better = np.where(
        bounds.feasible,
        chosen.feasible & (chosen.mass < bounds.mass * (1.0 - POLISH_GAIN)),
        chosen.feasible | (violation(chosen) < violation(bounds) * (1.0 - APPROACH_GAIN)))
    center = np.where(better[..., None], along(corrected_points, pick), center)
    bounds = chosen.where(better, bounds)
    # The probe's single sample stands for every kink sample (no kink can show there).
    values = np.where(better[..., None, None, None],
                      np.take_along_axis(corrected_values, pick[..., None, None, None, None],
                                         axis=-4)[..., 0, :, :, :], values)
    log_area = np.where(better[..., None, None],
                        np.take_along_axis(corrected_area, pick[..., None, None, None],
                                           axis=-3)[..., 0, :, :], log_area)
    return _Polish(center, values, log_area, bounds,
                   np.where(better[..., None], step * 2.0, step * 0.1),
                   np.where(better, 0, state.stalled + 1))


def _release(rows, active, wrong, objective) -> tuple[np.ndarray, np.ndarray]:
    """The active sets (K, R) of K rows whose active bounds include ``wrong`` ones (a
    Lagrange multiplier of the wrong sign), and the pseudo-inverses of their rows.

    Releasing every wrong bound is right where at most one is wrong. At a degenerate vertex
    (more bounds active than the point has coordinates, a ridge of two bounds meeting a
    geometry rule, say) several can show the wrong sign although releasing them all gives a
    direction that at once breaks one of them again: the step then has no length and the
    row stops short of its optimum. There each wrong bound is also released alone, and the
    row takes, of the candidates whose direction keeps every released bound met (to first
    order), the steepest one; where none does, every wrong bound is released.
    """
    candidates = [active & ~wrong]
    count = wrong.sum(axis=-1)
    several = np.flatnonzero(count > 1)
    order = np.argsort(~wrong, axis=-1, kind="stable")         # the wrong bounds first
    for j in range(int(count.max()) if len(several) else 0):
        alone = candidates[0].copy()
        own = several[j < count[several]]    # rows with a j-th wrong bound (else: all)
        alone[own] = active[own]
        alone[own, order[own, j]] = False
        candidates.append(alone)
    best_active, best_inverse = candidates[0].copy(), _pseudo_inverse(
        np.where(candidates[0][..., None], rows, 0.0))
    if len(candidates) == 1:
        return best_active, best_inverse
    best_score = np.full(len(active), -np.inf)
    for candidate in candidates:
        sub = several
        matrix = np.where(candidate[sub, :, None], rows[sub], 0.0)
        inverse = _pseudo_inverse(matrix)
        projected = objective[sub] - np.einsum("...dr,...rk,...k->...d", inverse, matrix,
                                               objective[sub])
        rate = -np.einsum("...rd,...d->...r", rows[sub], projected)
        dropped = active[sub] & ~candidate[sub]
        keeps = np.all(~dropped | (rate <= 1e-9 * np.sqrt(np.sum(projected**2, axis=-1,
                                                                 keepdims=True))), axis=-1)
        score = np.where(keeps, np.sum(projected**2, axis=-1), -np.inf)
        take = score > best_score[sub]
        chosen = sub[take]
        best_score[chosen] = score[take]
        best_active[chosen] = candidate[chosen]
        best_inverse[chosen] = inverse[take]
    return best_active, best_inverse


def _stationary(bounds: ScaleBounds, objective, projected, restore) -> np.ndarray:
    """Rows at a stationary point of their linear model: feasible, the projected gradient
    vanishes (the active bounds pin every coordinate, each with a multiplier of the right
    sign) and restoring the active bounds gains nothing."""
    size = np.sqrt(np.sum(objective**2, axis=-1))
    with np.errstate(invalid="ignore"):
        return (bounds.feasible
                & (np.sqrt(np.sum(projected**2, axis=-1)) <= STATIONARY_TOLERANCE * size)
                & (-np.einsum("...d,...d->...", objective, restore) < POLISH_GAIN))


def _general_rows(gradient: np.ndarray, count: int, extra: int) -> np.ndarray:
    """The linear model's rows (d sigma, d p) of the bounds, from their gradients
    (..., S, n, R0) at S samples: (..., S R0, n+1); each sample's rows are the ``count``
    lower bounds (g - sigma), depth and width (sigma - u), then ``extra`` rule margins (-m)."""
    sigma_part = np.array([-1.0] * count + [1.0, 1.0] + [0.0] * extra)
    slope_sign = np.array([1.0] * count + [-1.0, -1.0] + [-1.0] * extra)
    general = np.concatenate(
        [np.broadcast_to(sigma_part, gradient.shape[:-2] + (1, sigma_part.size)),
         slope_sign * gradient],
        axis=-2,
    )                                                                # (..., S, n+1, R0)
    return np.swapaxes(general, -1, -2).reshape(general.shape[:-3] + (-1, gradient.shape[-2] + 1))


def _newton(rows, active, residual):
    """Gauss-Newton move (..., T, n+1) putting the active bounds at -RESTORE_MARGIN, with
    each point's own rows (..., T, R, n+1) and residuals (..., T, R)."""
    matrix = np.where(active[..., None] & np.isfinite(rows), rows, 0.0)
    # nan_to_num's values (NaN as 0, +-inf as the largest finite), in fewer array steps
    finite = np.clip(residual, -_LARGEST, _LARGEST)
    target = np.where(active, np.where(np.isnan(finite), 0.0, finite) + RESTORE_MARGIN, 0.0)
    # the minimum-norm least-squares move, A^+ target, as in _pseudo_inverse (one right-hand
    # side: cheaper than forming A^+)
    return -_regularised_solve(matrix, np.einsum("...rd,...r->...d", matrix, target))


def _restore(inverse, active, residual):
    """Gauss-Newton move (..., M, T, n+1) putting the active bounds at -RESTORE_MARGIN.

    Aiming a hair inside the bounds keeps finite-difference error from crossing them. An
    active row's residual is finite (see :func:`_polish_step`).
    """
    with np.errstate(invalid="ignore"):
        target = np.where(active[..., None, :], residual + RESTORE_MARGIN, 0.0)
    return -np.einsum("...dr,...tr->...td", inverse, target)


def _pseudo_inverse(matrix: np.ndarray) -> np.ndarray:
    """Moore-Penrose inverse of stacked (R, d) matrices as the limit (A^T A + eps I)^-1 A^T.

    Much cheaper than an SVD per matrix for these tiny systems; eps is 1e-12 of the trace, so
    the result matches the true pseudo-inverse to ~1e-6 relative, ample for a search step.
    """
    return _regularised_solve(matrix, np.swapaxes(matrix, -1, -2))


def _regularised_solve(matrix: np.ndarray, right: np.ndarray) -> np.ndarray:
    """(A^T A + eps I)^-1 right for stacked A (R, d), eps 1e-12 of the trace; ``right`` is
    (d, k) or a vector (d,)."""
    gram = np.swapaxes(matrix, -1, -2) @ matrix
    eps = 1e-12 * np.trace(gram, axis1=-2, axis2=-1)[..., None, None] + 1e-300
    regularised = gram + eps * np.eye(gram.shape[-1])
    if right.ndim == matrix.ndim - 1:
        return np.linalg.solve(regularised, right[..., None])[..., 0]
    return np.linalg.solve(regularised, right)


def _probe(family, points, columns, demand, kinks: bool, skip=None):
    """Row values at points (..., M, T, n) and at the finite-difference neighbours of each,
    and with ``kinks`` also at kink samples around them.

    Samples are the point itself and the point moved by +-KINK_SAMPLE along each axis
    (S = 1 + 2n); without ``kinks`` only the point (S = 1), which stands for every sample
    (no kink can show). Returns values (..., M, T, S, n+1, rows), log a (..., M, T, S, n+1)
    and the bounds at the points themselves (..., M, T); the checks in ``skip`` (as for
    :func:`~service.core.sizing.scale.scale_bounds`) are not evaluated: NaN stands in for
    their rows, and for the bounds.
    """
    n = points.shape[-1]
    eye = np.eye(n)
    samples = np.concatenate([np.zeros((1, n)), KINK_SAMPLE * eye, -KINK_SAMPLE * eye])
    if not kinks:
        samples = samples[:1]
    offsets = samples[:, None, :] + np.concatenate([np.zeros((1, n)), FD_STEP * eye])
    probe = points[..., None, None, :] + offsets                         # (..., M, T, S, n+1, n)
    shape = probe.shape
    ratios = np.exp(probe)
    bounds = bounds_at(family, ratios.reshape(shape[:-5] + (shape[-5], -1, n)), columns,
                       demand, skip=skip)
    unit = unit_dimensions(family, ratios)
    margins = family.rule_margins(unit) + wall_ratio_margins(family, unit, demand)
    values, log_area = _row_values(bounds, shape[:-1], margins)
    return values, log_area, bounds.every(offsets.shape[0] * offsets.shape[1])


def _unread(layout: tuple[int, ...], read: np.ndarray) -> dict[str, int]:
    """The checks none of whose parts (the first columns of ``read`` (..., R0), in the
    order of ``layout``, :attr:`ScaleBounds.layout`) is read in any row, with their number
    of parts."""
    used = np.any(read.reshape(-1, read.shape[-1]), axis=0)
    unread, start = {}, 0
    for name, count in zip(CHECK_NAMES, layout, strict=True):
        if count and not used[start:start + count].any():
            unread[name] = count
        start += count
    return unread


def _row_values(bounds: ScaleBounds, shape: tuple[int, ...], margins: list
                ) -> tuple[np.ndarray, np.ndarray]:
    """The rows' values of shape (``shape``, rows): log of the scale bounds (their smooth
    parts, depth, width), then the ``margins`` as they are; and log a(p) of ``shape``
    (the bounds' elements, reshaped)."""
    bound_rows = [*bounds.parts, bounds.upper_depth, bounds.upper_width]
    values = np.empty(shape + (len(bound_rows) + len(margins),))
    with np.errstate(divide="ignore", invalid="ignore"):
        np.log(np.stack(bound_rows, axis=-1).reshape(shape + (len(bound_rows),)),
               out=values[..., :len(bound_rows)])
        log_area = np.log(bounds.mass) - 2.0 * np.log(bounds.scale)
    for row, margin in enumerate(margins, start=len(bound_rows)):
        values[..., row] = margin
    return values, log_area.reshape(shape)


def _boxed(log_low, log_high) -> tuple[np.ndarray, np.ndarray]:
    """The ratio box for points of shape (R, T, n): as given where it is one box (n,), with
    a T axis where each row has its own (R, n)."""
    low, high = (np.asarray(box) if np.ndim(box) == 1 else np.asarray(box)[:, None, :]
                 for box in (log_low, log_high))
    return low, high


def _residual(values, sigma, points, log_low, log_high, extra: int) -> np.ndarray:
    """Constraint values (<= 0 when met) of the linear model: lower bounds, depth and width,
    the ``extra`` rule margins, then the ratio box."""
    sigma = sigma[..., None]
    end = values.shape[-1] - extra
    with np.errstate(invalid="ignore"):
        general = np.concatenate([values[..., :end - 2] - sigma,
                                  sigma - values[..., end - 2:end], -values[..., end:]],
                                 axis=-1)
    if points.ndim == 3:
        log_low, log_high = _boxed(log_low, log_high)
    return np.concatenate([general, points - log_high, log_low - points], axis=-1)
