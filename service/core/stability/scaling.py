"""The smallest scale of a section, at fixed proportions, whose member buckling check holds.

At fixed proportions every constant is a power of the scale s (``MemberSection.scaled``), and
every term of the member utilisation u falls at least as fast as 1 / s: the resistances A f,
chi A f and chi_LT Z f grow at least as s^2 (the reductions chi rise toward 1 as the
slenderness falls), the amplification 1 / (1 - P / P_cr) falls, and a self-weight moment grows
as s^2 against a moment resistance growing at least as s^3. So f(t) = ln u(2^t) falls with a
slope of at least ln 2 everywhere: one step t + f(t) / ln 2 from any point crosses the root,
which brackets it, and the Illinois variant of regula falsi (Dowell & Jarratt, BIT 11, 1971,
from memory) then converges superlinearly on the nearly straight f. Every row at once.

The buckling formulas have no closed-form root in s (M_cr mixes s^4, s^5 and s^6 terms under
a square root, and chi is the root of a quadratic), which is why the scale is found
numerically.
"""

from __future__ import annotations

from collections.abc import Callable

import numpy as np

from service.core.stability.member import MemberMaterial, MemberSection, member_utilization

LOG2_SCALE_RANGE = 60.0
"""The search keeps log2 s within +-60 (s from 1e-18 m to 1e18 m): every power of s up to s^6
stays finite in double precision."""

TOLERANCE = 1e-12
"""Width of the final bracket in log2 s: a relative error in s below 1e-12."""

MAX_STEPS = 60
"""Illinois steps at most (the bracket is usually this narrow after 6-10)."""


def minimum_scale(
    unit: MemberSection, material: MemberMaterial, load_case: str, span, *,
    moment=0.0, self_weight_moment=0.0, axial_force=0.0, end_conditions: str | None = None,
    restraint: str = "none", load_position: str = "shear_centre",
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
        end_conditions, restraint, load_position: as for ``member.member_utilization``.

    Returns:
        s, m, in the broadcast shape of every argument, with the utilisation at s at most 1
        (the feasible end of the final bracket); 0 where no load is applied; ``inf`` where
        even s = 2^60 m fails.
    """
    def utilization(scale):
        return member_utilization(
            unit.scaled(scale), material, load_case, span,
            moment=np.asarray(moment) + np.asarray(self_weight_moment) * scale**2,
            axial_force=axial_force, end_conditions=end_conditions, restraint=restraint,
            load_position=load_position)

    return falling_root(utilization)


def falling_root(utilization: Callable[[np.ndarray], np.ndarray]) -> np.ndarray:
    """The smallest scale s (m) with ``utilization(s) <= 1``, for a utilisation whose every
    term falls at least as fast as 1 / s (see the module docstring), every element at once.

    Args:
        utilization: s (an array broadcasting with the result) -> u, the shape of the rows.

    Returns:
        s with u(s) <= 1 (the feasible end of the final bracket); 0 where u(1) = 0 (nothing
        loaded); ``inf`` where even s = 2^60 m fails.
    """
    def excess(log_scale):
        """ln u at s = 2^log_scale."""
        # probes at extreme scales may underflow M_cr or a resistance to 0: u = inf there,
        # which is the right answer (the member fails), so the warnings are silenced
        with np.errstate(divide="ignore", over="ignore", under="ignore", invalid="ignore"):
            return np.log(utilization(np.exp2(log_scale)))

    start = excess(np.array(0.0))
    unloaded = start == -np.inf
    start = np.where(unloaded, 0.0, np.clip(start, -1e3, 1e3))
    # the crossing step (slope at most -ln 2), kept inside the search range
    step = np.clip(np.nan_to_num(start / np.log(2.0), posinf=LOG2_SCALE_RANGE),
                   -LOG2_SCALE_RANGE, LOG2_SCALE_RANGE)
    other = excess(step)
    other = np.where(np.isnan(other), 1e3, np.clip(other, -1e3, 1e3))   # finite secants
    small, big = np.where(start > 0, 0.0, step), np.where(start > 0, step, 0.0)
    f_small, f_big = np.where(start > 0, start, other), np.where(start > 0, other, start)
    unreachable = f_big > 0.0                # fails even at the largest scale searched
    tiny = (start <= 0.0) & (other <= 0.0)   # holds even at the smallest scale searched
    big, f_big = np.where(tiny, step, big), np.where(tiny, other, f_big)
    small, f_small = np.where(tiny, step, small), np.where(tiny, 1.0, f_small)
    # an unloaded row is done: a zero-width bracket with finite values
    small, big = np.where(unloaded, 0.0, small), np.where(unloaded, 0.0, big)
    f_small, f_big = np.where(unloaded, 1.0, f_small), np.where(unloaded, -1.0, f_big)
    last = np.zeros(np.shape(small), dtype=int)    # which end moved last: -1 small, +1 big
    for _ in range(MAX_STEPS):
        # an element's steps end when its own bracket closes, whatever the others do: the
        # same element sized alone or in a batch takes the same steps (to the bit)
        done = (big - small <= TOLERANCE) | unreachable | (f_big == 0.0)
        if np.all(done):
            break
        trial = big - f_big * (big - small) / (f_big - f_small)
        trial = np.where(np.isfinite(trial), trial, 0.5 * (small + big))
        value = excess(trial)
        value = np.where(np.isnan(value), 1e3, np.clip(value, -1e3, 1e3))
        feasible = (value <= 0.0) & ~done
        moved = ~done
        # Illinois: an end kept twice in a row has its value halved, so the next secant
        # moves it (plain regula falsi would keep one end fixed and crawl)
        kept = moved & ~feasible
        f_small = np.where(feasible & (last == 1), 0.5 * f_small, f_small)
        f_big = np.where(kept & (last == -1), 0.5 * f_big, f_big)
        big, f_big = np.where(feasible, trial, big), np.where(feasible, value, f_big)
        small, f_small = np.where(kept, trial, small), np.where(kept, value, f_small)
        last = np.where(feasible, 1, np.where(kept, -1, last))
    scale = np.where(unreachable, np.inf, np.exp2(big))
    return np.where(unloaded, 0.0, scale)
