"""Buckling resistance moment of a beam: M_cr reduced for imperfection and yielding.

EN 1993-1-1:2005 6.3.2.2, general case (from memory), with the elastic section modulus
(class 3; the sizing checks first yield, so the plastic reserve is never counted):

    lambda_LT = sqrt(Z f / M_cr),   chi_LT = reduction_factor(lambda_LT, alpha_LT, lambda_0)
    M_b = chi_LT Z f

with the curve of the member's material family (``buckling_curves.lateral_torsional_curve``).
A section that cannot buckle laterally (``LateralTorsionalProperties.susceptible`` False), or
a member whose compression flange is restrained continuously, has M_cr = inf, chi_LT = 1 and
M_b = Z f: the cross-section strength the sizing already checks.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from service.core.stability.buckling_curves import reduction_factor
from service.core.stability.critical_moment import (
    LOAD_POSITIONS,
    CriticalMoment,
    MomentFactors,
)
from service.core.stability.lateral_properties import LateralTorsionalProperties

LATERAL_RESTRAINTS = ("none", "continuous")
"""``none``: the compression flange is free between the supports (the safe default);
``continuous``: a deck, skin or floor holds it all along the span."""


@dataclass(frozen=True)
class LateralTorsionalResistance:
    """Lateral-torsional buckling of beams, every field in the broadcast shape of the inputs
    it reads (the slenderness without the curve's: it broadcasts with the others).

    Attributes:
        critical_moment: M_cr, N m (``inf`` where the member cannot buckle laterally).
        relative_slenderness: lambda_LT, dimensionless.
        reduction: chi_LT, dimensionless, in (0, 1].
        moment_resistance: M_b = chi_LT Z f, N m, before any safety factor.
    """

    critical_moment: np.ndarray
    relative_slenderness: np.ndarray
    reduction: np.ndarray
    moment_resistance: np.ndarray


def relative_slenderness(resistance, critical) -> np.ndarray:
    """sqrt(resistance / critical), dimensionless; 0 where ``critical`` is ``inf``.

    Args:
        resistance: the cross-section's resistance (Z f, N m; or A f, N), > 0.
        critical: the elastic critical value in the same unit, > 0 (may be ``inf``).
    """
    return np.sqrt(np.asarray(resistance, dtype=float) / np.asarray(critical, dtype=float))


def lateral_torsional_resistance(
    factors: MomentFactors, span, youngs_modulus, shear_modulus, strength, section_modulus,
    props: LateralTorsionalProperties, imperfection, plateau, *,
    load_position: str = "shear_centre", restraint: str = "none",
) -> LateralTorsionalResistance:
    """The buckling resistance moment M_b (see the module docstring).

    Args:
        factors: C1, C2, k, k_w of the load case (floats, or arrays along a cases axis).
        span: L, m.
        youngs_modulus, shear_modulus: E and G, Pa (arrays along a materials axis).
        strength: f, the design strength, Pa.
        section_modulus: Z, the elastic section modulus about the major axis, m^3.
        props: the section's lateral-torsional constants (shape ``S``).
        imperfection, plateau: alpha_LT and lambda_0 of the material's curve.
        load_position: ``"shear_centre"`` or ``"top"`` (see ``critical_moment``).
        restraint: ``"none"`` or ``"continuous"`` (:data:`LATERAL_RESTRAINTS`).

    Returns:
        :class:`LateralTorsionalResistance` in the broadcast shape of every argument.
    """
    return LateralTorsional.of(
        factors, span, youngs_modulus, shear_modulus, strength, imperfection, plateau,
        load_position=load_position, restraint=restraint).resistance(section_modulus, props)


@dataclass(frozen=True)
class LateralTorsional:
    """Lateral-torsional buckling of one member (load case, span, material, load position and
    restraint), what does not depend on the section computed once (a scale search asks it of
    the same member at many scales); M_b of sections by :meth:`resistance` (see
    :func:`lateral_torsional_resistance`).

    Attributes:
        critical: the three-factor formula's terms (``critical_moment.CriticalMoment``).
        strength: f, the design strength, Pa.
        imperfection, plateau: alpha_LT and lambda_0 of the material's curve.
        load_position: ``"shear_centre"`` or ``"top"``.
        restraint: ``"none"`` or ``"continuous"``.
    """

    critical: CriticalMoment
    strength: np.ndarray
    imperfection: np.ndarray | float
    plateau: np.ndarray | float
    load_position: str = "shear_centre"
    restraint: str = "none"

    @classmethod
    def of(cls, factors: MomentFactors, span, youngs_modulus, shear_modulus, strength,
           imperfection, plateau, *, load_position: str = "shear_centre",
           restraint: str = "none") -> LateralTorsional:
        """The member's terms (arguments as for :func:`lateral_torsional_resistance`)."""
        if load_position not in LOAD_POSITIONS:
            raise ValueError(f"unknown load position {load_position!r}")
        if restraint not in LATERAL_RESTRAINTS:
            raise ValueError(f"unknown lateral restraint {restraint!r}")
        return cls(CriticalMoment.of(factors, span, youngs_modulus, shear_modulus),
                   np.asarray(strength, dtype=float), imperfection, plateau, load_position,
                   restraint)

    def resistance(self, section_modulus, props: LateralTorsionalProperties
                   ) -> LateralTorsionalResistance:
        """M_b of sections with the elastic modulus Z (m^3) and the constants ``props``."""
        height = props.top_load_height if self.load_position == "top" else 0.0
        critical = self.critical.at(props.minor_second_moment, props.torsion_constant,
                                    props.warping_constant, height)
        return resistance_of(critical, self.strength, section_modulus, props,
                             self.imperfection, self.plateau, restraint=self.restraint)


def resistance_of(critical, strength, section_modulus, props: LateralTorsionalProperties,
                  imperfection, plateau, *, restraint: str = "none"
                  ) -> LateralTorsionalResistance:
    """M_b from an elastic critical moment M_cr (N m) found by any method: ``inf`` where the
    section cannot buckle laterally or the restraint is continuous, then the reduction of
    the module docstring (arguments as for :func:`lateral_torsional_resistance`)."""
    free = props.susceptible if restraint == "none" else False
    if not (np.shape(free) == np.shape(critical) and np.count_nonzero(free) == np.size(free)):
        critical = np.where(free, critical, np.inf)     # (every section free: as it is)
    elastic_resistance = np.asarray(strength, dtype=float) * np.asarray(section_modulus)
    slenderness = relative_slenderness(elastic_resistance, critical)
    reduction = reduction_factor(slenderness, imperfection, plateau)
    return LateralTorsionalResistance(
        critical_moment=critical,
        relative_slenderness=slenderness,
        reduction=reduction,
        moment_resistance=reduction * elastic_resistance,
    )
