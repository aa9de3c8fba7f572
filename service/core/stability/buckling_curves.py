"""Reduction of an elastic buckling load for imperfection and yielding: published buckling curves.

Every curve used here has the Ayrton-Perry form shared by the European standards for steel,
aluminium and timber (EN 1993-1-1:2005 6.3.1.2 eq. 6.49 and 6.3.2.2 eq. 6.56; EN 1999-1-1:2007
6.3.1.2 eq. 6.49 and 6.3.2.2; EN 1995-1-1:2004 6.3.2 eq. 6.25-6.29, from memory):

    phi = 0.5 (1 + alpha (lambda - lambda_0) + lambda^2)
    chi = 1 / (phi + sqrt(phi^2 - lambda^2)),  chi <= 1

with lambda the relative slenderness sqrt(resistance of the cross-section / elastic critical
value), alpha the imperfection factor and lambda_0 the plateau (no reduction below it). The
curve depends on the material family and, for steel, on the section and the buckling mode;
the choice for each is written beside it in :func:`column_curve` and
:func:`lateral_torsional_curve`. EN 1995-1-1 evaluates a timber member's slenderness with the
fifth-percentile modulus E_0.05; here it takes the modulus of the request's property basis
(the ``conservative`` basis takes the low end of the range). Local design codes may
prescribe other curves (stainless steel, composites, timber grades): this is preliminary
sizing.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np


@dataclass(frozen=True)
class BucklingCurve:
    """One buckling curve of the Ayrton-Perry form (see the module docstring).

    Attributes:
        name: short name, e.g. ``"EN 1993-1-1 curve d"``.
        imperfection: alpha, dimensionless.
        plateau: lambda_0, the relative slenderness up to which chi = 1, dimensionless.
        source: the standard and clause it comes from.
    """

    name: str
    imperfection: float
    plateau: float
    source: str


STEEL_C = BucklingCurve(
    "EN 1993-1-1 curve c", 0.49, 0.2, "EN 1993-1-1:2005 6.3.1.2, table 6.1 (from memory)")
STEEL_D = BucklingCurve(
    "EN 1993-1-1 curve d", 0.76, 0.2, "EN 1993-1-1:2005 6.3.1.2, table 6.1 (from memory)")
ALUMINIUM_CLASS_B = BucklingCurve(
    "EN 1999-1-1 flexural buckling, class B", 0.32, 0.0,
    "EN 1999-1-1:2007 6.3.1.2, table 6.6, class B alloys (from memory)")
ALUMINIUM_LATERAL_TORSIONAL = BucklingCurve(
    "EN 1999-1-1 lateral-torsional buckling, class 3 and 4", 0.20, 0.4,
    "EN 1999-1-1:2007 6.3.2.2 (2), class 3 and 4 cross-sections (from memory)")
TIMBER = BucklingCurve(
    "EN 1995-1-1 column curve, solid timber", 0.2, 0.3,
    "EN 1995-1-1:2004 6.3.2 eq. 6.27-6.29, beta_c = 0.2 for solid timber (from memory)")


def column_curve(material_family: str, section_family: str) -> BucklingCurve:
    """The flexural buckling curve of a column of this material and section family.

    - steel: I-sections curve d, every other section curve c. EN 1993-1-1 table 6.2 gives
      c for welded I-sections about the minor axis and for solid and cold-formed hollow
      sections; EN 1993-1-4:2006 5.4.2 table 5.3 gives alpha = 0.76, lambda_0 = 0.2 (curve d)
      for welded open stainless sections. The family holds carbon and stainless grades, so
      the lower of the two applies (from memory).
    - aluminium: EN 1999-1-1 class B (alloys that are not heat treated; class A would be
      less severe for heat-treated tempers; the lower is taken, from memory).
    - wood: EN 1995-1-1 solid timber (beta_c = 0.2; glued laminated timber's 0.1 is less
      severe).
    - every other family (cast iron, titanium, nickel, copper and magnesium alloys,
      polymers, composites, glass, ceramics): no published curve is applied here; curve d,
      the most imperfection-sensitive curve of EN 1993-1-1, is our conservative choice.
      Composites standards (e.g. CEN/TS 19101:2022) and others may differ.
    """
    if material_family == "steel":
        return STEEL_D if section_family == "i_section" else STEEL_C
    if material_family == "aluminium":
        return ALUMINIUM_CLASS_B
    if material_family == "wood":
        return TIMBER
    return STEEL_D


def lateral_torsional_curve(material_family: str, section_family: str) -> BucklingCurve:
    """The lateral-torsional buckling curve of a beam of this material and section family.

    - steel: curve d (EN 1993-1-1 6.3.2.2, tables 6.4 and 6.3, general case: welded
      I-sections with h/b > 2 and "other cross-sections" take d, welded I-sections with
      h/b <= 2 take c; EN 1993-1-4 6.3.3 gives alpha_LT = 0.76 for welded stainless
      sections. Curve d is the lower of them all, from memory).
    - aluminium: EN 1999-1-1 6.3.2.2 with the class 3 and 4 values (alpha_LT = 0.20,
      lambda_0,LT = 0.4): the resistance uses the elastic section modulus, as class 3.
    - wood: the EN 1995-1-1 column curve (beta_c = 0.2). EN 1995-1-1 6.3.3 gives its own
      k_crit for beams (1 up to lambda_rel,m = 0.75, then 1.56 - 0.75 lambda, then
      1 / lambda^2); the column curve lies below it at every slenderness (a test checks
      this), so it is the conservative choice and keeps one formula.
    - every other family: EN 1993-1-1 curve d, our conservative choice (see
      :func:`column_curve`).

    ``section_family`` is accepted for symmetry with :func:`column_curve`; no family
    currently changes the choice.
    """
    del section_family
    if material_family == "aluminium":
        return ALUMINIUM_LATERAL_TORSIONAL
    if material_family == "wood":
        return TIMBER
    return STEEL_D


def curve_arrays(curves: Sequence[BucklingCurve]) -> tuple[np.ndarray, np.ndarray]:
    """Imperfection factors and plateaus of several curves as arrays of shape ``(len(curves),)``,
    to broadcast along a materials axis."""
    return (np.array([curve.imperfection for curve in curves], dtype=float),
            np.array([curve.plateau for curve in curves], dtype=float))


def reduction_factor(relative_slenderness, imperfection, plateau) -> np.ndarray:
    """chi, the Ayrton-Perry reduction factor (see the module docstring), in (0, 1].

    Args:
        relative_slenderness: lambda >= 0, dimensionless (``inf`` gives 0, 0 gives 1).
        imperfection: alpha, dimensionless.
        plateau: lambda_0, dimensionless.

    Returns:
        chi, the broadcast shape of the arguments.
    """
    slenderness = np.asarray(relative_slenderness, dtype=float)
    finite = np.isfinite(slenderness)
    # the usual case: no element to mask (a search calls this often; np.count_nonzero costs
    # a third of finite.all())
    every = np.count_nonzero(finite) == finite.size
    safe = slenderness if every else np.where(finite, slenderness, 0.0)
    phi = 0.5 * (1.0 + np.asarray(imperfection) * (safe - np.asarray(plateau)) + safe**2)
    # phi^2 - lambda^2 >= 0 whenever phi >= lambda; written as a product to avoid cancellation
    root = np.sqrt(np.maximum((phi - safe) * (phi + safe), 0.0))
    chi = np.minimum(1.0 / (phi + root), 1.0)
    return chi if every else np.where(finite, chi, 0.0)
