"""First bending natural frequency of a uniform member, alone and with attached point masses.

Uniform member alone, exact Euler-Bernoulli (Blevins, Formulas for Natural Frequency and Mode
Shape, 1979, table 8-1, from memory):

    f_1 = (beta L)^2 / (2 pi L^2) * sqrt(E I / m')

with m' the mass per unit length (kg/m) and beta L the first root of the frequency equation of
the supports (:data:`FIRST_EIGENVALUES`; the tests solve the equations again with scipy).

With point masses m_i at a_i two published estimates bracket the true first frequency:

- Dunkerley's formula (Dunkerley 1894, Phil. Trans. R. Soc. A 185; the Southwell-Dunkerley
  bound, e.g. Thomson & Dahleh, Theory of Vibration with Applications, 5th ed., from memory):

      1 / f^2 = 1 / f_1^2 + sum_i 1 / f_i^2,   f_i = 1 / (2 pi sqrt(m_i delta_ii))

  with delta_ii the static deflection at a_i under a unit force there (the member's
  flexibility). It errs LOW: it never overestimates the first frequency, so it is the safe
  side for a minimum-frequency requirement, and :func:`dunkerley_frequency` is the one a
  requirement should use.

- Rayleigh's quotient with the static deflection shape y under the weights of the member and
  of the masses (Rayleigh, The Theory of Sound, 1877; Thomson & Dahleh, as above, from
  memory):

      omega^2 = g (integral m' y dx + sum m_i y_i) / (integral m' y^2 dx + sum m_i y_i^2)

  It errs HIGH (Rayleigh's principle: any admissible shape gives an upper bound), usually by
  well under 1 %; :func:`rayleigh_frequency` is offered to bracket the answer.

Shear deformation (Timoshenko) enters Dunkerley's sum as two more flexibilities, so the
estimate stays on the safe side: the member's own shear-beam mode, f_s = (lambda_s / L) /
(2 pi) sqrt(S / m') with S = k G A the shear rigidity and lambda_s = pi (both ends held) or
pi / 2 (cantilever), and each mass's shear flexibility delta_s,ii = (M(a_i) - M(0) - c a_i)
/ S under a unit force at a_i (the shear deflection line of ``segments.deflection_at``, with
the Euler-Bernoulli reactions). For a simply supported member 1 / f^2 = 1 / f_1^2 + 1 / f_s^2
is the exact first frequency of a Timoshenko beam without rotary inertia (Timoshenko, Vibration
Problems in Engineering, 3rd ed. 1955, sec. 62, from memory); for the other supports it is the
same combination with the shear beam of the same end deflections. Splitting a flexibility
into parts and adding their frequencies' inverse squares never overestimates the first
frequency (the largest eigenvalue of a sum of positive operators is at most the sum of
theirs: the Southwell-Dunkerley argument).

Rotary inertia enters the same way: the rotation of the sections alone, with their bending
flexibility, has the mode (lambda_s / L) sqrt(E / rho), a term rho L^2 / (lambda_s^2 E) =
m' L^2 / (lambda_s^2 E A) of the sum (Dunkerley's split of the mass). For a simply supported
member the three terms give 1 / f^2 = (1 + (pi r / L)^2 (1 + E / (k G))) / f_1^2, Timoshenko's
first-order result (as above, from memory).

Not included: the axial force (compression lowers the bending frequency, tension raises
it).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from service.core.loading.actions import MemberLoading, point_forces, uniform_load
from service.core.loading.internal import internal_actions
from service.core.loading.segments import Segments, cut, deflection_at

FIRST_EIGENVALUES = {
    # supports -> beta_1 L, the first root of (Blevins 1979, table 8-1, from memory):
    "cantilever": 1.8751040687,          # cos(bL) cosh(bL) = -1
    "simply_supported": math.pi,         # sin(bL) = 0
    "fixed_fixed": 4.7300407449,         # cos(bL) cosh(bL) = 1
    "propped_cantilever": 3.9266023120,  # tan(bL) = tanh(bL) (fixed-pinned)
}
"""Supports -> first Euler-Bernoulli eigenvalue beta_1 L (dimensionless)."""

SHEAR_EIGENVALUES = {
    # supports -> lambda_s, the first mode of a shear beam (y'' = -(lambda_s / L)^2 y) with
    # the member's end deflections: held at both ends sin(pi x / L), cantilever sin(pi x / 2L)
    "cantilever": math.pi / 2.0,
    "simply_supported": math.pi,
    "fixed_fixed": math.pi,
    "propped_cantilever": math.pi,
}
"""Supports -> the eigenvalue lambda_s of the member's own shear and rotary inertia modes."""

GAUSS_POINTS = 5
"""Gauss-Legendre points per piece for Rayleigh's integrals: exact for polynomials of degree
up to 9, and the integrands (products of two quartic lines) are of degree 8."""


def uniform_frequency(supports: str, span, flexural_rigidity, mass_per_length):
    """f_1 of a uniform member with no attached mass, Hz (arrays broadcast).

    Args:
        supports: one of ``service.core.loading.actions.SUPPORTS``.
        span: L, m.
        flexural_rigidity: E I, N m^2.
        mass_per_length: m', kg/m (the member's own mass).
    """
    span = np.asarray(span, dtype=float)
    eigenvalue = FIRST_EIGENVALUES[supports]
    return eigenvalue**2 / (2.0 * math.pi * span**2) * np.sqrt(
        np.asarray(flexural_rigidity, dtype=float) / np.asarray(mass_per_length, dtype=float)
    )


@dataclass(frozen=True)
class AttachedMassTerms:
    """What the frequency estimates need from one case's supports, span and masses, (cases,).

    Lines are taken with E I = 1 N m^2 and unit gravity (both cancel out of the quotients);
    U is the deflection line under 1 N/m over the span, P the line under the masses' weights.

    Attributes:
        supports: the members' supports.
        span: L, m.
        flexibility_mass: sum_i m_i (E I delta_ii), kg m^3 (Dunkerley's sum times E I).
        shear_flexibility_mass: sum_i m_i (S delta_s,ii), kg m: the masses' shear
            flexibilities times the shear rigidity S (module docstring).
        uniform_uniform: integral U dx.
        uniform_masses: integral P dx.
        masses_on_uniform: sum_i m_i U(a_i) (equal to integral P dx by Maxwell-Betti).
        masses_on_masses: sum_i m_i P(a_i).
        uniform_squared: integral U^2 dx.
        uniform_times_masses: integral U P dx.
        masses_squared: integral P^2 dx.
        masses_uniform_squared: sum_i m_i U(a_i)^2.
        masses_cross: sum_i m_i U(a_i) P(a_i).
        masses_masses_squared: sum_i m_i P(a_i)^2.
        (Units follow from E I = 1 N m^2 and g = 1 m/s^2; only their ratios are used.)
    """

    supports: str
    span: np.ndarray
    flexibility_mass: np.ndarray
    shear_flexibility_mass: np.ndarray
    uniform_uniform: np.ndarray
    uniform_masses: np.ndarray
    masses_on_uniform: np.ndarray
    masses_on_masses: np.ndarray
    uniform_squared: np.ndarray
    uniform_times_masses: np.ndarray
    masses_squared: np.ndarray
    masses_uniform_squared: np.ndarray
    masses_cross: np.ndarray
    masses_masses_squared: np.ndarray


def _gauss_points(pieces: Segments):
    """(t, weight): Gauss-Legendre points in each piece and their weights, (cases, S, k)."""
    nodes, weights = np.polynomial.legendre.leggauss(GAUSS_POINTS)
    length = pieces.length[..., None]
    return length * (nodes + 1.0) / 2.0, length * weights / 2.0


def attached_mass_terms(loading: MemberLoading) -> AttachedMassTerms:
    """The per-case terms of Dunkerley's and Rayleigh's estimates (``loading``'s masses only)."""
    cases, count = loading.mass_at.shape
    span = loading.span
    # Dunkerley: each mass alone, flexibility at its own position (one row per case and mass)
    alone = point_forces(loading.supports, np.repeat(span, count),
                         loading.mass_at.reshape(-1, 1), 1.0)
    own_flexibility = internal_actions(alone, loading.mass_at.reshape(-1, 1))
    flexibility = own_flexibility.deflection_times_stiffness.reshape(cases, count)
    shear_flexibility = _shear_flexibility(alone, loading.mass_at.reshape(-1, 1),
                                           np.repeat(span, count),
                                           loading.supports).reshape(cases, count)
    # Rayleigh: lines under the masses' weights (unit gravity) and under 1 N/m, E I = 1, cut
    # at the masses so each piece's line is one polynomial
    weights = point_forces(loading.supports, span, loading.mass_at, loading.mass_value)
    masses_pieces, unit_pieces = cut(weights)
    t, weight = _gauss_points(masses_pieces)
    u_line, p_line = deflection_at(unit_pieces, t), deflection_at(masses_pieces, t)

    def integral(values):
        return (values * weight).sum(axis=(-2, -1))

    u_at = internal_actions(uniform_load(loading.supports, span, 1.0),
                            loading.mass_at).deflection_times_stiffness
    p_at = internal_actions(weights, loading.mass_at).deflection_times_stiffness
    m = loading.mass_value
    return AttachedMassTerms(
        supports=loading.supports, span=span,
        flexibility_mass=(m * flexibility).sum(-1),
        shear_flexibility_mass=(m * shear_flexibility).sum(-1),
        uniform_uniform=integral(u_line),
        uniform_masses=integral(p_line),
        masses_on_uniform=(m * u_at).sum(-1),
        masses_on_masses=(m * p_at).sum(-1),
        uniform_squared=integral(u_line**2),
        uniform_times_masses=integral(u_line * p_line),
        masses_squared=integral(p_line**2),
        masses_uniform_squared=(m * u_at**2).sum(-1),
        masses_cross=(m * u_at * p_at).sum(-1),
        masses_masses_squared=(m * p_at**2).sum(-1),
    )


def _shear_flexibility(loading: MemberLoading, at: np.ndarray, span, supports: str):
    """S delta_s at ``at`` under the loads of ``loading`` (one row per case), m: the shear
    deflection line M(x) - M(0) - c x with c = (M(L) - M(0)) / L on a member held at both
    ends, 0 on a cantilever (``segments.deflection_at``)."""
    span = np.asarray(span, dtype=float).reshape(-1, 1)
    ends = internal_actions(loading, np.concatenate([np.zeros_like(span), span], axis=1)).moment
    chord = ((ends[:, 1:] - ends[:, :1]) / span if supports != "cantilever"
             else np.zeros_like(span))
    return internal_actions(loading, at).moment - ends[:, :1] - chord * at


def _timoshenko_inverse_square(terms: AttachedMassTerms, mass_per_length, shear_rigidity,
                               axial_rigidity):
    """The shear and rotary inertia terms of Dunkerley's sum, 1 / Hz^2:
    (2 pi)^2 (m' L^2 / lambda_s^2 (1 / S + 1 / (E A)) + sum_i m_i delta_s,ii) with S = k G A
    and E A (N; ``inf`` leaves a term out). Broadcasting as :func:`dunkerley_frequency`."""
    with np.errstate(divide="ignore"):
        shear = 1.0 / np.asarray(shear_rigidity, dtype=float)
        axial = 1.0 / np.asarray(axial_rigidity, dtype=float)
    eigenvalue = SHEAR_EIGENVALUES[terms.supports]
    own = np.asarray(mass_per_length, dtype=float) * terms.span**2 / eigenvalue**2
    return (2.0 * math.pi) ** 2 * (own * (shear + axial) + terms.shear_flexibility_mass * shear)


def dunkerley_frequency(terms: AttachedMassTerms, flexural_rigidity, mass_per_length,
                        shear_rigidity=np.inf, axial_rigidity=np.inf):
    """First frequency by Dunkerley's formula, Hz: a lower bound (module docstring).

    ``flexural_rigidity`` (E I, N m^2), ``mass_per_length`` (m', kg/m), ``shear_rigidity``
    (k G A, N) and ``axial_rigidity`` (E A, N; the rotary inertia's term) broadcast against
    the case axis of ``terms`` (the last axis); ``inf`` for the last two gives the
    Euler-Bernoulli member.
    """
    rigidity = np.asarray(flexural_rigidity, dtype=float)
    member = uniform_frequency(terms.supports, terms.span, rigidity, mass_per_length)
    # 1 / f_i^2 = (2 pi)^2 m_i delta_ii, summed, with delta_ii = (E I delta_ii) / E I
    inverse_square = (1.0 / member**2 + (2.0 * math.pi) ** 2 * terms.flexibility_mass / rigidity
                      + _timoshenko_inverse_square(terms, mass_per_length, shear_rigidity,
                                                   axial_rigidity))
    return 1.0 / np.sqrt(inverse_square)


def rayleigh_frequency(terms: AttachedMassTerms, flexural_rigidity, mass_per_length):
    """First frequency by Rayleigh's quotient with the static deflection shape, Hz: an upper
    bound (module docstring). Broadcasting as :func:`dunkerley_frequency`.

    With y = m' U + P (E I = g = 1) the quotient expands into the per-case terms.
    """
    w = np.asarray(mass_per_length, dtype=float)
    t = terms
    numerator = (w**2 * t.uniform_uniform + w * t.uniform_masses
                 + w * t.masses_on_uniform + t.masses_on_masses)
    denominator = (w**3 * t.uniform_squared + 2.0 * w**2 * t.uniform_times_masses
                   + w * t.masses_squared + w**2 * t.masses_uniform_squared
                   + 2.0 * w * t.masses_cross + t.masses_masses_squared)
    omega_squared = np.asarray(flexural_rigidity, dtype=float) * numerator / denominator
    return np.sqrt(omega_squared) / (2.0 * math.pi)
