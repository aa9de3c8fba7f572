"""What every check is given (:class:`Actions`) and what it is (:class:`Check`)."""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

import numpy as np

from service.core.sections.base import LocalBuckling
from service.core.sizing.demand import Demand
from service.core.sizing.values import MaterialValues
from service.core.stability.member import MemberSection


@dataclass(frozen=True)
class Actions:
    """What a member carries at its actual dimensions (arrays broadcasting together, SI).

    Attributes:
        stress: peak bending stress M / Z (bending), peak shear stress T / Q (torsion) or
            axial stress P / A (tie, column), Pa.
        shear: peak transverse shear stress V / A_s, Pa (bending; 0 otherwise).
        deflection: peak deflection, or an axial member's extension, m (NaN for torsion).
        twist: angle of twist, rad (NaN for bending).
        buckling: the section's local buckling stresses, Pa.
        moment: peak bending moment |M| of the loads and the self-weight, N m, unfactored
            (bending; 0 for torsion).
        member: the section's constants for member buckling, or None where the family's
            member buckling is not checked here (torsion; sandwich panels check their own).
        section_family: the section family id (it picks the steel column curve).
        compression_buckling: the walls' local buckling stress in uniform compression, Pa
            (columns; ``inf`` otherwise).
    """

    stress: np.ndarray
    shear: np.ndarray | float
    deflection: np.ndarray
    twist: np.ndarray
    buckling: LocalBuckling
    moment: np.ndarray | float = 0.0
    member: MemberSection | None = None
    section_family: str = ""
    compression_buckling: np.ndarray | float = np.inf


@dataclass(frozen=True)
class Check:
    """One requirement.

    Attributes:
        name: its key in a design's ``utilization`` (and its ``governing`` name).
        utilization: (actions, materials, demand) -> carried / allowed, an array.
    """

    name: str
    utilization: Callable[[Actions, MaterialValues, Demand], np.ndarray]
