"""What every check is given (:class:`Actions`) and what it is (:class:`Check`)."""

from __future__ import annotations

import functools
from collections.abc import Callable
from dataclasses import dataclass
from typing import TYPE_CHECKING

import numpy as np

from service.core.sections.base import LocalBuckling, SectionFamily
from service.core.sizing.demand import Demand
from service.core.sizing.member import MemberActions
from service.core.sizing.values import MaterialValues
from service.core.stability.member import MemberSection

if TYPE_CHECKING:
    from service.core.sizing.checks.interaction import WebSection
    from service.core.sizing.scale import UnitSection


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
        member: what a general member carries, computed exactly along it
            (:mod:`service.core.sizing.member`); None for a shorthand case.
        moment: peak bending moment |M| of the loads and the self-weight, N m, unfactored
            (bending; 0 for torsion).
        member_section: the section's constants for member buckling, or None where the
            family's member buckling is not checked here (torsion; sandwich panels check
            their own).
        section_family: the section family id (it picks the steel column curve).
        compression_buckling: the walls' local buckling stress in uniform compression, Pa
            (columns and bending cases with an axial compression; ``inf`` otherwise).
        axial_stress: a bending case's axial force over the area, N / A, Pa, positive
            tension (0 without one; a general member's is in ``member``).
        web: what the interaction check reads of an I-section or a box
            (:mod:`service.core.sizing.checks.interaction`); None for other families.
        dimensions: the section's dimensions, m (local checks read them: bearing); None
            where not given.
        area: the section's area, m^2 (the self-weight's reactions).
    """

    stress: np.ndarray
    shear: np.ndarray | float
    deflection: np.ndarray
    twist: np.ndarray
    buckling: LocalBuckling
    member: MemberActions | None = None
    moment: np.ndarray | float = 0.0
    member_section: MemberSection | None = None
    section_family: str = ""
    compression_buckling: np.ndarray | float = np.inf
    axial_stress: np.ndarray | float = 0.0
    web: WebSection | None = None
    dimensions: dict | None = None
    area: np.ndarray | float = 0.0


def always(demand: Demand) -> bool:
    """A check every request asks for."""
    return True


def every_family(family: SectionFamily, demand: Demand) -> bool:
    """A check that applies alike to every section family."""
    return True


@dataclass(frozen=True)
class Found:
    """What the checks before one found at the same sections (in :data:`CHECKS` order), for
    a check whose own scale bound reads them (member buckling starts its search from the
    strength's scale and skips it under the others' floor).

    Attributes:
        parts: each earlier check's scale parts by name (an empty list: no bound).
        exact: every part must be exact (a gradient search follows them: the polish); False
            where only the scale and what follows from it are read (a grid, a stencil).
        heavy: scale -> where the sections at that scale weigh more than a grid's threshold
            (:func:`~service.core.sizing.scale.scale_bounds`' ``threshold``), above which no
            exact value is read; None without a threshold.
    """

    parts: dict[str, list[np.ndarray]]
    exact: bool = True
    heavy: Callable[[np.ndarray], np.ndarray] | None = None

    def floor(self) -> np.ndarray | None:
        """The largest scale the earlier checks set, where a check may return a lower bound
        at most this floor instead of its exact part (not :attr:`exact`); ``inf`` where the
        sections already weigh more than the threshold at that scale (:attr:`heavy`: any
        lower bound will do there, 0 say); None where every part must be exact (or no
        earlier check bounds the scale)."""
        terms = [term for parts in self.parts.values() for term in parts]
        if self.exact or not terms:
            return None
        # pairwise, not np.maximum.reduce(terms), which first copies them into one array
        floor = functools.reduce(np.maximum, terms)
        if self.heavy is None:
            return floor
        return np.where(self.heavy(floor), np.inf, floor)


ScaleBound = Callable[["UnitSection", MaterialValues, Demand, Found], "list[np.ndarray] | None"]
"""(unit sections, materials, demand, what the earlier checks found) -> the check's smallest
scales at fixed proportions, m, one array per smooth part (the check's row of
:attr:`~service.core.sizing.scale.ScaleBounds.lower` is their largest), or None (or an empty
list) where the check does not bound the scale."""


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
        for_family: (family, scalar demand) -> whether a requested check also applies to
            a design of that section family (member buckling: lateral-torsional buckling
            only where the family can buckle laterally); null where not.
        scale_bound: the check's smallest scale at fixed proportions (:data:`ScaleBound`),
            which the proportion search follows
            (:func:`service.core.sizing.scale.scale_bounds`); None for a check that never
            bounds the scale.
        reads: the earlier checks whose exact parts ``scale_bound`` reads
            (:attr:`Found.parts`; a bound that skips them still evaluates them for it).
    """

    name: str
    utilization: Callable[[Actions, MaterialValues, Demand], np.ndarray]
    requested: Callable[[Demand], bool] = always
    words: str = ""
    for_family: Callable[[SectionFamily, Demand], bool] = every_family
    scale_bound: ScaleBound | None = None
    reads: tuple[str, ...] = ()

    def __post_init__(self) -> None:
        if not self.words:
            object.__setattr__(self, "words", self.name.replace("_", " "))
