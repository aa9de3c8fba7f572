"""The smallest scale of a section, at fixed proportions, whose member buckling check holds.

At fixed proportions every constant is a power of the scale s (``MemberSection.scaled``), and
every term of the member utilisation falls as s grows: the resistances A f, chi A f and
chi_LT Z f grow at least as s^2 (the reductions chi rise toward 1 as the slenderness falls),
the amplification 1 / (1 - P / P_cr) falls, and a self-weight moment grows only as s^2 against
a moment resistance growing at least as s^3. So u(s) = 1 has one root, found here by
bisection on log2 s over s = 2^-60 .. 2^60 m, every row at once. The buckling formulas have
no closed-form root in s (M_cr mixes s^4, s^5 and s^6 terms under a square root, and chi is
the root of a quadratic), which is why the scale is found numerically.
"""

from __future__ import annotations

import numpy as np

from service.core.stability.member import MemberMaterial, MemberSection, member_utilization

BISECTION_STEPS = 64
"""Halvings of the log2 bracket [-60, 60]: 120 / 2^64 leaves a relative error in s below
1e-17, below double precision."""


def minimum_scale(
    unit: MemberSection, material: MemberMaterial, load_case: str, span, *,
    moment=0.0, self_weight_moment=0.0, axial_force=0.0, end_conditions: str | None = None,
    restraint: str = "none", load_position: str = "shear_centre",
) -> np.ndarray:
    """The smallest scale s (m) with member utilisation <= 1, at the proportions of ``unit``.

    Args:
        unit: the section's constants at scale 1 m (shape ``S``).
        material: as for ``member.member_utilization`` (broadcast with ``S``).
        load_case: a bending load case id or ``"column"``.
        span: L, m.
        moment: the factored peak moment of the applied loads, N m.
        self_weight_moment: the factored peak moment of the member's own weight at scale
            1 m, N m (it grows as s^2 with the area); 0 without self-weight.
        axial_force: the factored axial force, N, positive tension.
        end_conditions, restraint, load_position: as for ``member.member_utilization``.

    Returns:
        s, m, in the broadcast shape of every argument: the upper end of the final bracket,
        so the utilisation at s is at most 1; 0 where no load is applied.
    """
    def utilization(log_scale):
        scale = np.exp2(log_scale)
        return member_utilization(
            unit.scaled(scale), material, load_case, span,
            moment=np.asarray(moment) + np.asarray(self_weight_moment) * scale**2,
            axial_force=axial_force, end_conditions=end_conditions, restraint=restraint,
            load_position=load_position)

    low = np.full(np.shape(utilization(np.array(0.0))), -60.0)   # the arguments' shape
    high = low + 120.0
    unloaded = utilization(low) <= 1.0
    for _ in range(BISECTION_STEPS):
        middle = 0.5 * (low + high)
        holds = utilization(middle) <= 1.0
        high = np.where(holds, middle, high)
        low = np.where(holds, low, middle)
    return np.where(unloaded, 0.0, np.exp2(high))
