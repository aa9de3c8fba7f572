"""Every entry of a design's ``utilization`` and the rule that names the ``governing`` one,
declared once.

A design's utilization has one entry per check of :data:`~service.core.sizing.checks.CHECKS`
(what the member carries over what it may carry) and one per geometric limit of
:data:`LIMITS` (a dimension over its bound: the envelope, min_wall, the proportion rules).
An entry the request does not ask for is None (null in the response): stiffness without
max_deflection, min_wall without a min_wall or in a solid section, the envelope without one,
the proportion rules of a family that has none or of a catalogue member.

``governing`` is the entry with the largest utilization. The entries at the size a design is
driven to are all 1 to within rounding (strength and the envelope, say, when the envelope
forced the proportions and strength then set the scale); among entries within
:data:`TIE_TOLERANCE` of the largest, the geometric limit comes first (in :data:`LIMITS`
order), since it is what kept the design from the lighter one the checks alone would allow.

The manufacturing limits of a material's process (:mod:`service.core.sizing.manufacturing`)
are one more :class:`GeometricLimit`, last in the tie order: the envelope and min_wall
entries measure the request's own limits, so a design held by them names them, and one held
by the process alone (its thinnest wall, largest size or wall ratio) names the process.
Adding a limit is one more :class:`GeometricLimit` in :data:`LIMITS`; adding a check is one
more module in ``checks/``. Both then appear in every design's utilization, in
``governing``, in the designs schema and in :data:`GOVERNING`.
"""

from __future__ import annotations

from collections.abc import Callable, Mapping
from dataclasses import dataclass

import numpy as np

from service.core.materials.form_limits import measures
from service.core.sections.base import Dimensions, SectionFamily
from service.core.sizing.checks import CHECK_NAMES, CHECKS
from service.core.sizing.demand import Demand

TIE_TOLERANCE = 1e-3
"""Relative closeness to the largest utilization within which a geometric limit is named
governing (rounding to 0.001 mm moves every entry by about that much on a 1 mm wall)."""


@dataclass(frozen=True)
class GeometricLimit:
    """A limit on the dimensions themselves.

    Attributes:
        name: its key in a design's ``utilization`` and its ``governing`` name.
        utilization: (family, dims, demand) -> the dimension over its bound, the largest
            over the dimensions it limits (arrays of the dimensions' shape; <= 1 when met).
        requested: (family, demand, free) -> whether it applies to a design; ``free`` is
            False for a catalogue member (whose proportions are given, not chosen).
        words: how a rejection's reason names it.
    """

    name: str
    utilization: Callable[[SectionFamily, Dimensions, Demand], np.ndarray]
    requested: Callable[[SectionFamily, Demand, bool], bool]
    words: str


def asked(demand: Demand) -> Demand:
    """The request's own demand (without the manufacturing limits folded in)."""
    return demand if demand.asked is None else demand.asked


def envelope_utilization(family: SectionFamily, dims: Dimensions, demand: Demand
                         ) -> np.ndarray:
    """The larger of overall depth / max_depth and overall width / max_width (a sandwich
    panel's width is set to max_width, so only its depth counts), of the request's own
    envelope."""
    demand = asked(demand)
    depth = family.overall_depth(dims) / demand.max_depth
    if family.width_dimension in family.fixed_dimensions:
        return np.asarray(depth, dtype=float)
    return np.maximum(depth, family.overall_width(dims) / demand.max_width)


def min_wall_utilization(family: SectionFamily, dims: Dimensions, demand: Demand
                         ) -> np.ndarray:
    """The request's own min_wall over the thinnest wall (0 for a solid section)."""
    demand = asked(demand)
    return np.asarray(demand.min_wall / family.wall_thickness(dims), dtype=float)


def rules_utilization(family: SectionFamily, dims: Dimensions) -> np.ndarray:
    """The largest, over the family's proportion rules, of a dimension over its bound: the
    dimension over (high x scale dimension), or (low x scale dimension) over the dimension."""
    scale = np.asarray(dims[family.scale_dimension], dtype=float)
    worst = np.zeros(np.shape(scale))
    # Rows without a design carry non-finite dimensions; they give NaN and are never used.
    with np.errstate(divide="ignore", invalid="ignore"):
        for bound in family.ratio_bounds:
            ratio = np.asarray(dims[bound.dimension], dtype=float) / scale
            worst = np.maximum(worst, np.maximum(ratio / bound.high, bound.low / ratio))
    return worst


def proportions_utilization(family: SectionFamily, dims: Dimensions, demand: Demand
                            ) -> np.ndarray:
    """:func:`rules_utilization` (the rules read no demand)."""
    return rules_utilization(family, dims)


def within_rules(family: SectionFamily, dims: Dimensions) -> np.ndarray:
    """True where every proportion rule holds: exactly, so that a design's reported
    ``proportions`` entry (the same function) is never above 1, not even by round-off (the
    rounding then takes another combination of its dimensions)."""
    return rules_utilization(family, dims) <= 1.0


def manufacturing_utilization(family: SectionFamily, dims: Dimensions, demand: Demand
                              ) -> np.ndarray:
    """The largest of the process's limits on a section of its material (see
    :func:`~service.core.materials.form_limits.measures`): smallest size / size, smallest
    side / side, outer size / wall over the largest ratio, thinnest wall / wall, size over
    the largest size."""
    with np.errstate(divide="ignore", invalid="ignore"):
        wall, ratio, size = (np.asarray(v, dtype=float) for v in measures(family.id, dims))
        parts = [demand.min_size / size, ratio / demand.max_wall_ratio,
                 size / demand.made_max_size]
        if family.wall_dimensions:
            parts.append(demand.made_min_wall / wall)
        else:
            parts.append(demand.min_side / wall)
        return np.nan_to_num(np.maximum.reduce(
            [np.broadcast_to(np.asarray(part, dtype=float), np.shape(size)) for part in parts]),
            nan=0.0)


MANUFACTURING = GeometricLimit(
    "manufacturing", manufacturing_utilization,
    lambda family, demand, free: demand.form_limit is not None,
    "what the material's process makes in this form")
ENVELOPE = GeometricLimit(
    "envelope", envelope_utilization,
    lambda family, demand, free: bool(np.isfinite(asked(demand).max_depth) or (
        np.isfinite(asked(demand).max_width)
        and family.width_dimension not in family.fixed_dimensions)),
    "the envelope")
MIN_WALL = GeometricLimit(
    "min_wall", min_wall_utilization,
    lambda family, demand, free: bool(asked(demand).min_wall > 0 and family.wall_dimensions),
    "min_wall")
PROPORTIONS = GeometricLimit(
    "proportions", proportions_utilization,
    lambda family, demand, free: bool(free and family.ratio_bounds),
    "the proportion rules")

LIMITS: tuple[GeometricLimit, ...] = (ENVELOPE, MIN_WALL, PROPORTIONS, MANUFACTURING)
"""Every geometric limit, in the order that breaks a tie for ``governing``."""

LIMIT_NAMES: tuple[str, ...] = tuple(limit.name for limit in LIMITS)
"""The names of :data:`LIMITS`."""

UTILIZATION_KEYS: tuple[str, ...] = (*CHECK_NAMES, *LIMIT_NAMES)
"""Every key of a design's ``utilization``, in the response's order."""

GOVERNING: tuple[str, ...] = (*LIMIT_NAMES, *CHECK_NAMES)
"""Every possible ``governing`` value, in tie-breaking order."""

WORDS: dict[str, str] = {**{check.name: check.words for check in CHECKS},
                         **{limit.name: limit.words for limit in LIMITS}}
"""How a rejection's reason names each entry."""


def design_utilization(family: SectionFamily, dims: Mapping[str, float],
                       checks: Mapping[str, float], demand: Demand, free: bool
                       ) -> dict[str, float | None]:
    """A design's whole ``utilization``: the checks' values (``checks``, from the recheck)
    and the geometric limits' of its dimensions ``dims`` (floats), None where the scalar
    ``demand`` does not ask for an entry; ``free``: the proportions were chosen by the
    sizing (not a catalogue member)."""
    entries: dict[str, float | None] = {
        check.name: float(checks[check.name])
        if check.requested(demand) and check.for_family(family, demand) else None
        for check in CHECKS}
    for limit in LIMITS:
        entries[limit.name] = (_met(float(limit.utilization(family, dims, demand)))
                               if limit.requested(family, demand, free) else None)
    return entries


GEOMETRY_TOLERANCE = 1e-9
"""Relative round-off within which the recheck accepts a dimension at its bound (the
envelope and min_wall tests of :func:`~service.core.sizing.recheck.evaluate`)."""


def _met(ratio: float) -> float:
    """A geometric entry as the recheck judged it: within :data:`GEOMETRY_TOLERANCE` above 1
    (a dimension at its bound but for the last bit) is 1."""
    return 1.0 if 1.0 < ratio <= 1.0 + GEOMETRY_TOLERANCE else ratio


def governing(utilization: Mapping[str, float | None]) -> str:
    """The entry with the largest utilization; among entries within :data:`TIE_TOLERANCE`
    of it, the first of :data:`GOVERNING` (a geometric limit before a check)."""
    given = {name: value for name, value in utilization.items()
             if value is not None and np.isfinite(value)}
    if not given:
        raise ValueError("a design has at least one utilization")
    largest = max(given.values())
    close = [name for name in GOVERNING
             if name in given and given[name] >= largest * (1.0 - TIE_TOLERANCE)]
    return close[0]
