"""An independent elastic lateral-torsional buckling solver: finite elements on the energy equation.

It shares nothing with ``service.core.stability`` (no factor, no formula): the critical load
comes from the second variation of the total potential of a prismatic, doubly symmetric beam
(Trahair, Flexural-Torsional Buckling of Structures, 1993, ch. 6; Timoshenko & Gere, Theory of
Elastic Stability, 2nd ed., 1961, ch. 6, from memory):

    d2 Pi = 1/2 int (E I_z u''^2 + G J phi'^2 + E I_w phi''^2) dx
            + lambda [ int M(x) u'' phi dx - 1/2 sum Q a phi(x_Q)^2 - 1/2 int q a phi^2 dx ]

u the lateral displacement of the shear centre, phi the twist, M(x) the in-plane moment of the
unit loads (point loads Q, distributed q), a the height of the load above the shear centre
(positive above: a gravity load there loses potential as the section twists). Both fields are
cubic Hermite elements (u, u', phi, phi' per node); the integrals use 4-point Gauss quadrature,
exact for these polynomials. The critical load factor is the smallest positive eigenvalue of
K x = lambda G x, solved as a symmetric problem through the Cholesky factor of the positive
definite K (scipy.linalg). The cross term is odd in u, so with a = 0 eigenvalues come
in +- pairs and the sign convention of M does not matter; with a != 0 the positive root is the
downward (gravity) load.

Supports: "fork" (u = phi = 0 at both ends; lateral bending and warping free) and "cantilever"
(u = u' = phi = phi' = 0 at x = 0, the tip free).
"""

from __future__ import annotations

import numpy as np
from scipy.linalg import cholesky, eigvalsh, solve_triangular
from scipy.optimize import brentq
from threadpoolctl import threadpool_limits

GAUSS_POINTS, GAUSS_WEIGHTS = np.polynomial.legendre.leggauss(4)


def _hermite(xi: float, length: float) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Cubic Hermite shape functions and their first and second x-derivatives at xi in [0, 1]."""
    n = np.array([1 - 3 * xi**2 + 2 * xi**3, length * (xi - 2 * xi**2 + xi**3),
                  3 * xi**2 - 2 * xi**3, length * (-xi**2 + xi**3)])
    dn = np.array([-6 * xi + 6 * xi**2, length * (1 - 4 * xi + 3 * xi**2),
                   6 * xi - 6 * xi**2, length * (-2 * xi + 3 * xi**2)]) / length
    d2n = np.array([-6 + 12 * xi, length * (-4 + 6 * xi),
                    6 - 12 * xi, length * (-2 + 6 * xi)]) / length**2
    return n, dn, d2n


def critical_load_factor(
    *, span: float, lateral_stiffness: float, torsion_stiffness: float, warping_stiffness: float,
    moment, supports: str, point_loads=(), distributed_load: float = 0.0,
    load_height: float = 0.0, elements: int = 40,
) -> float:
    """Smallest positive load factor lambda at which the beam buckles laterally.

    Args:
        span: L, m.
        lateral_stiffness: E I_z, N m^2.
        torsion_stiffness: G J, N m^2.
        warping_stiffness: E I_w, N m^4.
        moment: callable x -> in-plane bending moment of the unit loads (vectorised), N m.
        supports: ``"fork"`` or ``"cantilever"`` (fixed at x = 0).
        point_loads: ((x, Q), ...) unit point loads, N, placed at element nodes.
        distributed_load: unit distributed load q, N/m, over the whole span.
        load_height: a, m, height of every load above the shear centre.
        elements: number of equal elements.
    """
    nodes = elements + 1
    size = 4 * nodes
    length = span / elements
    xi = 0.5 * (GAUSS_POINTS + 1.0)
    weights = 0.5 * GAUSS_WEIGHTS * length
    shapes = [_hermite(point, length) for point in xi]
    n = np.array([shape[0] for shape in shapes])        # (gauss, 4)
    dn = np.array([shape[1] for shape in shapes])
    d2n = np.array([shape[2] for shape in shapes])
    bending = lateral_stiffness * np.einsum("g,gi,gj->ij", weights, d2n, d2n)
    twisting = (torsion_stiffness * np.einsum("g,gi,gj->ij", weights, dn, dn)
                + warping_stiffness * np.einsum("g,gi,gj->ij", weights, d2n, d2n))
    height = distributed_load * load_height * np.einsum("g,gi,gj->ij", weights, n, n)
    x = (np.arange(elements)[:, None] + xi[None, :]) * length
    cross = np.einsum("eg,g,gi,gj->eij", moment(x), weights, d2n, n)   # (elements, 4, 4)
    stiffness = np.zeros((size, size))
    geometric = np.zeros((size, size))
    for element in range(elements):
        u = [4 * element, 4 * element + 1, 4 * element + 4, 4 * element + 5]
        phi = [4 * element + 2, 4 * element + 3, 4 * element + 6, 4 * element + 7]
        stiffness[np.ix_(u, u)] += bending
        stiffness[np.ix_(phi, phi)] += twisting
        # Pi's cross term int M u'' phi is a symmetric bilinear form split over both blocks
        geometric[np.ix_(u, phi)] -= cross[element]
        geometric[np.ix_(phi, u)] -= cross[element].T
        geometric[np.ix_(phi, phi)] += height
    for position, load in point_loads:
        node = int(round(position / length))
        geometric[4 * node + 2, 4 * node + 2] += load * load_height
    if supports == "fork":
        fixed = [0, 2, 4 * (nodes - 1), 4 * (nodes - 1) + 2]
    elif supports == "cantilever":
        fixed = [0, 1, 2, 3]
    else:
        raise ValueError(supports)
    free = np.setdiff1d(np.arange(size), fixed)
    # K is positive definite: with K = C C^T, G x = mu K x becomes the symmetric problem
    # C^-1 G C^-T y = mu y, and the critical lambda is 1 / (largest positive mu).
    # One BLAS thread: these small dense problems run 10x slower on a shared, loaded machine
    # when the BLAS library spreads each one over every core.
    with threadpool_limits(limits=1):
        factor = cholesky(stiffness[np.ix_(free, free)], lower=True)
        half = solve_triangular(factor, geometric[np.ix_(free, free)], lower=True)
        reduced = solve_triangular(factor, half.T, lower=True)
        largest = eigvalsh(0.5 * (reduced + reduced.T)).max()
    if largest <= 0.0:
        return np.inf
    with np.errstate(over="ignore"):   # a vanishing positive mu: no buckling in range
        return float(np.float64(1.0) / largest)


CASES = {
    # load case id: (supports, moment of a unit total load (x, L) -> N m, point loads, q)
    "cantilever_end_load": ("cantilever", lambda x, L: -(L - x), lambda L: ((L, 1.0),), 0.0),
    "cantilever_uniform_load": ("cantilever", lambda x, L: -(L - x) ** 2 / (2 * L),
                                lambda L: (), 1.0),
    "simply_supported_center_load": ("fork", lambda x, L: 0.5 * np.minimum(x, L - x),
                                     lambda L: ((L / 2, 1.0),), 0.0),
    "simply_supported_uniform_load": ("fork", lambda x, L: x * (L - x) / (2 * L),
                                      lambda L: (), 1.0),
    "fixed_fixed_center_load": ("fork", lambda x, L: 0.5 * np.minimum(x, L - x) - L / 8,
                                lambda L: ((L / 2, 1.0),), 0.0),
    "fixed_fixed_uniform_load": ("fork", lambda x, L: x * (L - x) / (2 * L) - L / 12,
                                 lambda L: (), 1.0),
}
"""The built-in bending cases as the FE solver's input: fork supports at both ends of the
simply supported and fixed-fixed beams (in-plane fixity does not restrain lateral bending or
warping, the safe assumption), a cantilever fully fixed at its root. Unit total load W = 1 N."""


def critical_moment(case_id: str, *, span: float, lateral_stiffness: float,
                    torsion_stiffness: float, warping_stiffness: float,
                    load_height: float = 0.0, elements: int = 40) -> float:
    """Peak |M| at elastic lateral-torsional buckling of a built-in load case, N m."""
    supports, moment, points, q = CASES[case_id]
    factor = critical_load_factor(
        span=span, lateral_stiffness=lateral_stiffness, torsion_stiffness=torsion_stiffness,
        warping_stiffness=warping_stiffness, moment=lambda x: moment(x, span),
        supports=supports, point_loads=points(span), distributed_load=q / span,
        load_height=load_height, elements=elements)
    peak = np.abs(moment(np.linspace(0.0, span, 2001), span)).max()
    return factor * peak


def perry_robertson(slenderness: float, imperfection: float, plateau: float) -> float:
    """chi, the smaller root of (1 - chi)(1 - chi lambda^2) = alpha (lambda - lambda_0) chi
    (the Perry-Robertson equation behind every Ayrton-Perry buckling curve; Ayrton & Perry
    1886, Robertson 1925, from memory), found by scipy.optimize.brentq; 1 on the plateau."""
    if slenderness <= plateau:
        return 1.0

    def equation(chi):
        return ((1 - chi) * (1 - chi * slenderness**2)
                - imperfection * (slenderness - plateau) * chi)
    return min(brentq(equation, 1e-12, min(1.0, 1.0 / slenderness**2)), 1.0)


def moment_resistance(case_id: str, *, span: float, youngs_modulus: float, shear_modulus: float,
                      strength: float, section_modulus: float, minor_second_moment: float,
                      torsion_constant: float, warping_constant: float, load_height: float,
                      imperfection: float, plateau: float) -> float:
    """chi_LT Z f with M_cr from the finite element solution and chi_LT from the
    Perry-Robertson equation (EN 1993-1-1 6.3.2.2 with the elastic modulus), N m."""
    critical = critical_moment(case_id, span=span,
                               lateral_stiffness=youngs_modulus * minor_second_moment,
                               torsion_stiffness=shear_modulus * torsion_constant,
                               warping_stiffness=youngs_modulus * warping_constant,
                               load_height=load_height)
    elastic = section_modulus * strength
    return perry_robertson(float(np.sqrt(elastic / critical)), imperfection, plateau) * elastic
