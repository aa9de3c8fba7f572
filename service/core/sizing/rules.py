"""Proportion rules: each family's ratio limits (declared once, as the family's
:attr:`~service.core.sections.base.SectionFamily.ratio_bounds`), and a request's own.

A rule bounds one dimension as a multiple of the family's scale dimension; its contract name
is ``"<dimension>/<scale dimension>"`` (``"width/depth"``). The proportion search of the
sizing reads the rules from the family, GET /v1/sections lists them, and a design request may
narrow a rule, or widen it as far as the family's physics still holds
(:attr:`RatioBound.widest_low`, :attr:`RatioBound.widest_high`): :func:`family_for` gives
the family with the request's rules, which the engine sizes.
"""

from __future__ import annotations

import dataclasses
import math
from collections.abc import Iterable
from dataclasses import dataclass

from service.core.sections import FAMILIES
from service.core.sections.base import RatioBound, SectionFamily

FIELD = "proportions"
"""The request field (top level of a designs request) and the core name of the overrides."""


@dataclass(frozen=True)
class RuleOverride:
    """A request's limits for one rule of one family (dimensionless ratios).

    Attributes:
        family: section family id.
        ratio: the rule's contract name, e.g. ``"width/depth"``.
        low: the smallest ratio allowed, or None to keep the family's.
        high: the largest ratio allowed, or None to keep the family's.
    """

    family: str
    ratio: str
    low: float | None = None
    high: float | None = None

    @property
    def path(self) -> str:
        """Its place in the request (``proportions.<family>.<ratio>``)."""
        return f"{FIELD}.{self.family}.{self.ratio}"


def rules_of(family: SectionFamily) -> dict[str, RatioBound]:
    """The family's rules by their contract name, in the family's order."""
    return {family.ratio_name(bound): bound for bound in family.ratio_bounds}


def overrides_from(body: object) -> tuple[RuleOverride, ...]:
    """The overrides of a request's ``proportions`` object
    ``{family: {ratio: {"min", "max"}}}`` (already in SI; None: no overrides)."""
    if not isinstance(body, dict):
        return ()
    return tuple(RuleOverride(family, ratio, limits.get("min"), limits.get("max"))
                 for family, rules in body.items() for ratio, limits in rules.items())


def check_overrides(overrides: Iterable[RuleOverride], errors: dict[str, list[str]]) -> None:
    """Add a message at each bad override's path: an unknown family or rule, a limit that is
    not a positive number, min not below max, or a limit beyond where the physics holds."""
    for override in overrides:
        family = FAMILIES.get(override.family)
        if family is None:
            errors.setdefault(f"{FIELD}.{override.family}", []).append(
                f"unknown section family {override.family!r}")
            continue
        rules = rules_of(family)
        rule = rules.get(override.ratio)
        if rule is None:
            known = ", ".join(rules) or "none"
            errors.setdefault(override.path, []).append(
                f"{override.family} has no proportion rule {override.ratio!r} (its rules: "
                f"{known})")
            continue
        limits = {"min": override.low, "max": override.high}
        good = True
        for key, value in limits.items():
            if value is not None and not (math.isfinite(value) and value > 0):
                errors.setdefault(f"{override.path}.{key}", []).append(
                    "must be a finite number greater than 0")
                good = False
        if not good:
            continue
        low, high = _limits(rule, override)
        if override.low is not None and low < rule.widest_low * (1.0 - 1e-12):
            errors.setdefault(f"{override.path}.min", []).append(
                f"widens the rule beyond where the physics holds: at least "
                f"{rule.widest_low:.4g} ({rule.widest_source})")
        if override.high is not None and high > rule.widest_high * (1.0 + 1e-12):
            errors.setdefault(f"{override.path}.max", []).append(
                f"widens the rule beyond where the physics holds: at most "
                f"{rule.widest_high:.4g} ({rule.widest_source})")
        if low >= high:
            key = "max" if override.high is not None else "min"
            errors.setdefault(f"{override.path}.{key}", []).append(
                f"min must be less than max (they are {low:.4g} and {high:.4g})")


def _limits(rule: RatioBound, override: RuleOverride) -> tuple[float, float]:
    return (rule.low if override.low is None else override.low,
            rule.high if override.high is None else override.high)


def applied(family: SectionFamily, overrides: Iterable[RuleOverride]) -> tuple[RatioBound, ...]:
    """The family's rules with a (checked) request's overrides: a changed rule's source says
    it came from the request and what the family's own rule was."""
    mine = {o.ratio: o for o in overrides if o.family == family.id}
    bounds = []
    for name, rule in rules_of(family).items():
        override = mine.get(name)
        if override is None:
            bounds.append(rule)
            continue
        low, high = _limits(rule, override)
        if (low, high) == (rule.low, rule.high):
            bounds.append(rule)
            continue
        bounds.append(dataclasses.replace(
            rule, low=low, high=high,
            source=f"the request (the family's rule: {rule.low:g} to {rule.high:g}, "
                   f"{rule.source})"))
    return tuple(bounds)


def family_for(family_id: str, overrides: Iterable[RuleOverride]) -> SectionFamily:
    """The family to size: the registered one, with the request's rules where it has any."""
    family = FAMILIES[family_id]
    bounds = applied(family, overrides)
    return family if bounds == family.ratio_bounds else family.with_ratio_bounds(bounds)
