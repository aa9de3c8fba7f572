"""The sizing request (a frozen mirror of the POST /v1/designs body, SI floats) and its checks."""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Literal

from service.core.errors import InputError
from service.core.indices import OBJECTIVES
from service.core.loadcases import LOAD_CASES, LoadCase
from service.core.loading.actions import Action
from service.core.loading.problems import member_problems, requirement_problems
from service.core.materials import BASES
from service.core.materials.core_direction import CORE_DIRECTIONS
from service.core.materials.limits import PropertyLimit, limit_problems
from service.core.materials.vocabulary import FAMILIES as MATERIAL_FAMILIES
from service.core.sections import FAMILIES
from service.core.sizing.results import REJECTION_MODES
from service.core.sizing.rules import RuleOverride, check_overrides
from service.core.stability.columns import EFFECTIVE_LENGTH_FACTORS
from service.core.stability.critical_moment import LOAD_POSITIONS
from service.core.stability.lateral_torsional import LATERAL_RESTRAINTS

Objective = Literal["mass", "cost", "carbon"]

STEPS_PER_METRE = 1_000_000
"""Returned dimensions are whole multiples of 1 / STEPS_PER_METRE m, i.e. 0.001 mm. Fine
enough that rounding costs under 0.1 % of mass on a 1 mm wall (the sizing's exactness target
is 0.5 %); dividing whole steps by this integer gives the double nearest the decimal value, so
the numbers print cleanly (0.002999, not 0.0029990000000000003)."""

DIMENSION_RESOLUTION = 1.0 / STEPS_PER_METRE
"""m: the size of one rounding step."""


@dataclass(frozen=True)
class CatalogMember:
    """One discrete section of a catalogue.

    Attributes:
        designation: the catalogue's name for it, e.g. ``"CHS 48.3x3.2"``.
        family: section family id.
        dimensions: dimension name -> metres.
        material_families: the material families it is made in (material family ids, e.g.
            ``("steel",)`` for a hot-rolled series); empty: any material.
    """

    designation: str
    family: str
    dimensions: dict[str, float]
    material_families: tuple[str, ...] = ()


@dataclass(frozen=True)
class DesignRequest:
    """What to size (every number SI; the API layer has already converted units).

    Attributes:
        load_case: a :data:`~service.core.loadcases.LOAD_CASES` id.
        span: member length L, m.
        load: point load, or total load for uniform cases, N (bending cases).
        torque: applied torque, N m (torsion case).
        axial_force: an axial force on a bending case (a beam-column), N, positive tension,
            negative compression; None for none.
        end_conditions: a column's supports, a key of
            ``stability.columns.EFFECTIVE_LENGTH_FACTORS`` (column case only).
        max_deflection: allowed peak deflection, m, or None (bending).
        max_extension: allowed extension of a tie, m, or None (tie case).
        max_twist: allowed angle of twist, rad, or None (torsion).
        safety_factor: divides the strength and the local buckling stress (>= 1).
        local_buckling: check local buckling of walls, flanges and faces.
        self_weight: add the member's own weight rho A g as a uniform load.
        lateral_restraint: ``"none"`` (the compression flange is free between the supports:
            lateral-torsional buckling is checked) or ``"continuous"`` (bending cases).
        load_position: ``"shear_centre"`` or ``"top"`` (a destabilising load on the top
            surface), for lateral-torsional buckling (bending cases).
        bearing_length: the stiff bearing length s_s under point loads and at supports, m
            (0, the default: a knife edge, the safe assumption), for the bearing check.
        core_direction: the honeycomb ribbon direction along the span of a sandwich panel,
            ``"weak"`` (W, the default) or ``"strong"`` (L).
        allow_brittle: size brittle materials too (by default they are rejected with the
            reason; see :mod:`service.core.materials.brittleness`).
        property_limits: bounds on material properties (on ``property_basis``); a material
            that fails one is rejected with the limit it failed.
        max_depth: envelope limit on the family's depth dimension, m, or None.
        max_width: envelope limit on the width dimension, m, or None (the panel width of a
            sandwich panel, required for that family).
        min_wall: smallest allowed wall, flange, web or face thickness, m, or None.
        objective: what to minimise: ``"mass"`` (kg), ``"cost"`` or ``"carbon"`` (kg CO2e).
        property_basis: ``"design"`` (low strength, typical stiffness and density),
            ``"typical"`` or ``"conservative"`` material values.
        sections: family ids to size, or None for every family that carries the loading.
        top: keep only the best ``top`` designs, or None for all.
        catalog: discrete sections to choose from instead of free proportions for the families
            they cover (empty: size every family continuously).
        proportions: the request's own proportion rules, narrowing or widening the families'
            (see :mod:`service.core.sizing.rules`; empty: the families' rules).
        supports: the supports of a general member (load case ``member``), one of
            ``service.core.loading.actions.SUPPORTS``.
        rotating: a rotating shaft (general member): bending fully reversed in fatigue.
        twist_free_at_right_end: the support at x = L of a general member does not restrain
            twist (a shaft driven and held in torsion from x = 0 only).
        actions: the actions on a general member (:class:`~service.core.loading.actions
            .Action`, SI).
        min_frequency: required first bending frequency, Hz, or None.
        fatigue_cycles: the life at which the cyclic parts are checked for fatigue, or None.
        diagrams: return each design's internal-action diagrams.
        rejections: how the answer lists the rejections, one of
            :data:`~service.core.sizing.results.REJECTION_MODES` (the API's choice: the
            engine finds every rejection whatever it is).
    """

    load_case: str
    span: float
    load: float | None = None
    torque: float | None = None
    axial_force: float | None = None
    end_conditions: str | None = None
    max_deflection: float | None = None
    max_extension: float | None = None
    max_twist: float | None = None
    safety_factor: float = 1.0
    local_buckling: bool = True
    self_weight: bool = False
    lateral_restraint: str = "none"
    load_position: str = "shear_centre"
    bearing_length: float = 0.0
    core_direction: str = "weak"
    allow_brittle: bool = False
    property_limits: tuple[PropertyLimit, ...] = ()
    max_depth: float | None = None
    max_width: float | None = None
    min_wall: float | None = None
    objective: Objective = "mass"
    property_basis: Literal["typical", "conservative", "design"] = "design"
    sections: tuple[str, ...] | None = None
    top: int | None = None
    catalog: tuple[CatalogMember, ...] = field(default=())
    proportions: tuple[RuleOverride, ...] = field(default=())
    supports: str | None = None
    rotating: bool = False
    twist_free_at_right_end: bool = False
    actions: tuple[Action, ...] = ()
    min_frequency: float | None = None
    fatigue_cycles: float | None = None
    diagrams: bool = False
    rejections: str = "grouped"

    @property
    def case(self) -> LoadCase:
        """The load case of ``load_case`` (its coefficients; :data:`MEMBER_CASE` for a
        general member)."""
        return MEMBER_CASE if self.load_case == MEMBER else LOAD_CASES[self.load_case]

    @property
    def general(self) -> bool:
        """Sized as a general member: load case ``member``, or a shorthand case with a
        frequency or fatigue requirement or asking for diagrams (in its general form)."""
        return (self.load_case == MEMBER or self.min_frequency is not None
                or self.fatigue_cycles is not None or self.diagrams)

    @property
    def loadings(self) -> tuple[str, ...]:
        """What a section family must carry: bending, torsion, or both (a general member
        with transverse loads and torques)."""
        if self.load_case != MEMBER:
            return (self.case.loading,)
        kinds = {action.kind for action in self.actions}
        needed = []
        if kinds - {"torque"} or self.self_weight or self.min_frequency is not None:
            needed.append("bending")
        if "torque" in kinds:
            needed.append("torsion")
        return tuple(needed) or ("bending",)

    @property
    def families(self) -> tuple[str, ...]:
        """The family ids to size: as given, else those of the catalogue, else every family
        that carries the loading (registry order)."""
        if self.sections is not None:
            return tuple(self.sections)
        covered = {member.family for member in self.catalog}
        # a beam-column needs a family that carries axial force as well
        axial = ("compression",) if self.axial_force else ()
        return tuple(fid for fid, family in FAMILIES.items()
                     if carries(family, self.loadings) and set(axial) <= set(family.loadings)
                     and (not covered or fid in covered))


MEMBER = "member"
"""The load case type of a general member (contract: "General member loading")."""

MEMBER_CASE = LoadCase(
    MEMBER, "bending", "a general member: supports and a list of actions",
    0.0, 0.0, 0.0, 0.0, None,
    "exact Euler-Bernoulli lines of service.core.loading (Macaulay's method)",
)
"""The :class:`LoadCase` of a general member: its coefficients are not used (the member's
own lines are, :mod:`service.core.sizing.member`)."""


def carries(family, loadings: tuple[str, ...]) -> bool:
    """Whether a section family carries every one of ``loadings``."""
    return all(loading in family.loadings for loading in loadings)


def _positive(errors, path, value, *, allow_none=True):
    if value is None:
        if not allow_none:
            errors.setdefault(path, []).append("is required")
        return
    if not (isinstance(value, int | float) and math.isfinite(value) and value > 0):
        errors.setdefault(path, []).append("must be a finite number greater than 0")


def _check_named_families(request: DesignRequest, errors: dict) -> None:
    """A family the client names must be possible at all: carry the loading, and fit the
    envelope with walls of at least min_wall. (Families taken by default that cannot are
    rejected with the reason instead; naming one is a request nothing can meet.)"""
    for index, family_id in enumerate(request.sections or ()):
        family = FAMILIES[family_id]
        if not carries(family, request.loadings):
            errors.setdefault(f"sections.{index}", []).append(
                f"{family_id} does not carry {' and '.join(request.loadings)}")
        elif request.axial_force and "compression" not in family.loadings:
            errors.setdefault(f"sections.{index}", []).append(
                f"{family_id} does not carry an axial force (axial_force)")
        elif request.general and family_id == "sandwich_panel":
            errors.setdefault(f"sections.{index}", []).append(
                "sandwich panels take the shorthand load cases without frequency, fatigue or "
                "diagrams")
        elif family.fixed_dimensions and request.max_width is None:
            errors.setdefault("max_width", []).append(
                f"is required for {family_id}: it is the panel width")
        elif request.min_wall is not None and not _fits(family, request):
            errors.setdefault("min_wall", []).append(
                f"{family_id} cannot have walls of {request.min_wall:g} m inside the envelope")


def _fits(family, request: DesignRequest) -> bool:
    """Whether the largest section the envelope allows can have every wall at min_wall."""
    unbounded = 1e3  # m: room to spare for a dimension the envelope does not limit
    dims = {name: unbounded for name in family.dimension_names}
    dims.update({name: request.min_wall for name in family.wall_dimensions})
    # Depth the walls add outside the depth dimension (a sandwich's faces: c + 2t).
    excess = float(family.overall_depth(dims)) - dims[family.depth_dimension]
    limits = ((family.width_dimension, request.max_width),
              (family.depth_dimension, None if request.max_depth is None
               else request.max_depth - excess))
    for name, limit in limits:
        if limit is not None:
            dims[name] = min(dims[name], limit)
    try:
        family.validate(dims)
    except InputError:
        return False
    return True


AXIAL = ("tension", "compression")
"""The loadings of the axial cases (tie, column)."""


def _check_axial(request: DesignRequest, loading: str, errors: dict) -> None:
    """The fields of ties and columns, and those that belong to them alone."""
    if loading in AXIAL:
        if request.load is None:
            errors["load"] = [f"is required for the {request.load_case} case"]
        elif not (math.isfinite(request.load) and request.load > 0):
            errors["load"] = [
                "must be a finite number greater than 0: a tie carries tension, given positive"
                if loading == "tension" else
                "must be a finite number greater than 0: a column's compression, given positive"]
        for name, value in (("max_deflection", request.max_deflection),
                            ("max_twist", request.max_twist), ("torque", request.torque)):
            if value is not None:
                errors.setdefault(name, []).append(
                    f"does not apply to the {request.load_case} case")
        if request.self_weight:
            errors["self_weight"] = ["applies to bending cases only"]
    if loading == "compression" and request.end_conditions is None:
        errors["end_conditions"] = ["is required for the column case"]
    if request.end_conditions is not None:
        if loading != "compression":
            errors["end_conditions"] = ["applies to the column case only"]
        elif request.end_conditions not in EFFECTIVE_LENGTH_FACTORS:
            errors["end_conditions"] = [
                f"must be one of {', '.join(EFFECTIVE_LENGTH_FACTORS)}"]
    if request.axial_force is not None:
        if loading != "bending":
            errors["axial_force"] = [
                "applies to bending cases (a beam-column); a tie or a column takes load"
                if loading in AXIAL else "applies to bending cases only, not torsion"]
        elif not (math.isfinite(request.axial_force) and abs(request.axial_force) <= 1e8):
            errors["axial_force"] = ["must be a finite number between -1e8 and 1e8 N"]
    if request.max_extension is not None and loading != "tension":
        errors.setdefault("max_extension", []).append("applies to the tie case only")
    if loading in AXIAL:
        # a tie or a column is sized by its own formulas, not in the general form
        for name in ("min_frequency", "fatigue_cycles"):
            if getattr(request, name) is not None:
                errors.setdefault(name, []).append(
                    f"does not apply to the {request.load_case} case yet")
        if request.diagrams:
            errors.setdefault("diagrams", []).append(
                f"does not apply to the {request.load_case} case yet")
    elif request.load_case == MEMBER and request.axial_force is not None:
        errors["axial_force"] = [
            "applies to the shorthand bending cases; a member case lists an axial action"]
MIN_MEMBER_SPAN = 1e-3
"""m: the shortest general member (far below any light structural member, common practice;
shorter spans only lose the member's lines to round-off)."""


def _check_member(request: DesignRequest, errors: dict) -> None:
    """A general member: its supports and actions (by path: ``actions.2.at``), and no
    shorthand fields."""
    if request.supports is None:
        errors.setdefault("supports", []).append("is required for the member load case")
        return
    if isinstance(request.span, int | float) and 0 < request.span < MIN_MEMBER_SPAN:
        errors.setdefault("span", []).append(
            f"a member case needs a span of at least {MIN_MEMBER_SPAN:g} m")
    for path, messages in member_problems(request.supports, request.span,
                                          request.actions).items():
        if path != "span":  # the span has its own check
            errors.setdefault(path, []).extend(messages)
    for name in ("load", "torque"):
        if getattr(request, name) is not None:
            errors.setdefault(name, []).append(
                "applies to the shorthand cases; a member case lists its actions")
    kinds = {action.kind for action in request.actions}
    loads = [action for action in request.actions if action.kind != "mass"
             and action.value != 0]
    if not loads and not request.self_weight and request.min_frequency is None:
        errors.setdefault("actions", []).append(
            "must hold at least one load (or turn on self_weight, or ask for min_frequency)")
    if request.max_twist is not None and "torque" not in kinds:
        errors.setdefault("max_twist", []).append("applies to a member with a torque")


def validate_request(request: DesignRequest) -> None:
    """Raise :class:`InputError` listing every impossible value by its core name (the
    :class:`DesignRequest` attribute, then list indices: ``sections.1``); see
    :func:`service.core.sizing.fields.at_contract_paths` for the contract's paths."""
    errors: dict[str, list[str]] = {}
    case = request.case if request.load_case in (*LOAD_CASES, MEMBER) else None
    if case is None:
        errors["load_case"] = [f"must be one of {', '.join((*LOAD_CASES, MEMBER))}"]
    _positive(errors, "span", request.span, allow_none=False)
    _positive(errors, "max_deflection", request.max_deflection)
    _positive(errors, "max_extension", request.max_extension)
    _positive(errors, "max_twist", request.max_twist)
    _positive(errors, "max_depth", request.max_depth)
    _positive(errors, "max_width", request.max_width)
    _positive(errors, "min_wall", request.min_wall)
    if not (math.isfinite(request.safety_factor) and request.safety_factor >= 1):
        errors["safety_factor"] = ["must be at least 1"]
    if request.load_case == MEMBER:
        _check_member(request, errors)
    else:
        for name in ("actions", "supports", "rotating", "twist_free_at_right_end"):
            if getattr(request, name) not in ((), None, False):
                errors.setdefault(name, []).append(
                    "applies to the member load case; a shorthand case takes load or torque")
    for path, messages in requirement_problems(request.min_frequency,
                                               request.fatigue_cycles).items():
        errors.setdefault(path, []).extend(messages)
    if case is not None and request.load_case != MEMBER and case.loading == "bending":
        if request.load is None:
            errors["load"] = [f"is required for the {case.id} case"]
        elif not (math.isfinite(request.load) and request.load >= 0):
            errors["load"] = ["must be a finite number, at least 0"]
        elif request.load == 0 and not request.self_weight:
            errors["load"] = ["must be greater than 0 unless self_weight is on"]
        if request.max_twist is not None:
            errors.setdefault("max_twist", []).append(
                "applies to the torsion case; a bending case takes max_deflection"
            )
        if request.torque is not None:
            errors.setdefault("torque", []).append(
                "applies to the torsion case; a bending case takes load")
    if case is not None and case.loading == "torsion":
        _positive(errors, "torque", request.torque, allow_none=False)
        if request.max_deflection is not None:
            errors.setdefault("max_deflection", []).append(
                "applies to bending cases; the torsion case takes max_twist"
            )
        if request.self_weight:
            errors["self_weight"] = ["applies to bending cases only"]
        if request.load is not None:
            errors.setdefault("load", []).append(
                "applies to bending cases; the torsion case takes torque")
    if request.lateral_restraint not in LATERAL_RESTRAINTS:
        errors["lateral_restraint"] = [f"must be one of {', '.join(LATERAL_RESTRAINTS)}"]
    if request.load_position not in LOAD_POSITIONS:
        errors["load_position"] = [f"must be one of {', '.join(LOAD_POSITIONS)}"]
    if not (math.isfinite(request.bearing_length) and request.bearing_length >= 0):
        errors["bearing_length"] = ["must be a finite length, at least 0 m"]
    if request.core_direction not in CORE_DIRECTIONS:
        errors["core_direction"] = [f"must be one of {', '.join(CORE_DIRECTIONS)}"]
    if case is not None:
        _check_axial(request, case.loading, errors)
    if request.objective not in OBJECTIVES:
        errors["objective"] = [f"must be one of {', '.join(OBJECTIVES)}"]
    if request.property_basis not in BASES:
        errors["property_basis"] = [f"must be one of {', '.join(BASES)}"]
    if request.rejections not in REJECTION_MODES:
        errors["rejections"] = [f"must be one of {', '.join(REJECTION_MODES)}"]
    for index, family_id in enumerate(request.sections or ()):
        if family_id not in FAMILIES:
            errors[f"sections.{index}"] = [f"unknown section family {family_id!r}"]
    if request.sections is not None and not request.sections:
        errors["sections"] = ["must name at least one section family"]
    named = request.sections or ()
    for index, family_id in enumerate(named):
        if family_id in named[:index]:
            errors.setdefault(f"sections.{index}", []).append(f"{family_id} is listed twice")
    errors.update(limit_problems(request.property_limits))
    check_overrides(request.proportions, errors)
    if request.top is not None and request.top < 1:
        errors["top"] = ["must be at least 1"]
    if case is not None and not errors:
        _check_named_families(request, errors)
    for index, member in enumerate(request.catalog):
        family = FAMILIES.get(member.family)
        if family is None:
            errors[f"catalog.{index}.family"] = [f"unknown section family {member.family!r}"]
            continue
        if case is not None and request.load_case in (*LOAD_CASES, MEMBER) \
                and member.family not in request.families:
            errors[f"catalog.{index}.family"] = [
                f"{member.family} is not among the section families sized"]
            continue
        unknown = [f for f in member.material_families if f not in MATERIAL_FAMILIES]
        if unknown:
            errors[f"catalog.{index}.material_families"] = [
                f"unknown material family {', '.join(map(repr, unknown))}; known: "
                f"{', '.join(MATERIAL_FAMILIES)}"]
            continue
        missing = [name for name in family.dimension_names if name not in member.dimensions]
        if missing:
            errors[f"catalog.{index}.dimensions"] = [f"missing {', '.join(missing)}"]
            continue
        try:
            family.validate({k: float(v) for k, v in member.dimensions.items()})
        except InputError as error:
            errors.update(error.prefixed(f"catalog.{index}.dimensions").errors)
    if errors:
        raise InputError(errors)
