"""What every check is given (:class:`Actions`) and what it is (:class:`Check`)."""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

import numpy as np

from service.core.sections.base import LocalBuckling
from service.core.sizing.demand import Demand
from service.core.sizing.member import MemberActions
from service.core.sizing.values import MaterialValues


@dataclass(frozen=True)
class Actions:
    """What a member carries at its actual dimensions (arrays broadcasting together, SI).

    Attributes:
        stress: peak bending stress M / Z (bending) or peak shear stress T / Q (torsion), Pa.
        shear: peak transverse shear stress V / A_s, Pa (bending; 0 for torsion).
        deflection: peak deflection, m (NaN for torsion).
        twist: angle of twist, rad (NaN for bending).
        buckling: the section's local buckling stresses, Pa.
        member: what a general member carries, computed exactly along it
            (:mod:`service.core.sizing.member`); None for a shorthand case.
    """

    stress: np.ndarray
    shear: np.ndarray | float
    deflection: np.ndarray
    twist: np.ndarray
    buckling: LocalBuckling
    member: MemberActions | None = None


def always(demand: Demand) -> bool:
    """A check every request asks for."""
    return True


@dataclass(frozen=True)
class Check:
    """One requirement.

    Attributes:
        name: its key in a design's ``utilization`` (and its ``governing`` name).
        utilization: (actions, materials, demand) -> carried / allowed, an array (0 where
            the request does not ask for it, so that feasibility reads every entry alike).
        requested: (scalar demand) -> whether the request asks for it; a design reports
            null for a check that was not asked for.
        words: how a rejection's reason names it.
    """

    name: str
    utilization: Callable[[Actions, MaterialValues, Demand], np.ndarray]
    requested: Callable[[Demand], bool] = always
    words: str = ""

    def __post_init__(self) -> None:
        if not self.words:
            object.__setattr__(self, "words", self.name.replace("_", " "))
