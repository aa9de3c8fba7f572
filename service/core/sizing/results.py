"""Result dataclasses of the sizing engine (every number SI)."""

from __future__ import annotations

import dataclasses
import math
import re
from collections.abc import Iterable
from dataclasses import dataclass


@dataclass(frozen=True)
class Design:
    """One sized member: a material in a section family, the lightest (cheapest, lowest-carbon)
    that meets every requirement, with its dimensions rounded and every check recomputed.

    Attributes:
        material_index: row of the material in the table given to the engine.
        material_id: the material's id.
        family: section family id.
        dimensions: dimension name -> m: multiples of 0.001 mm, or the catalogue member's own
            dimensions when sized from a catalogue.
        core_material_index: row of the core material in the core table (sandwich panels),
            else None.
        core_material_id: the core material's id, or None.
        designation: the catalogue member's name when sized from a catalogue, else None.
        mass: rho A L (faces plus core for a sandwich), kg.
        cost: price x mass, currency units.
        carbon: embodied carbon x mass, kg CO2e.
        deflection: peak deflection (bending plus core shear), m; None for torsion.
        twist: angle of twist, rad; None for bending.
        max_stress: peak bending stress M / Z (face stress for sandwich panels) or peak shear
            stress T / Q, Pa.
        utilization: one entry per check and geometric limit
            (:data:`service.core.sizing.limits.UTILIZATION_KEYS`): ``stiffness``
            (deflection / max_deflection or twist / max_twist), ``strength`` (stress x SF /
            strength; the larger of face and core shear for a sandwich), ``local_buckling``
            (stress x SF / critical stress; face wrinkling for a sandwich), ``envelope``
            (overall size / its limit), ``min_wall`` (min_wall / thinnest wall),
            ``proportions`` (a dimension over the bound of its proportion rule); each <= 1,
            None for an entry the request does not ask for; ``frequency`` and ``fatigue``
            (general members with those requirements) likewise.
        governing: the entry with the largest utilization, a geometric limit first among
            near-equal ones (:func:`service.core.sizing.limits.governing`).
        frequency: first bending natural frequency (Dunkerley's estimate, on the safe side),
            Hz, where computed (a frequency requirement), else None.
        diagrams: the member's diagrams when the request asks for them
            (:class:`service.core.loading.diagrams.Diagrams` fields as lists), else None.
    """

    material_index: int
    material_id: str
    family: str
    dimensions: dict[str, float]
    core_material_index: int | None
    core_material_id: str | None
    designation: str | None
    mass: float
    cost: float
    carbon: float
    deflection: float | None
    twist: float | None
    max_stress: float
    utilization: dict[str, float | None]
    governing: str
    frequency: float | None = None
    diagrams: dict[str, list[float]] | None = None

    def objective_value(self, objective: str) -> float:
        """The value of ``mass``, ``cost`` or ``carbon``."""
        return float(getattr(self, objective))

    def reported(self) -> Design:
        """This design with its numbers rounded as answers report them
        (:data:`REPORTED_DIGITS`); dimensions are already on their grid."""
        return dataclasses.replace(
            self,
            **{name: significant(getattr(self, name), REPORTED_DIGITS[name])
               for name in ("mass", "cost", "carbon", "deflection", "twist", "max_stress",
                            "frequency")},
            utilization={name: significant(ratio, REPORTED_DIGITS["utilization"])
                         for name, ratio in self.utilization.items()},
        )


REPORTED_DIGITS = {"mass": 4, "cost": 4, "carbon": 4, "mass_per_length": 4,
                   "deflection": 6, "twist": 6, "max_stress": 6, "utilization": 6,
                   "frequency": 6,
                   "section_properties": 6, "material_values": 6}
"""Significant digits of each reported number. Mass, cost and carbon to 4 (their data are
indicative to a few per cent, so more digits would claim a precision they lack); the
mechanics (deflection, twist, stress, utilization, section properties, the material values
used) to 6, so that a client comparing them with its limits sees what the service computed.
Rounding to significant digits never lifts a utilization of at most 1 above 1."""


def significant(value, digits: int):
    """``value`` rounded to ``digits`` significant digits (None and non-finite values as
    they are)."""
    if value is None or not math.isfinite(value) or value == 0:
        return value
    return float(f"{value:.{digits}g}")


Reason = tuple[str, float]
"""Why a row has no design, and its shortfall (see :attr:`Rejection.shortfall`)."""


@dataclass(frozen=True)
class Rejection:
    """A material and family with no feasible design, and why.

    Attributes:
        material_index: row of the material in the engine's table.
        material_id: the material's id.
        family: section family id.
        reason: what stops it, in words a designer can act on.
        shortfall: how far it is from a design, as a factor >= 1: the envelope dimension it
            needs over the one allowed, or the worst utilization of the closest catalogue
            member; 1 for a design lost only to rounding; ``inf`` where it cannot be sized
            at all (not made in the form, brittle, the loading not carried). The smallest
            names the material closest to feasible.
    """

    material_index: int
    material_id: str
    family: str
    reason: str
    shortfall: float = math.inf


@dataclass(frozen=True)
class DesignResult:
    """Everything a sizing request produced.

    Attributes:
        designs: feasible designs, best objective first (cut to ``top`` when asked).
        rejected: every material and family without a design, with its reason.
    """

    designs: tuple[Design, ...]
    rejected: tuple[Rejection, ...]


REJECTION_MODES = ("grouped", "all", "none")
"""How an answer lists its rejections (request field ``rejections``): grouped by reason
(:func:`grouped_rejections`, the default), every one, or none."""

_VALUES_IN_BRACKETS = re.compile(r" ?\([^()]*\d[^()]*\)")
_DIGIT = re.compile(r"\d")


def reason_summary(reason: str) -> str:
    """What a reason shares with the same reason of other materials: the reason without its
    values.

    A reason reads "what stops it: the detail" (parts joined by ": "); the summary drops every
    bracketed part that holds a number (a material's own values, "(strain at break 4 % ...)")
    and every part after the first, from the first one that still names a number ("stiffness
    needs at least 0.0332 m"). The first part is always kept, so a reason whose headline
    names a material's value (a failed property limit) stays whole.
    """
    previous = None
    while previous != reason:
        previous, reason = reason, _VALUES_IN_BRACKETS.sub("", reason)
    first, *rest = reason.split(": ")
    kept = [first]
    for part in rest:
        if _DIGIT.search(part):
            break
        kept.append(part)
    return ": ".join(kept)


@dataclass(frozen=True)
class RejectionGroup:
    """The rejections that share a :func:`reason_summary`.

    Attributes:
        reason: the shared reason, without per-material values.
        material_ids: the materials it applies to, in the order of the rejections.
        families: the section families it applies to, in the order of the rejections.
        count: how many material and family pairs it stands for.
    """

    reason: str
    material_ids: tuple[str, ...]
    families: tuple[str, ...]
    count: int


def grouped_rejections(rejections: Iterable[Rejection]) -> list[RejectionGroup]:
    """One group per reason summary, in the order each summary first appears (so the
    engine's order, reasons a designer can act on first, carries over)."""
    groups: dict[str, tuple[dict[str, None], dict[str, None], list[int]]] = {}
    for rejection in rejections:
        materials, families, count = groups.setdefault(
            reason_summary(rejection.reason), ({}, {}, [0]))
        materials[rejection.material_id] = None
        families[rejection.family] = None
        count[0] += 1
    return [RejectionGroup(reason, tuple(materials), tuple(families), count[0])
            for reason, (materials, families, count) in groups.items()]
