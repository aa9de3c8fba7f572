"""Elastic critical moment M_cr for lateral-torsional buckling of doubly symmetric members.

The three-factor formula (ENV 1993-1-1:1992 annex F, eq. F.2; NCCI SN003b, Access Steel,
"Elastic critical moment for lateral torsional buckling", eq. 3.1; from memory), here for a
doubly symmetric section (C3 drops out):

    M_cr = C1 pi^2 E I_z / (k L)^2 * ( sqrt( (k / k_w)^2 I_w / I_z
                                             + (k L)^2 G I_t / (pi^2 E I_z)
                                             + (C2 z_g)^2 )  -  C2 z_g )

M_cr is the peak |M| along the member at buckling. C1 (moment gradient) and C2 (load
position) belong to the moment diagram and supports of each load case (the table below,
each value with its source); k and k_w are the effective length factors for lateral bending
and for warping; z_g is the height of the load above the shear centre (0 at the shear centre,
the top of the section for a load on the top flange: destabilising, it lowers M_cr).

Supports as the member sees them laterally, the safe reading of each built-in case:
- simply supported and fixed-fixed: fork supports at both ends (lateral deflection and twist
  prevented, lateral rotation and warping free; k = k_w = 1). In-plane fixity of the
  fixed-fixed beam changes the moment diagram, not the lateral restraint.
- cantilever: root fully fixed (lateral deflection, twist, lateral rotation and warping),
  tip free. Under uniform moment that is exactly a fork-supported beam of twice the span
  (k = k_w = 2, by symmetry; Timoshenko & Gere, Theory of Elastic Stability, 2nd ed., 1961,
  sec. 6.5).

Every factor is compared with an independent finite element solution of the buckling energy
equation in tests/validation/test_critical_moment.py.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

LOAD_POSITIONS = ("shear_centre", "top")
"""Where the load acts on the section: at the shear centre, or on the top surface."""


@dataclass(frozen=True)
class MomentFactors:
    """Factors of the three-factor formula for one load case (floats, or arrays that
    broadcast along a cases axis).

    Attributes:
        moment_gradient: C1, dimensionless, referred to the peak |M| of the case.
        load_height: C2, dimensionless.
        lateral_length: k, effective length factor for lateral bending, dimensionless.
        warping_length: k_w, effective length factor for warping, dimensionless.
        source: where the values come from.
    """

    moment_gradient: float | np.ndarray
    load_height: float | np.ndarray
    lateral_length: float | np.ndarray
    warping_length: float | np.ndarray
    source: str


_TIMOSHENKO = ("Timoshenko & Gere, Theory of Elastic Stability, 2nd ed. 1961, sec. 6.5 "
               "(from memory)")

MOMENT_FACTORS: dict[str, MomentFactors] = {
    "cantilever_end_load": MomentFactors(
        2.555, 1.0, 2.0, 2.0,
        f"C1: {_TIMOSHENKO}, the exact P_cr L^2 = 4.013 sqrt(E I_z G I_t) of a narrow "
        "rectangular cantilever (I_w = 0) with the end load at the centroid, over the "
        "k = 2 reference pi / 2; with warping the true C1 is higher (5.4 at kappa = 4 by the "
        "finite element check), so the value is conservative for I-sections. C2: no "
        "published value at hand; 1.0 is an upper envelope of the C2 implied by the finite "
        "element solution (tests/validation/test_critical_moment.py) over the sections the "
        "sizing produces (conservative)"),
    "cantilever_uniform_load": MomentFactors(
        4.090, 1.6, 2.0, 2.0,
        f"C1: {_TIMOSHENKO}, the exact q_cr L^3 = 12.85 sqrt(E I_z G I_t) of a narrow "
        "rectangular cantilever (I_w = 0) under a uniform load at the centroid, i.e. "
        "M_cr = 6.425 sqrt(E I_z G I_t) / L, over pi / 2; conservative with warping as for "
        "the end load. C2: no published value at hand; 1.6 is an upper envelope of the C2 "
        "implied by the finite element solution (conservative)"),
    "simply_supported_center_load": MomentFactors(
        1.348, 0.630, 1.0, 1.0,
        "NCCI SN003b (Access Steel 2005) table 3.2, k = 1 (from memory); C1 equals "
        "Timoshenko & Gere's P_cr L^2 = 16.94 sqrt(E I_z G I_t) over 4 pi (sec. 6.3)"),
    "simply_supported_uniform_load": MomentFactors(
        1.127, 0.454, 1.0, 1.0,
        "NCCI SN003b (Access Steel 2005) table 3.2, k = 1 (from memory); C1 equals "
        "Timoshenko & Gere's q_cr L^3 = 28.3 sqrt(E I_z G I_t) over 8 pi (sec. 6.3)"),
    "fixed_fixed_center_load": MomentFactors(
        1.565, 1.55, 1.0, 1.0,
        "C1: ENV 1993-1-1:1992 annex F table F.1.2, central point load with fixed end "
        "moments, k = 1 (from memory); the finite element check gives 1.68-1.73 against the "
        "peak |M| = P L / 8, so 1.565 is conservative. C2: the same table's 1.267 is up to "
        "12 % unconservative for stocky solid rectangles (span 3-5 depths) loaded on top "
        "by the finite element check; 1.55 is the upper envelope of the C2 that check "
        "implies for spans of 3 depths or more"),
    "fixed_fixed_uniform_load": MomentFactors(
        2.575, 1.562, 1.0, 1.0,
        "C1, C2 as tabulated for a uniformly loaded fork-supported beam with fixed end "
        "moments (from memory; we recall them from ENV 1993-1-1:1992 annex F table F.1.2, "
        "which may refer C1 to another moment); here C1 is referred to the end moment "
        "w L^2 / 12. The finite element check gives C1 = 2.576 at kappa -> 0 and implies "
        "C2 = 1.53-1.56 over the load heights tested"),
}
"""Bending load case id -> factors of the three-factor formula, each with its source."""


def elastic_critical_moment(
    factors: MomentFactors, span, youngs_modulus, shear_modulus, minor_second_moment,
    torsion_constant, warping_constant, load_height=0.0,
) -> np.ndarray:
    """M_cr, N m, by the three-factor formula (see the module docstring).

    Args:
        factors: C1, C2, k, k_w (floats, or arrays along a cases axis).
        span: L, m.
        youngs_modulus: E, Pa.
        shear_modulus: G, Pa.
        minor_second_moment: I_z, m^4.
        torsion_constant: I_t, m^4.
        warping_constant: I_w, m^6.
        load_height: z_g, m, height of the load above the shear centre (0: at the shear
            centre; positive above it, destabilising).

    Returns:
        M_cr, the peak |M| at elastic buckling, N m, in the broadcast shape of the arguments
        (materials x sections x cases when they are laid out on separate axes).
    """
    return CriticalMoment.of(factors, span, youngs_modulus, shear_modulus).at(
        minor_second_moment, torsion_constant, warping_constant, load_height)


@dataclass(frozen=True)
class CriticalMoment:
    """The three-factor formula of one load case, span and material, its terms that do not
    depend on the section computed once (a scale search asks M_cr of the same member at many
    scales); M_cr of sections by :meth:`at` (arguments as for
    :func:`elastic_critical_moment`).

    Attributes:
        factors: C1, C2, k, k_w.
        bending: pi^2 E, Pa.
        effective_square: (k L)^2, m^2.
        torsion: (k L)^2 G, N.
        length_ratio_square: (k / k_w)^2, dimensionless.
    """

    factors: MomentFactors
    bending: np.ndarray
    effective_square: np.ndarray
    torsion: np.ndarray
    length_ratio_square: np.ndarray

    @classmethod
    def of(cls, factors: MomentFactors, span, youngs_modulus, shear_modulus) -> CriticalMoment:
        """The terms for factors C1, C2, k, k_w, span L (m), E and G (Pa)."""
        effective = np.asarray(factors.lateral_length) * np.asarray(span, dtype=float)
        effective_square = effective**2
        length_ratio = np.asarray(factors.lateral_length) / np.asarray(factors.warping_length)
        return cls(factors, np.pi**2 * np.asarray(youngs_modulus, dtype=float),
                   effective_square, effective_square * np.asarray(shear_modulus, dtype=float),
                   length_ratio**2)

    def at(self, minor_second_moment, torsion_constant, warping_constant, load_height=0.0
           ) -> np.ndarray:
        """M_cr, N m, of sections with I_z, I_t (m^4) and I_w (m^6) loaded at z_g (m)."""
        lateral = np.asarray(minor_second_moment, dtype=float)
        stiffness = self.bending * lateral     # pi^2 E I_z, in both terms below
        euler = stiffness / self.effective_square
        inside = (self.length_ratio_square * np.asarray(warping_constant, dtype=float) / lateral
                  + self.torsion * np.asarray(torsion_constant, dtype=float) / stiffness)
        factors = self.factors
        if isinstance(load_height, float) and load_height == 0.0:
            # at the shear centre the height terms vanish (the same value, fewer array steps)
            return np.asarray(factors.moment_gradient) * euler * inside / np.sqrt(inside)
        height_term = np.asarray(factors.load_height) * np.asarray(load_height, dtype=float)
        height_square = height_term**2
        inside = inside + height_square
        root = np.sqrt(inside)
        # sqrt(a + c^2) - c, written as a / (sqrt(a + c^2) + c) to stay exact when c >> a
        return np.asarray(factors.moment_gradient) * euler * (inside - height_square) / (
            root + height_term)
