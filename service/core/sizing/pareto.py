"""Pareto front of designs for two objectives (mass and cost, or mass and carbon)."""

from __future__ import annotations

from collections.abc import Sequence

import numpy as np

from service.core.errors import InputError
from service.core.indices import OBJECTIVES
from service.core.sizing.results import Design


def pareto_front(designs: Sequence[Design], objectives: tuple[str, str] = ("mass", "cost")
                 ) -> tuple[Design, ...]:
    """The non-dominated designs: no other design is at least as good in both objectives and
    better in one. Sorted by the first objective (ties by the second).

    Raises:
        InputError: at ``pareto`` when the objectives are not two different known ones.
    """
    if len(objectives) != 2 or len(set(objectives)) != 2 or not set(objectives) <= set(
            OBJECTIVES):
        raise InputError.single("pareto", f"must be two different of {', '.join(OBJECTIVES)}")
    if not designs:
        return ()
    values = np.array([[d.objective_value(o) for o in objectives] for d in designs])
    # dominated[i]: some design is no worse in both objectives and better in one (pairwise,
    # designs x designs; ties in both objectives keep both)
    no_worse = (values[:, None, :] <= values[None, :, :]).all(axis=-1)
    better = (values[:, None, :] < values[None, :, :]).any(axis=-1)
    dominated = np.asarray((no_worse & better).any(axis=0))
    order = np.lexsort((values[:, 1], values[:, 0]))
    return tuple(designs[i] for i in order if not dominated[i])
