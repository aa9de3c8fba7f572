"""The requirements a member is checked against, one module each.

Each module holds one :class:`Check`: its ``name`` (the key of a design's ``utilization``
and a possible ``governing``) and ``utilization(actions, materials, demand)``, the ratio of
what the member carries to what it may carry (<= 1 when met; 0 when the request does not
ask for it), over arrays that broadcast together. :func:`service.core.sizing.recheck.evaluate`
computes the member's :class:`Actions` once and asks every check of :data:`CHECKS`; the
designs schema lists the same names. A check that bounds the scale of self-similar sections
also has its ``scale_bound`` (its smallest scale at fixed proportions, for both the shorthand
cases and a general member), which :func:`service.core.sizing.scale.scale_bounds` asks of
every check in :data:`CHECK_NAMES` order; the sandwich panel's checks, with their own
physics, live in :mod:`service.core.sizing.sandwich`.
"""

from service.core.sizing.checks.base import Actions, Check
from service.core.sizing.checks.bearing import BEARING
from service.core.sizing.checks.fatigue import FATIGUE
from service.core.sizing.checks.frequency import FREQUENCY
from service.core.sizing.checks.interaction import INTERACTION
from service.core.sizing.checks.local_buckling import LOCAL_BUCKLING
from service.core.sizing.checks.member_buckling import MEMBER_BUCKLING
from service.core.sizing.checks.stiffness import STIFFNESS
from service.core.sizing.checks.strength import STRENGTH

CHECKS: tuple[Check, ...] = (STIFFNESS, STRENGTH, LOCAL_BUCKLING, MEMBER_BUCKLING, FREQUENCY,
                             FATIGUE, INTERACTION, BEARING)
"""Every check, in the order of a design's ``utilization``."""

CHECK_NAMES: tuple[str, ...] = tuple(check.name for check in CHECKS)
"""The names of :data:`CHECKS`."""

__all__ = ["CHECKS", "CHECK_NAMES", "Actions", "Check"]
