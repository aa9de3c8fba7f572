"""The smallest scale of a section, at fixed proportions, whose member buckling check holds.

At fixed proportions every constant is a power of the scale s (``MemberSection.scaled``), and
every term of the member utilisation u falls at least as fast as 1 / s: the resistances A f,
chi A f and chi_LT Z f grow at least as s^2 (the reductions chi rise toward 1 as the
slenderness falls), the amplification 1 / (1 - P / P_cr) falls, and a self-weight moment grows
as s^2 against a moment resistance growing at least as s^3. So f(t) = ln u(2^t) falls with a
slope of at least ln 2 everywhere: one step t + f(t) / ln 2 from any point crosses the root,
which brackets it, and the Anderson-Bjorck variant of regula falsi (Anderson & Bjorck, BIT
13, 1973, from memory; it scales a kept end's value by 1 - f(new) / f(old) where the Illinois
variant halves it) then converges superlinearly on the nearly straight f. Every row at once.

Most members fall faster than 1 / s: without self-weight every resistance grows at least as
s^2 against a fixed action (an axial force's terms fall at least as 1 / s^2, a moment's as
1 / s^3, since chi_LT Z f grows at least as Z f ~ s^3), so the slope is at least
``fall`` ln 2 with ``fall`` = 2 or 3 and the first step t + f(t) / (fall ln 2) still
crosses the root: a bracket ``fall`` times narrower, hence fewer steps. An element also stops
as soon as its feasible end lies within the tolerance of the root by that slope
(|f| <= fall ln 2 x tolerance), which the secant often reaches before the bracket closes.

Where only the scale that all checks together set is wanted, a ``ceiling`` (the other
checks' largest scale) spares most searches: where u(ceiling) <= 1 member buckling cannot
set the scale, and ceiling x u(ceiling), a lower bound of the root, stands in for it.

The buckling formulas have no closed-form root in s (M_cr mixes s^4, s^5 and s^6 terms under
a square root, and chi is the root of a quadratic), which is why the scale is found
numerically.
"""

from __future__ import annotations

from collections.abc import Callable

import numpy as np

from service.core.stability.member import (
    FlatTake,
    MemberMaterial,
    MemberSection,
    member_check,
)

LOG2_SCALE_RANGE = 60.0
"""The search keeps log2 s within +-60 (s from 1e-18 m to 1e18 m): every power of s up to s^6
stays finite in double precision."""

TOLERANCE = 1e-12
"""Width of the final bracket in log2 s: a relative error in s below 1e-12."""

COMPACT_FRACTION = 0.5
"""The search drops the elements done once they are more than this fraction of those it
evaluates (when it can evaluate a part alone)..."""

COMPACT_ELEMENTS = 1024
"""...and it evaluates at least this many: below, an evaluation costs about the same
whatever the number of elements (numpy's cost per call), and picking them costs more than
it saves (measured on the README request: the grid's searches of 5,000 elements take half
the time, the polish's of 450 a tenth more)."""

MAX_STEPS = 60
"""Secant steps at most (the bracket is usually this narrow after 4-7)."""


def minimum_scale(
    unit: MemberSection, material: MemberMaterial, load_case: str, span, *,
    moment=0.0, self_weight_moment=0.0, axial_force=0.0, end_conditions: str | None = None,
    restraint: str = "none", load_position: str = "shear_centre", ceiling=None,
    about_minor=None,
) -> np.ndarray:
    """The smallest scale s (m) with member utilisation <= 1, at the proportions of ``unit``.

    Args:
        unit: the section's constants at scale 1 m (shape ``S``).
        material: as for ``member.member_utilization`` (broadcast with ``S``).
        load_case: a bending load case id or ``"column"``.
        span: L, m.
        moment: the factored peak moment of the applied loads, N m.
        self_weight_moment: the factored peak moment of the member's own weight at scale
            1 m, N m (it grows as s^2 with the area); 0 without self-weight.
        axial_force: the factored axial force, N, positive tension.
        end_conditions, restraint, load_position, about_minor: as for
            ``member.member_utilization`` (``about_minor`` None or bools of the broadcast
            shape).
        ceiling: as for :func:`falling_root`: where the check holds at this scale, m, a
            lower bound of s at most the ceiling is returned instead, without a search.

    Returns:
        s, m, in the broadcast shape of every argument, with the utilisation at s at most 1
        (the feasible end of the final bracket); 0 where no load is applied; ``inf`` where
        even s = 2^60 m fails (and the lower bound below ``ceiling``, see above).
    """
    # the power at which every term of u falls at least (see the module docstring)
    weighted = np.any(np.asarray(self_weight_moment) != 0.0)
    axial = load_case == "column" or np.any(np.asarray(axial_force) != 0.0)
    fall = 1.0 if weighted else 2.0 if axial else 3.0

    def problem(section, material, span, moment, self_weight_moment, axial_force, minor):
        """The utilisation of these elements, and how to narrow them (see
        :func:`falling_root`)."""
        check = member_check(material, load_case, span, axial_force=axial_force,
                             end_conditions=end_conditions, restraint=restraint,
                             load_position=load_position, about_minor=minor)

        def utilization(scale):
            return check(section.scaled(scale),
                         np.asarray(moment) + np.asarray(self_weight_moment) * scale**2
                         if weighted else moment)

        def narrow(shape, index):
            take = FlatTake(shape, index)
            return problem(section.at(take), material.at(take),
                           *(None if value is None else take(value)
                             for value in (span, moment, self_weight_moment, axial_force,
                                           minor)))
        return utilization, narrow

    return falling_root(*problem(unit, material, span, moment, self_weight_moment,
                                 axial_force, about_minor), fall=fall, ceiling=ceiling)


Narrowing = Callable[[tuple[int, ...], np.ndarray],
                     tuple[Callable[[np.ndarray], np.ndarray], "Narrowing"]]
"""(shape, index) -> the utilisation of the elements ``index`` (flat positions in ``shape``,
as ``np.flatnonzero`` gives) alone, s of the index's shape -> u of that shape, and its own
narrowing."""


# probes at extreme scales may underflow M_cr or a resistance to 0: u = inf there, which is
# the right answer (the member fails), and a secant through them is replaced by the midpoint,
# so the warnings are silenced (once for the whole search: it costs as much as a step's
# arithmetic to enter)
@np.errstate(divide="ignore", over="ignore", under="ignore", invalid="ignore")
def falling_root(utilization: Callable[[np.ndarray], np.ndarray],
                 narrow: Narrowing | None = None, *, fall: float = 1.0,
                 ceiling=None) -> np.ndarray:
    """The smallest scale s (m) with ``utilization(s) <= 1``, for a utilisation whose every
    term falls at least as fast as 1 / s^fall (see the module docstring), every element at
    once.

    Args:
        utilization: s (an array broadcasting with the result) -> u, the shape of the rows.
        narrow: given (:data:`Narrowing`), the search goes on with the elements still
            searching alone once they are at most :data:`COMPACT_FRACTION` of those
            evaluated (the same steps per element, fewer evaluated).
        fall: the power (>= 1) at which every term of u falls at least.
        ceiling: a scale (m, > 0, broadcasting with the result) that only matters where the
            root lies above it: the search starts there, and where u(ceiling) <= 1 it is
            not searched at all (see Returns).

    Returns:
        s with u(s) <= 1 (the feasible end of the final bracket); 0 where u = 0 (nothing
        loaded); ``inf`` where even s = 2^60 m fails. With ``ceiling``, where u(ceiling)
        <= 1: ceiling x u(ceiling) instead, a lower bound of the root (u falls at least as
        1 / s) that is at most the ceiling.
    """
    def log_utilization(evaluate, log_scale):
        """ln u at s = 2^log_scale."""
        return np.log(evaluate(np.exp2(log_scale)))

    def excess(log_scale):
        """ln u at s = 2^log_scale, both flat over the elements ``searching``."""
        if narrowed:
            return log_utilization(evaluate, log_scale)
        return _flat(log_utilization(utilization, log_scale.reshape(shape)), shape)

    def keep_only(keep):
        """Evaluate from now on the elements ``keep`` (a mask over those searching) alone."""
        nonlocal evaluate, narrow, narrowed, searching
        index = np.flatnonzero(keep) if narrowed else searching[keep]
        evaluate, narrow = narrow(keep.shape if narrowed else shape, index)
        searching, narrowed = searching[keep], True

    evaluate, narrowed = utilization, False
    origin = np.array(0.0) if ceiling is None else np.log2(np.asarray(ceiling, dtype=float))
    capped = np.isfinite(origin) & (np.abs(origin) < LOG2_SCALE_RANGE)
    origin = np.where(capped, origin, 0.0)
    start = log_utilization(utilization, origin)
    shape = np.broadcast_shapes(np.shape(start), np.shape(origin))
    start = _flat(start, shape).reshape(shape)
    unloaded = start == -np.inf
    # below the ceiling: settled at once by the lower bound ceiling x u(ceiling)
    settled = capped & (start <= 0.0) & ~unloaded if ceiling is not None else np.zeros(
        shape, dtype=bool)
    bound = np.where(settled, np.exp2(origin) * np.exp(np.minimum(start, 0.0)), 0.0)
    start = np.where(unloaded, 0.0, np.clip(start, -1e3, 1e3))
    # the crossing step (slope at most -fall ln 2), kept inside the search range, and
    # lengthened by the tolerance: a step shorter than the rounding of s (u within a few
    # ulps of 1) would not move it at all
    slope = fall * np.log(2.0)
    crossing = start / slope + np.sign(start) * TOLERANCE     # NaN where start is
    step = np.clip(origin + crossing, -LOG2_SCALE_RANGE, LOG2_SCALE_RANGE)
    # the search runs on flat arrays over the elements ``searching`` (all at first)
    origin, start, step, unloaded, settled, bound = (
        _flat(a, shape) for a in (origin, start, step, unloaded, settled, bound))
    result = np.where(unloaded, 0.0, bound)
    searching = np.arange(result.size)
    finished = unloaded | settled
    if _worth_narrowing(narrow, finished):
        keep = ~finished
        origin, start, step, unloaded, settled = (
            a[keep] for a in (origin, start, step, unloaded, settled))
        keep_only(keep)
    if not searching.size:
        return result.reshape(shape)
    other = _finite(excess(step))
    small, big = np.where(start > 0, origin, step), np.where(start > 0, step, origin)
    f_small, f_big = np.where(start > 0, start, other), np.where(start > 0, other, start)
    unreachable = f_big > 0.0                # fails even at the largest scale searched
    tiny = (start <= 0.0) & (other <= 0.0)   # holds even at the smallest scale searched
    big, f_big = np.where(tiny, step, big), np.where(tiny, other, f_big)
    small, f_small = np.where(tiny, step, small), np.where(tiny, 1.0, f_small)
    # an unloaded or settled element is done: a zero-width bracket with finite values
    finished = unloaded | settled
    small, big = np.where(finished, 0.0, small), np.where(finished, 0.0, big)
    f_small, f_big = np.where(finished, 1.0, f_small), np.where(finished, -1.0, f_big)
    # which end moved in the last step (an element that did not move is done for good)
    big_moved = small_moved = np.zeros(searching.size, dtype=bool)
    stopped = unreachable | finished
    closed = -slope * TOLERANCE     # f_big at or above: the feasible end is at the root
    for _ in range(MAX_STEPS):
        # an element's steps end when its own bracket closes, whatever the others do: the
        # same element sized alone or in a batch takes the same steps (to the bit)
        width = big - small
        done = (width <= TOLERANCE) | (f_big >= closed) | stopped
        if np.count_nonzero(done) == done.size:     # (cheaper than done.all())
            break
        if _worth_narrowing(narrow, done):
            ending = ~finished & done
            result[searching[ending]] = np.where(unreachable[ending], np.inf,
                                                 np.exp2(big[ending]))
            keep = ~done
            (small, big, f_small, f_big, big_moved, small_moved, unreachable, finished,
             stopped, done, width) = (
                a[keep] for a in (small, big, f_small, f_big, big_moved, small_moved,
                                  unreachable, finished, stopped, done, width))
            keep_only(keep)
        trial = big - f_big * width / (f_big - f_small)
        finite = np.isfinite(trial)
        if np.count_nonzero(finite) < finite.size:
            trial = np.where(finite, trial, 0.5 * (small + big))
        # at least half the tolerance from either end: where the root lies at an end within
        # the rounding of u (u(small) = 1 + 1 ulp, say) the secant lands on that end again
        # and again, and this closes the bracket on the next step instead
        trial = np.minimum(np.maximum(trial, small + 0.5 * TOLERANCE), big - 0.5 * TOLERANCE)
        value = _finite(excess(trial))
        moved = ~done
        feasible = (value <= 0.0) & moved
        kept = moved ^ feasible
        # Anderson-Bjorck: an end kept twice in a row has its value scaled by
        # 1 - f(new) / f(replaced) (0.5 where that is not positive, as Illinois), so the
        # next secant moves it (plain regula falsi would keep one end fixed and crawl)
        factor = 1.0 - value / np.where(feasible, f_big, f_small)
        np.putmask(factor, ~(factor > 0.0), 0.5)
        # the ends in place (np.putmask: a third of np.where's cost per call; the arrays
        # are this search's own)
        np.putmask(f_small, feasible & big_moved, factor * f_small)
        np.putmask(f_big, kept & small_moved, factor * f_big)
        np.putmask(big, feasible, trial)
        np.putmask(f_big, feasible, value)
        np.putmask(small, kept, trial)
        np.putmask(f_small, kept, value)
        big_moved, small_moved = feasible, kept
    ending = ~finished
    result[searching[ending]] = np.where(unreachable[ending], np.inf, np.exp2(big[ending]))
    return result.reshape(shape)


def _flat(value, shape: tuple[int, ...]) -> np.ndarray:
    """``value`` broadcast to ``shape``, flat (no call to ``np.broadcast_to``, which costs as
    much as a step's arithmetic, where it has that shape already)."""
    return np.ravel(value if np.shape(value) == shape else np.broadcast_to(value, shape))


def _finite(log_utilization: np.ndarray) -> np.ndarray:
    """ln u made finite for the secants: NaN (the check unmet) as 1e3, the rest within
    +-1e3 (``np.clip``'s values, at half its cost per call)."""
    return np.maximum(np.fmin(log_utilization, 1e3), -1e3)


def _worth_narrowing(narrow: Narrowing | None, done: np.ndarray) -> bool:
    """Whether to go on with the elements not ``done`` alone (see :data:`COMPACT_FRACTION`
    and :data:`COMPACT_ELEMENTS`)."""
    return bool(narrow is not None and done.size >= COMPACT_ELEMENTS
                and np.count_nonzero(~done) <= COMPACT_FRACTION * done.size)
