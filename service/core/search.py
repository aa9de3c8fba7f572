"""The ratio-box search shared by the sizing and the rankings: a log grid, then zooming.

A section family's proportions are ratios of its dimensions to its scale dimension, each
between the bounds of a :class:`~service.core.sections.base.RatioBound`. Both the sizing
(minimum mass over the proportions, :mod:`service.core.sizing.proportions`, and the sandwich
panel's face/core ratio) and the rankings (the largest shape factor a material reaches,
:mod:`service.core.indices.shape_limits`) search that box in log(ratio): a grid with its ends
included for every material at once, then stencils of shrinking steps around each material's
best point (:func:`zoom`).

Arrays: points are log ratios with a last axis of n ratios; every leading axis is carried
through (materials, cases, rows).
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from dataclasses import dataclass

import numpy as np

from service.core.sections.base import RatioBound


@dataclass(frozen=True)
class RatioBox:
    """The box of log(ratio) a search covers.

    Attributes:
        low: log of each ratio's lower bound, (n,).
        high: log of each ratio's upper bound, (n,).
    """

    low: np.ndarray
    high: np.ndarray

    @classmethod
    def of(cls, bounds: Sequence[RatioBound]) -> RatioBox:
        """The box of the ratio bounds ``bounds`` (in their order)."""
        return cls(np.log([b.low for b in bounds]), np.log([b.high for b in bounds]))

    @property
    def size(self) -> int:
        """n, the number of ratios."""
        return len(self.low)

    def grid(self, points: int) -> np.ndarray:
        """``points`` log-spaced values per ratio, ends included, every combination:
        (points^n, n), the last ratio varying fastest."""
        axes = [np.linspace(lo, hi, points) for lo, hi in zip(self.low, self.high, strict=True)]
        return np.stack(np.meshgrid(*axes, indexing="ij"), axis=-1).reshape(-1, self.size)

    def spacing(self, points: int) -> np.ndarray:
        """The step of :meth:`grid` along each ratio, (n,)."""
        return (self.high - self.low) / (points - 1)


def zoom(box: RatioBox, center: np.ndarray, step: np.ndarray, pick: Callable[[np.ndarray],
         np.ndarray], *, points: int, shrink: float, rounds: int) -> np.ndarray:
    """Refine each best point ``center`` (..., n) by ``rounds`` stencils: ``points`` values
    per ratio spanning +-``step`` around it (kept inside the box), each round's step
    ``shrink`` times the last. ``pick`` takes the candidates (..., points^n, n) and returns
    each element's chosen point (..., n)."""
    offsets = np.stack(np.meshgrid(*[np.linspace(-1.0, 1.0, points)] * box.size,
                                   indexing="ij"), axis=-1).reshape(-1, box.size)
    for _ in range(rounds):
        center = pick(np.clip(center[..., None, :] + offsets * step, box.low, box.high))
        step = step * shrink
    return center


def rounds_to(step: np.ndarray, tolerance: float, shrink: float) -> int:
    """How many rounds of :func:`zoom` take the largest of ``step`` to ``tolerance`` or
    below."""
    rounds, largest = 0, float(np.max(step))
    while largest > tolerance:
        largest *= shrink
        rounds += 1
    return rounds
