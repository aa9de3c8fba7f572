"""What a request asks of a member: :class:`Demand`, and how a request becomes one."""

from __future__ import annotations

import dataclasses
import math
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np

from service.core.loadcases import LoadCase
from service.core.loading.bearing import NO_FORCES, bearing_forces
from service.core.materials.form_limits import FormLimit
from service.core.sizing.member import MemberDemand, general_form, member_demand
from service.core.sizing.request import DesignRequest


@dataclass(frozen=True)
class Demand:
    """Loads and limits of one load case type (floats, or arrays with a leading case axis).

    Attributes:
        case: the load case (its coefficients).
        span: L, m.
        action: the point or total load P (N) for bending, the torque T (N m) for torsion,
            the axial force P (N, positive) of a tie or a column.
        stiffness_limit: max deflection (m), max twist (rad) or a tie's max extension (m);
            ``inf`` for none.
        safety_factor: SF, dimensionless.
        max_depth: envelope limit on the depth dimension, m (``inf`` for none).
        max_width: envelope limit on the width dimension, m (``inf`` for none).
        min_wall: smallest wall thickness, m (0 for none).
        self_weight: include the member's weight.
        local_buckling: include local buckling.
        lateral_restraint: ``"none"`` or ``"continuous"`` (member buckling of bending cases).
        load_position: ``"shear_centre"`` or ``"top"``.
        end_conditions: a column's supports (None for other cases).
        axial_force: a bending case's axial force, N, positive tension (0 for none).
        twist_limit: max twist (rad) of a general member, ``inf`` for none (a shorthand case
            keeps its limit in ``stiffness_limit``).
        bearing_length: the stiff bearing length s_s, m (0: a knife edge).
        bearing_force: the largest point force, N; bearing_offset: the smallest distance
            from a point force to the nearer end, m (``inf`` for none); bearing_reaction:
            the largest support reaction, N; bearing_unit_reaction: the largest reaction of
            1 N/m over the span, m (:mod:`service.core.loading.bearing`).
        core_direction: a honeycomb core's ribbon direction along the span, ``"weak"`` or
            ``"strong"`` (sandwich panels).
        member: the general member's loading (:mod:`service.core.sizing.member`), or None
            for a shorthand case sized by its coefficients.
        min_size: the smallest outer size the material's process makes, m (0 for none; see
            :mod:`service.core.sizing.manufacturing`, which also folds the process's thinnest
            wall into ``min_wall`` and its largest size into ``max_depth`` and ``max_width``).
        min_side: the thinnest side of a solid rectangle the process makes, m (0 for none).
        made_min_wall: the process's own thinnest wall, m (0 for none), to tell it apart
            from the request's in ``min_wall``.
        made_max_size: the process's own largest size, m (``inf`` for none).
        max_wall_ratio: the largest outer size / wall the process makes (``inf`` for none).
        form_limit: the material's manufacturing limit, for words (a demand of one material;
            None otherwise).
        asked: the request's own demand before the manufacturing limits were folded in
            (None when none were): a design's envelope and min_wall entries measure the
            request's limits, its manufacturing entry the process's.
    """

    case: LoadCase
    span: np.ndarray | float
    action: np.ndarray | float
    stiffness_limit: np.ndarray | float
    safety_factor: np.ndarray | float
    max_depth: np.ndarray | float
    max_width: np.ndarray | float
    min_wall: np.ndarray | float
    self_weight: bool
    local_buckling: bool
    lateral_restraint: str = "none"
    load_position: str = "shear_centre"
    end_conditions: str | None = None
    axial_force: np.ndarray | float = 0.0
    min_size: np.ndarray | float = 0.0
    min_side: np.ndarray | float = 0.0
    made_min_wall: np.ndarray | float = 0.0
    made_max_size: np.ndarray | float = math.inf
    max_wall_ratio: np.ndarray | float = math.inf
    form_limit: FormLimit | None = None
    asked: Demand | None = None
    twist_limit: np.ndarray | float = math.inf
    bearing_length: np.ndarray | float = 0.0
    bearing_force: np.ndarray | float = 0.0
    bearing_offset: np.ndarray | float = math.inf
    bearing_reaction: np.ndarray | float = 0.0
    bearing_unit_reaction: np.ndarray | float = 0.0
    core_direction: str = "weak"
    member: MemberDemand | None = None

    @property
    def bending(self) -> bool:
        """Whether the load case is a bending case (else torsion)."""
        return self.case.loading == "bending"

    @property
    def torsion(self) -> bool:
        """Whether the load case is the torsion case."""
        return self.case.loading == "torsion"

    @property
    def axial(self) -> bool:
        """Whether the load case is a tie or a column."""
        return self.case.loading in ("tension", "compression")

    def replace(self, **changes: Any) -> Demand:
        """This demand with ``changes`` (field name -> value), as ``dataclasses.replace``
        gives it, without building every field again through ``__init__`` (a Demand checks
        nothing when built): the engine makes one per material and family, and maps them
        over cases and rows."""
        if unknown := changes.keys() - _FIELD_NAMES:
            raise TypeError(f"Demand has no field {sorted(unknown)[0]!r}")
        demand = object.__new__(Demand)
        demand.__dict__.update(self.__dict__, **changes)
        return demand

    @classmethod
    def stack(cls, demands: Sequence[Demand]) -> Demand:
        """Demands of one load case type and flags as one, with a leading case axis: every
        numeric field of shape (C, 1, 1)."""
        stacked: dict[str, Any] = {
            name: np.array([getattr(d, name) for d in demands], dtype=float)[:, None, None]
            for name in DEMAND_VALUES}
        if demands[0].member is not None:
            stacked["member"] = MemberDemand.stack([d.member for d in demands
                                                    if d.member is not None])
        return demands[0].replace(**stacked)

    def take(self, index) -> Demand:
        """The demand of the cases or rows ``index`` (of the arrays' leading axis); floats
        are kept."""
        return self._map(lambda value: value[index], lambda value: value[index])

    def take_materials(self, index: np.ndarray) -> Demand:
        """The materials ``index`` of per-material fields (C, K, 1) (fields (C, 1, 1), any
        other without a materials axis and floats are kept)."""
        return self._map(lambda value: value if value.ndim < 3 or value.shape[-2] == 1
                         else np.take(value, index, axis=-2))

    def per_row(self, materials: int) -> Demand:
        """One row per (case, material) element, case-major: fields of shape (C, 1, 1) (or
        (C, materials, 1), per material) become (C * materials, 1); floats are kept."""
        return self._map(lambda value: np.broadcast_to(
            value, np.shape(value)[:-2] + (materials, 1)).reshape(-1, 1),
            lambda index: np.repeat(index, materials, axis=0))

    def row(self, index: int) -> Demand:
        """The demand of row ``index`` of fields (R, 1) as floats (floats are kept; a
        general member keeps that row's structures)."""
        return self._map(lambda value: float(np.reshape(value, (-1,))[index]),
                         lambda rows: rows[index:index + 1])

    def _map(self, function, structures=lambda rows: rows) -> Demand:
        """``function`` applied to every array field (floats are kept), ``structures`` to
        the case index of a general member's per-case structures (case axis first; kept by
        default)."""
        changes: dict[str, Any] = {
            name: function(value) if getattr(value := getattr(self, name), "ndim", 0) else value
            for name in DEMAND_VALUES}
        if self.member is not None:
            changes["member"] = self.member.map_numbers(function, structures)
        return self.replace(**changes)


_FIELD_NAMES = frozenset(field.name for field in dataclasses.fields(Demand))

DEMAND_VALUES = ("span", "action", "stiffness_limit", "safety_factor", "max_depth", "max_width",
                  "min_wall", "axial_force", "min_size", "min_side", "made_min_wall",
                  "made_max_size", "max_wall_ratio", "twist_limit", "bearing_length",
                  "bearing_force", "bearing_offset", "bearing_reaction", "bearing_unit_reaction")
"""The numeric fields of :class:`Demand` (those that may carry arrays)."""


def bearing_fields(request: DesignRequest) -> dict[str, float]:
    """The bearing forces of a request's bending case (:mod:`service.core.loading.bearing`;
    none for torsion, ties and columns), as :class:`Demand` fields."""
    forces = NO_FORCES
    if "bending" in request.loadings:
        supports, actions = general_form(request)
        forces = bearing_forces(supports, request.span, actions)
    return {"bearing_force": forces.force, "bearing_offset": forces.offset,
            "bearing_reaction": forces.reaction,
            "bearing_unit_reaction": forces.unit_reaction}


def demand_of(request: DesignRequest) -> Demand:
    """The scalar :class:`Demand` of a validated request."""
    common: dict[str, Any] = dict(
        case=request.case,
        span=request.span,
        safety_factor=request.safety_factor,
        max_depth=math.inf if request.max_depth is None else request.max_depth,
        max_width=math.inf if request.max_width is None else request.max_width,
        min_wall=0.0 if request.min_wall is None else request.min_wall,
        self_weight=request.self_weight,
        local_buckling=request.local_buckling,
        lateral_restraint=request.lateral_restraint,
        load_position=request.load_position,
        bearing_length=request.bearing_length,
        core_direction=request.core_direction,
        **bearing_fields(request),
    )
    if request.general:
        return Demand(
            action=0.0,
            stiffness_limit=math.inf if request.max_deflection is None
            else request.max_deflection,
            twist_limit=math.inf if request.max_twist is None else request.max_twist,
            member=member_demand(request),
            **common,
        )
    loading = request.case.loading
    limit = {"bending": request.max_deflection, "torsion": request.max_twist,
             "tension": request.max_extension}.get(loading)
    action = request.torque if loading == "torsion" else request.load
    if action is None:
        raise ValueError("a validated request has a load (bending, axial) or a torque")
    return Demand(
        action=action,
        stiffness_limit=math.inf if limit is None else limit,
        end_conditions=request.end_conditions,
        axial_force=0.0 if request.axial_force is None else request.axial_force,
        **common,
    )
