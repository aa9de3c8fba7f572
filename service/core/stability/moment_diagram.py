"""Lateral-torsional buckling of a member under any moment diagram (the general member).

The built-in load cases take their factors C1, C2 from tables (``critical_moment``). A general
member's moment diagram is whatever its actions make, so its critical moment is built here
from three rigorous pieces, each computed once per case where it does not depend on the
section:

1. C1 of the diagram, load at the shear centre, by the Rayleigh-Ritz method on the buckling
   energy equation (Timoshenko & Gere, Theory of Elastic Stability, 2nd ed. 1961, sec. 6.3;
   Trahair, Flexural-Torsional Buckling of Structures, 1993, ch. 6; from memory):

       d2 Pi = 1/2 int (E I_z u''^2 + G I_t phi'^2) dx + lambda int M(x) u'' phi dx

   with I_w = 0 (kappa -> 0, the condition the published C1 tables refer to), u and phi as
   :data:`RITZ_TERMS`-term series that meet the supports' conditions: sines for fork
   supports (u = phi = 0 at both ends; simply supported, fixed-fixed and propped cantilever
   members, whose in-plane fixity changes the diagram but not the lateral restraint, as in
   ``critical_moment``); for a cantilever fixed at x = 0, u = 1 - cos(k x) and
   phi = sin(k x), k = (2n - 1) pi / (2 L) (free tip; the root's warping is left free,
   which only lowers the result). A cantilever's series spans only the length that carries
   moment, from the root to the last point where M is not zero (:data:`EXTENT_SAMPLES`):
   beyond it u may run straight and phi stay constant at no energy, so the critical moment is
   that of the shorter cantilever, exactly, while a series over the whole span would need
   ever more terms for loads near the root (a force at 2.5 % of the span: C1 211 with 16
   terms, 103 with 128, 102 on the loaded length). The smallest lambda gives
   M_cr = lambda |M|_max, and
   C1 = M_cr / (pi sqrt(E I_z G I_t) / (k_ref L)), k_ref = 1 (fork) or 2 (cantilever), the
   references of ``critical_moment``. The series converges from above, so C1 at fork
   supports is capped at :data:`FORK_GRADIENT_CAP`. A published closed form was tried first:
   the quarter-point formula of Serna et al. (J. Constr. Steel Res. 62, 2006, 566-580,
   from memory), C1 = sqrt(35 M_max^2 / (M_max^2 + 9 M_A^2 + 16 M_B^2 + 9 M_C^2)), came out
   up to 16 % above the finite element solution of tests/validation/ltb_reference.py for
   fixed-fixed and propped members with several loads, so it is not used.
   With warping (kappa > 0) the same C1 is put into the three-factor formula of
   ``critical_moment`` (k = k_w = k_ref), which the finite element check finds conservative.

2. The load on the top flange (destabilising), by the convexity of the stability domain:
   with K positive definite, the set of load factors (lambda_1, lambda_2) for which
   K - lambda_1 G_1 - lambda_2 G_2 stays positive definite is convex (Papkovich's theorem,
   from memory; e.g. Bolotin, Nonconservative Problems of the Theory of Elastic Stability,
   1963), so the straight line between the critical points of two loadings lies inside it:
   1 / lambda <= 1 / lambda_1 + 1 / lambda_2 (Dunkerley's lower bound for combined
   loadings). Here G_1 is the moment term and G_2 the load-height term
   sum Q z_g phi(x_Q)^2 + int q z_g phi^2 dx of the downward loads (upward loads on the top
   flange only stabilise and are left out). The load-height term alone, per load, has an
   exact critical factor: the least of (G I_t int phi'^2 + E I_w int phi''^2) over
   phi(x_Q) = 1, at least G I_t alpha(x_Q) + E I_w beta(x_Q), with alpha the torsional
   stiffness 1 / a + 1 / b (fork, a and b the distances to the supports) or 1 / a
   (cantilever), and beta the flexural stiffness 3 L / (a^2 b^2) (fork, a simply supported
   beam under a point load) or 3 / a^3 (cantilever). Summed over the loads (Dunkerley
   again, a distributed load as a continuum of point loads):

       sum_i Q_i / (G I_t alpha_i + E I_w beta_i) <= min(A_t / G I_t, A_w / E I_w,
                                                          (A_t / G I_t + A_w / E I_w) / 4)

   with the per-case constants A_t = sum Q_i / alpha_i and A_w = sum Q_i / beta_i (the last
   term by 1 / (x + y) <= (1 / x + 1 / y) / 4).

3. Self-weight (at the centroid, the shear centre of these doubly symmetric sections): one
   more loading in the same bound, with its own C1 (the 1 N/m diagram of the supports).

Together, for the peak |M| of the whole loading:

    1 / lambda <= M_a / M_cr,a + q M_w / M_cr,w + z_g (the load-height sum above)

M_a the peak of the applied loads, M_w that of 1 N/m, q the self-weight per length, and
M_cr,a, M_cr,w the shear-centre critical moments of the two diagrams. The member's critical
moment is then lambda times the peak of the combined diagram. Every piece errs on the safe
side; tests/validation compares the whole with the finite element solution over random
load sets.
"""

from __future__ import annotations

import functools
from dataclasses import dataclass

import numpy as np

from service.core.stability.critical_moment import MomentFactors, elastic_critical_moment

RITZ_TERMS = 16
"""Terms of each series (u and phi): the finite element check finds C1 converged to 0.1 %."""

QUADRATURE_POINTS = 400
"""Gauss-Legendre points of the energy integrals over the span (the moment is a piecewise
quadratic; the points resolve its kinks to well under 0.1 % at 16 terms)."""

EXTENT_SAMPLES = 4096
"""Points along a cantilever at which its diagram is sampled to find the loaded length (the
length taken ends at the first sample past the last non-zero one: at most 1 / 4095 of the
span too long, which leaves the result exact, see the module docstring)."""

FORK_GRADIENT_CAP = 3.0
"""Largest C1 taken at fork supports: AISC 360-05 eq. F1-1 caps its moment gradient factor
C_b at 3.0 (from memory); diagrams whose loads nearly cancel reach far higher values, where
a truncated series is least trustworthy."""

REFERENCE_LENGTH = {"cantilever": 2.0}
"""Supports -> k_ref, the effective length factor C1 refers to (1 for fork supports)."""


def reference_length(supports: str) -> float:
    """k_ref of the supports (see :data:`REFERENCE_LENGTH`)."""
    return REFERENCE_LENGTH.get(supports, 1.0)


@functools.lru_cache(maxsize=2)
def _ritz_basis(cantilever: bool):
    """The series of :func:`ritz_moment_gradient` at the quadrature points (span 1), and the
    stiffness matrices K_u = int u''^2 and K_phi = int phi'^2 (E I_z = G I_t = L = 1)."""
    points, weights = np.polynomial.legendre.leggauss(QUADRATURE_POINTS)
    xi = 0.5 * (points + 1.0)                                     # (Q,) in [0, 1]
    weights = 0.5 * weights
    order = np.arange(1, RITZ_TERMS + 1)[:, None]
    wave = (2 * order - 1) * np.pi / 2.0 if cantilever else order * np.pi
    curvature = (wave**2 * np.cos(wave * xi) if cantilever      # u'' of 1 - cos(k x)
                 else -(wave**2) * np.sin(wave * xi))            # u'' of sin(k x)
    twist = np.sin(wave * xi)
    twist_rate = wave * np.cos(wave * xi)
    lateral = (curvature * weights) @ curvature.T
    torsional = (twist_rate * weights) @ twist_rate.T
    return xi, curvature * weights, twist, lateral, torsional


def ritz_moment_gradient(supports: str, moment, span, peak) -> np.ndarray:
    """C1 of moment diagrams by the Rayleigh-Ritz method (see the module docstring, part 1).

    Args:
        supports: ``"cantilever"`` (fixed at x = 0) or any fork-supported kind.
        moment: callable (x of shape (cases, Q), m) -> M at those points, N m, shape
            (cases, Q); any sign convention.
        span: L, m, shape (cases,).
        peak: |M|_max of each diagram, N m, shape (cases,) (found exactly by the caller).

    Returns:
        C1, shape (cases,); 0 where the diagram is zero (no moment: nothing buckles).
    """
    span = np.asarray(span, dtype=float).reshape(-1)
    peak = np.asarray(peak, dtype=float).reshape(-1)
    cantilever = supports == "cantilever"
    xi, weighted_curvature, twist, lateral, torsional = _ritz_basis(cantilever)
    extent = _loaded_extent(moment, span, peak) if cantilever else np.ones_like(span)
    values = np.asarray(moment((span * extent)[:, None] * xi[None, :]), dtype=float)  # (cases, Q)
    with np.errstate(divide="ignore", invalid="ignore"):
        shape = np.where(peak[:, None] > 0, values / peak[:, None], 0.0)   # |m| <= 1
    # A = int m u'' phi, then lambda^2 = 1 / largest eigenvalue of K_phi^-1 A^T K_u^-1 A
    coupling = np.einsum("iq,cq,jq->cij", weighted_curvature, shape, twist)
    left = np.linalg.solve(lateral, coupling)
    product = np.linalg.solve(torsional, np.swapaxes(coupling, -1, -2) @ left)
    largest = np.linalg.eigvals(product).real.max(axis=-1)
    with np.errstate(divide="ignore"):
        critical = np.where(largest > 0, 1.0 / np.sqrt(np.maximum(largest, 0.0)), np.inf)
    # M_cr = critical sqrt(E I_z G I_t) / (extent L) for a unit peak; the reference is
    # pi / (k_ref L)
    gradient = critical * reference_length(supports) / np.pi / extent
    if not cantilever:
        gradient = np.minimum(gradient, FORK_GRADIENT_CAP)
    return np.where(peak > 0, gradient, 0.0)


def _loaded_extent(moment, span, peak) -> np.ndarray:
    """The fraction of the span from x = 0 to the first sample past the last non-zero moment,
    (cases,) (1 where the diagram reaches the tip or is zero)."""
    grid = np.linspace(0.0, 1.0, EXTENT_SAMPLES)
    values = np.abs(np.asarray(moment(span[:, None] * grid[None, :]), dtype=float))
    loaded = values > 1e-9 * peak[:, None]
    last = EXTENT_SAMPLES - 1 - np.argmax(loaded[:, ::-1], axis=1)
    extent = grid[np.minimum(last + 1, EXTENT_SAMPLES - 1)]
    return np.where(loaded.any(axis=1) & (extent > 0), extent, 1.0)


def load_height_constants(supports: str, span, force_at, force_value, distributed_start,
                          distributed_end, distributed_value) -> tuple[np.ndarray, np.ndarray]:
    """(A_t, A_w) of the downward loads (see the module docstring, part 2), per case.

    Args:
        supports: ``"cantilever"`` (fixed at x = 0) or a fork-supported kind.
        span: L, m, (cases,).
        force_at, force_value: point forces, m and N (positive down), (cases, n).
        distributed_start, distributed_end, distributed_value: m, m, N/m, (cases, n).

    Returns:
        A_t (N m, the sum of Q / alpha) and A_w (N m^3, the sum of Q / beta), (cases,).
    """
    span = np.asarray(span, dtype=float).reshape(-1, 1)
    down = np.maximum(np.asarray(force_value, dtype=float), 0.0)
    a = np.asarray(force_at, dtype=float)
    q = np.maximum(np.asarray(distributed_value, dtype=float), 0.0)
    start, end = (np.asarray(v, dtype=float) for v in (distributed_start, distributed_end))
    if supports == "cantilever":
        # 1 / alpha = a, 1 / beta = a^3 / 3, integrated over [start, end] for q
        torsion = (down * a).sum(-1) + (q * (end**2 - start**2) / 2.0).sum(-1)
        warping = (down * a**3 / 3.0).sum(-1) + (q * (end**4 - start**4) / 12.0).sum(-1)
        return torsion, warping
    b = span - a
    torsion = (down * a * b / span).sum(-1)
    warping = (down * a**2 * b**2 / (3.0 * span)).sum(-1)

    def integral(antiderivative):
        return (q * (antiderivative(end) - antiderivative(start))).sum(-1)

    # int x (L - x) / L dx and int x^2 (L - x)^2 / (3 L) dx, as polynomials in x
    torsion = torsion + integral(lambda x: (span * x**2 / 2.0 - x**3 / 3.0) / span)
    warping = warping + integral(
        lambda x: (span**2 * x**3 / 3.0 - span * x**4 / 2.0 + x**5 / 5.0) / (3.0 * span))
    return torsion, warping


@dataclass(frozen=True)
class DiagramLoading:
    """What the critical moment of a general member reads of its loading (arrays broadcast
    with the section and material arrays; a case axis where the caller stacks cases).

    Attributes:
        supports: ``"cantilever"`` or a fork-supported kind (one per group of cases).
        span: L, m.
        applied_gradient: C1 of the applied loads' diagram (:func:`ritz_moment_gradient`).
        applied_peak: |M|_max of the applied loads, N m (unfactored).
        weight_gradient: C1 of a uniform load over the span.
        weight_peak: |M|_max of 1 N/m over the span, m^2.
        height_torsion, height_warping: A_t (N m) and A_w (N m^3) of the applied loads
            (:func:`load_height_constants`).
    """

    supports: str
    span: np.ndarray | float
    applied_gradient: np.ndarray | float
    applied_peak: np.ndarray | float
    weight_gradient: np.ndarray | float
    weight_peak: np.ndarray | float
    height_torsion: np.ndarray | float
    height_warping: np.ndarray | float


def diagram_critical_moment(
    loading: DiagramLoading, peak, weight, youngs_modulus, shear_modulus, minor_second_moment,
    torsion_constant, warping_constant, load_height=0.0,
) -> np.ndarray:
    """M_cr, N m, as the peak |M| of the whole loading at buckling (module docstring).

    Args:
        loading: the member's diagram constants.
        peak: |M|_max of the whole loading (applied and self-weight), N m.
        weight: the self-weight per length q, N/m (0 without).
        youngs_modulus, shear_modulus: E and G, Pa.
        minor_second_moment, torsion_constant, warping_constant: I_z (m^4), I_t (m^4),
            I_w (m^6).
        load_height: z_g of the applied loads above the shear centre, m (0 at the shear
            centre).

    Returns:
        M_cr in the broadcast shape of the arguments (``inf`` where nothing is loaded).
    """
    k = reference_length(loading.supports)

    def shear_centre(gradient):
        return elastic_critical_moment(
            MomentFactors(gradient, 0.0, k, k, "general diagram"), loading.span,
            youngs_modulus, shear_modulus, minor_second_moment, torsion_constant,
            warping_constant)

    torsional = np.asarray(shear_modulus, dtype=float) * np.asarray(torsion_constant)
    warping = np.asarray(youngs_modulus, dtype=float) * np.asarray(warping_constant)
    with np.errstate(divide="ignore", invalid="ignore"):
        by_torsion = np.asarray(loading.height_torsion) / torsional
        by_warping = np.where(warping > 0, np.asarray(loading.height_warping) / warping, np.inf)
        height = np.minimum(np.minimum(by_torsion, by_warping), (by_torsion + by_warping) / 4.0)
        height = np.where(np.asarray(load_height) > 0, np.asarray(load_height) * height, 0.0)

        def share(moment, gradient):
            """M / M_cr of one diagram, 0 where it has no moment."""
            moment = np.asarray(moment, dtype=float)
            return np.where(moment > 0, moment / shear_centre(gradient), 0.0)

        inverse = (share(loading.applied_peak, loading.applied_gradient)
                   + share(np.asarray(weight) * np.asarray(loading.weight_peak),
                           loading.weight_gradient)
                   + height)
        return np.where(inverse > 0, np.asarray(peak, dtype=float) / inverse, np.inf)
