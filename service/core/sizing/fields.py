"""Every scalar field of a design request, declared once.

A declaration names the field's contract path (its place in the POST /v1/designs body, see
schemas/openapi.json), its core name (the :class:`~service.core.sizing.request.DesignRequest`
attribute), its SI unit, its accepted range, its default and whether sweeps may vary it. From
it follow the request schema (service/api/designs/schemas.py), the core's inputs
(:func:`request_values`), the sweepable paths (:data:`SWEEPABLE_PATHS`), the fields that may
differ inside a group sized together (:data:`DEMAND_FIELDS`) and the JSON paths of the core's
errors (:func:`at_contract_paths`). The core itself speaks in core names only.

A new requirement field is one more declaration here (and its physics in the sizing core).
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass
from typing import Literal

from service.core.errors import InputError
from service.core.indices import OBJECTIVES
from service.core.loadcases import LOAD_CASES
from service.core.loading.actions import SUPPORTS
from service.core.materials import BASES
from service.core.materials.core_direction import CORE_DIRECTIONS
from service.core.sizing.results import REJECTION_MODES
from service.core.stability.columns import EFFECTIVE_LENGTH_FACTORS
from service.core.stability.critical_moment import LOAD_POSITIONS
from service.core.stability.lateral_torsional import LATERAL_RESTRAINTS

Lower = Literal["positive", "non_negative", "at_least_one", "signed"]


@dataclass(frozen=True)
class RequestField:
    """One scalar field of a design request.

    Attributes:
        path: the contract path, dotted (``"load_case.span"``).
        name: the core name, the :class:`DesignRequest` attribute (``"span"``).
        unit: the SI unit of a number (``"m"``, ``"N"``, ``""`` for a pure number); None for
            a flag or a choice.
        lower: the lower limit of a number: ``"positive"`` (> 0), ``"non_negative"`` (>= 0),
            ``"at_least_one"`` (>= 1) or ``"signed"`` (>= -cap).
        cap: the largest accepted number.
        choices: the accepted values of a choice.
        default: the value when the field is absent (None: no value).
        required: the request must give it.
        sweepable: sweeps may vary it.
        description: what it means, for the API documentation (empty: none).
    """

    path: str
    name: str
    unit: str | None = None
    lower: Lower | None = None
    cap: float | None = None
    choices: tuple[str, ...] | None = None
    default: object = None
    required: bool = False
    sweepable: bool = True
    description: str = ""

    @property
    def group(self) -> str:
        """The contract object that holds the field (``"load_case"``; ``""`` at the top)."""
        return self.path.rpartition(".")[0]

    @property
    def key(self) -> str:
        """The field's key inside that object."""
        return self.path.rpartition(".")[2]

    @property
    def number(self) -> bool:
        """A number with a unit (one that may differ inside a group sized together)."""
        return self.unit is not None


# Caps: far beyond any light member (common practice for the scope of a preliminary sizing
# service), and small enough that no intermediate result overflows.
REQUEST_FIELDS: tuple[RequestField, ...] = (
    RequestField("load_case.type", "load_case", choices=(*LOAD_CASES, "member"), required=True,
                 description=("a shorthand case, or member: a general member with its "
                              "supports and a list of actions")),
    RequestField("load_case.span", "span", "m", "positive", 1e3, required=True,
                 description="member length, m"),
    RequestField("load_case.load", "load", "N", "non_negative", 1e8, description=(
        "point load, or the total load of a uniform case, N (bending cases); the axial "
        "force of a tie (tension) or a column (compression), N, given positive")),
    RequestField("load_case.end_conditions", "end_conditions",
                 choices=tuple(EFFECTIVE_LENGTH_FACTORS), description=(
        "column case (required there): pinned_pinned, fixed_free, fixed_pinned or "
        "fixed_fixed")),
    RequestField("load_case.axial_force", "axial_force", "N", "signed", 1e8, description=(
        "bending cases: an axial force as well (a beam-column), N, positive tension, negative "
        "compression")),
    RequestField("load_case.torque", "torque", "N*m", "positive", 1e8,
                 description="applied torque, N m (torsion case)"),
    RequestField("load_case.supports", "supports", choices=SUPPORTS, sweepable=False,
                 description="member case: the supports (a cantilever is fixed at x = 0)"),
    RequestField("load_case.rotating", "rotating", default=False, sweepable=False,
                 description=("member case: a rotating shaft, whose bending stress is fully "
                              "reversed in fatigue")),
    RequestField("load_case.twist_free_at_right_end", "twist_free_at_right_end", default=False,
                 sweepable=False, description=(
                     "member case: the support at x = L does not restrain twist (a shaft "
                     "held in torsion at x = 0 only); by default every support restrains it")),
    RequestField("requirements.max_deflection", "max_deflection", "m", "positive", 10.0,
                 description="allowed peak deflection (bending)"),
    RequestField("requirements.max_extension", "max_extension", "m", "positive", 10.0,
                 description="allowed extension of a tie"),
    RequestField("requirements.max_twist", "max_twist", "rad", "positive", 100.0,
                 description="allowed angle of twist (torsion)"),
    RequestField("requirements.min_frequency", "min_frequency", "Hz", "positive", 1e6,
                 description=(
                     "required first bending natural frequency with the member's own and "
                     "attached masses (Dunkerley's estimate, which errs on the safe side)")),
    RequestField("requirements.fatigue_cycles", "fatigue_cycles", "", "at_least_one", 1e12,
                 description=(
                     "life, in cycles, at which the cyclic parts of the actions are checked "
                     "for fatigue (modified Goodman)")),
    RequestField("requirements.safety_factor", "safety_factor", "", "at_least_one", 100.0,
                 default=1.0, description=(
                     "divides the strength and the local buckling stress (default 1)")),
    RequestField("requirements.local_buckling", "local_buckling", default=True),
    RequestField("requirements.self_weight", "self_weight", default=False,
                 description="add the member's own weight as a uniform load"),
    RequestField("requirements.lateral_restraint", "lateral_restraint",
                 choices=LATERAL_RESTRAINTS, default="none", description=(
        "bending cases: none (default, the safe assumption: the compression flange is free "
        "between the supports and lateral-torsional buckling is checked) or continuous (a "
        "deck, skin or floor holds it all along the span)")),
    RequestField("requirements.load_position", "load_position", choices=LOAD_POSITIONS,
                 default="shear_centre", description=(
        "bending cases: where the load acts on the section, at the shear centre (default) or "
        "on top (destabilising: it lowers the critical moment)")),
    RequestField("requirements.bearing_length", "bearing_length", "m", "non_negative", 100.0,
                 default=0.0, description=(
        "stiff bearing length under point loads and at supports, m: 0 (default) is a knife "
        "edge, the safe assumption; webs are checked for patch loading (EN 1993-1-5 sec. 6), "
        "round tubes for local crushing and sandwich panels for core indentation")),
    RequestField("requirements.core_direction", "core_direction", choices=CORE_DIRECTIONS,
                 default="weak", description=(
        "sandwich panels with a honeycomb core: the ribbon direction along the span, weak "
        "(W, default: the safe assumption) or strong (L); it sets the core's shear modulus "
        "and shear strength")),
    RequestField("requirements.allow_brittle", "allow_brittle", default=False, sweepable=False,
                 description=(
        "size brittle materials too (ceramics, glasses, grey iron, timber...: strain at break "
        "under 5 % and low fracture toughness); left out by default, since they may break "
        "without warning")),
    RequestField("envelope.max_depth", "max_depth", "m", "positive", 100.0),
    RequestField("envelope.max_width", "max_width", "m", "positive", 100.0, description=(
        "also the panel width of sandwich panels (required for them)")),
    RequestField("min_wall", "min_wall", "m", "positive", 1.0,
                 description="smallest wall, flange, web or face thickness"),
    RequestField("objective", "objective", choices=OBJECTIVES, default="mass"),
    RequestField("diagrams", "diagrams", default=False, sweepable=False, description=(
        "add each design's diagrams: shear, moment, torque, axial force and deflection "
        "sampled along the member")),
    RequestField("rejections", "rejections", choices=REJECTION_MODES, default="grouped",
                 sweepable=False, description=(
        "how the answer lists the materials and families without a design: grouped (default: "
        "one entry per reason, with the materials and families it applies to and their "
        "count), all (one entry per material and family, with its full reason) or none")),
    RequestField("property_basis", "property_basis", choices=BASES, default="design",
                 description=(
        "material values: design (default: low strength, typical stiffness and density), "
        "typical, or conservative (low strength and stiffness, high density)")),
)
"""Every scalar request field, in the order of the contract."""

SWEEPABLE_PATHS: dict[str, str] = {f.path: f.name for f in REQUEST_FIELDS if f.sweepable}
"""Contract path of a field sweeps may vary -> its core name."""

DEMAND_FIELDS: tuple[str, ...] = tuple(f.name for f in REQUEST_FIELDS if f.number)
"""The core names of the numbers: requests that differ only in these are sized together."""

ACTION_FIELDS = {"value": "value", "at": "at", "from": "start", "to": "end"}
"""A member action's fields sweeps may vary (contract name -> core name); the path
``load_case.actions.<i>.<name>`` names one of the base request's actions."""


def action_path(path: str) -> tuple[int, str] | None:
    """(action index, core field name) of a path ``load_case.actions.<i>.<field>``, or None
    for any other path."""
    parts = path.split(".")
    if (len(parts) == 4 and parts[:2] == ["load_case", "actions"] and parts[2].isdigit()
            and parts[3] in ACTION_FIELDS):
        return int(parts[2]), ACTION_FIELDS[parts[3]]
    return None


CONTRACT_PATHS: dict[str, str] = {f.name: f.path for f in REQUEST_FIELDS} | {
    "property_limits": "requirements.property_limits", "actions": "load_case.actions"}
"""Core name -> contract path (the declared fields, the property limits and a member's
actions, objects)."""


def request_values(body: Mapping) -> dict[str, object]:
    """Core name -> value of every declared field of a request body shaped like the contract
    (already in SI; an absent field takes its default)."""
    values = {}
    for field in REQUEST_FIELDS:
        node: object = body
        for key in field.group.split(".") if field.group else ():
            node = (node.get(key) or {}) if isinstance(node, Mapping) else {}
        values[field.name] = (node.get(field.key, field.default) if isinstance(node, Mapping)
                              else field.default)
    return values


def at_contract_paths(error: InputError) -> InputError:
    """``error`` with each core name (the first part of a path) replaced by its contract
    path; other paths (``sections.1``, ``catalog.0.family``) are the same in both."""
    located: dict[str, list[str]] = {}
    for path, messages in error.errors.items():
        head, dot, rest = path.partition(".")
        located.setdefault(CONTRACT_PATHS.get(head, head) + dot + rest, []).extend(messages)
    return InputError(located)
