"""Local buckling of walls made of a specially orthotropic material (unidirectional laminate
with its fibres along the member).

Axes: 1 (x) along the member and the fibres, 2 (y) across the wall. A homogeneous orthotropic
wall of thickness t has the plate bending stiffnesses (Whitney, Structural Analysis of
Laminated Anisotropic Plates, 1987, ch. 1 and 5; Lekhnitskii, Anisotropic Plates, 1968, from
memory), per unit width, N m:

    D11 = E1 t^3 / (12 (1 - nu12 nu21)),   D22 = E2 t^3 / (12 (1 - nu12 nu21)),
    D12 = nu12 D22,   D66 = G12 t^3 / 12,   D3 = D12 + 2 D66,   nu21 = nu12 E2 / E1,

and the membrane compliances a11 = 1 / (E1 t), a22 = 1 / (E2 t), a12 = -nu12 / (E1 t),
a66 = 1 / (G12 t). Every result reduces to the isotropic formula of
:mod:`service.core.sections.buckling` and :mod:`service.core.sections.tubes` when E1 = E2 = E
and G12 = E / (2 (1 + nu)) (checked in tests/core/test_sections_orthotropic.py).

Every function broadcasts its arguments (material arrays of shape ``M`` against geometry of
shape ``S``) and returns stresses in Pa of the broadcast shape. The long-plate coefficients
depend on the material only, so their cost scales with the material arrays' size.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

LONG_CYLINDER_TORSION = 1.0 / (3.0 * np.sqrt(2.0))
"""tau_cr = E (t/r)^1.5 / (3 sqrt 2 (1 - nu^2)^0.75) = 0.236 E (t/r)^1.5 / (1 - nu^2)^0.75, the
long-tube limit in torsion, where the ends no longer matter (Timoshenko & Gere, Theory of
Elastic Stability, 2nd ed., sec. 11.12, from memory). Donnell's coefficient 0.272, also quoted
for long tubes, is 15 % higher; the lower value is taken because it is the conservative one."""

BRAZIER_COEFFICIENT = 2.0 * np.sqrt(2.0) / 9.0
"""Brazier (1927, Proc. R. Soc. A 116) limit moment of a long tube ovalizing in bending:
M = (2 sqrt 2 / 9) pi E r t^2 / sqrt(1 - nu^2) (from memory)."""


@dataclass(frozen=True)
class OrthotropicElastic:
    """Elastic constants of a specially orthotropic wall, fibres along the member.

    Field names follow :class:`~service.core.sections.base.Elastic` where the quantity is the
    same, so code that reads the along-member modulus works with either.

    Attributes:
        youngs_modulus: E1 along the member (fibres), Pa.
        transverse_modulus: E2 across the fibres (around the tube, across a plate), Pa.
        shear_modulus: in-plane G12, Pa.
        poisson_ratio: major Poisson's ratio nu12 (strain across from stress along), 1.
    """

    youngs_modulus: np.ndarray | float
    transverse_modulus: np.ndarray | float
    shear_modulus: np.ndarray | float
    poisson_ratio: np.ndarray | float

    def arrays(self) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
        """E1, E2, G12, nu12 as float arrays."""
        return (np.asarray(self.youngs_modulus, dtype=float),
                np.asarray(self.transverse_modulus, dtype=float),
                np.asarray(self.shear_modulus, dtype=float),
                np.asarray(self.poisson_ratio, dtype=float))

    def plate_moduli(self) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """D11, D22 and D3 = D12 + 2 D66 of a wall of unit thickness, times 12, Pa:
        E1 / (1 - nu12 nu21), E2 / (1 - nu12 nu21), nu12 E2 / (1 - nu12 nu21) + 2 G12."""
        e1, e2, g12, nu12 = self.arrays()
        factor = 1.0 / (1.0 - nu12**2 * e2 / e1)
        return e1 * factor, e2 * factor, nu12 * e2 * factor + 2.0 * g12

    def twisting_ratio(self) -> np.ndarray:
        """D* = D3 / sqrt(D11 D22), 1 (Brunelle & Oyibo 1983, AIAA J. 21(8), the generalized
        rigidity parameter, from memory): 1 for an isotropic wall, about 0.3 for a
        unidirectional carbon laminate."""
        d11, d22, d3 = self.plate_moduli()
        return d3 / np.sqrt(d11 * d22)


def as_orthotropic(material) -> OrthotropicElastic:
    """The material as an :class:`OrthotropicElastic`: itself, or an isotropic
    :class:`~service.core.sections.base.Elastic` with E1 = E2 = E and G12 = E / (2 (1 + nu)),
    the shear modulus isotropic shell theory assumes (so the cylinder formulas here give the
    isotropic ones exactly)."""
    if isinstance(material, OrthotropicElastic):
        return material
    youngs = np.asarray(material.youngs_modulus, dtype=float)
    nu = np.asarray(material.poisson_ratio, dtype=float)
    return OrthotropicElastic(youngs, youngs, youngs / (2.0 * (1.0 + nu)), nu)


def _plate_scale(material: OrthotropicElastic, thickness, width) -> np.ndarray:
    """pi^2 sqrt(D11 D22) / (b^2 t), Pa: the stress unit of the long-plate coefficients."""
    d11, d22, _ = material.plate_moduli()
    ratio = np.asarray(thickness, dtype=float) / np.asarray(width, dtype=float)
    return np.pi**2 * np.sqrt(d11 * d22) / 12.0 * ratio**2


def internal_compression_stress(material: OrthotropicElastic, thickness, width) -> np.ndarray:
    """Long plate, both long edges simply supported, uniform compression along the fibres, Pa.

    N_cr = 2 pi^2 / b^2 (sqrt(D11 D22) + D12 + 2 D66), the minimum over buckle lengths of the
    Navier solution (Lekhnitskii 1968 sec. 102; Whitney 1987 eq. 5.21, from memory); the
    isotropic limit is k = 4. Args: material (shape ``M``), thickness t and plate width b (m).
    """
    return (2.0 + 2.0 * material.twisting_ratio()) * _plate_scale(material, thickness, width)


def outstand_compression_stress(material: OrthotropicElastic, thickness, width) -> np.ndarray:
    """Long outstand (one long edge simply supported, one free), uniform compression, Pa.

    N_cr = 12 D66 / b^2 + pi^2 D11 / L^2 with L -> infinity (Kollár, Local buckling of fiber
    reinforced plastic composite structural members with open and closed cross sections,
    J. Struct. Eng. 129(11), 2003, table 1, from memory): sigma = G12 (t / b)^2. Isotropic
    limit 6 (1 - nu) / pi^2 = 0.4256 at nu = 0.3, the k = 0.425 of the isotropic library.
    """
    ratio = np.asarray(thickness, dtype=float) / np.asarray(width, dtype=float)
    return np.asarray(material.shear_modulus, dtype=float) * ratio**2


def internal_shear_stress(material: OrthotropicElastic, thickness, width) -> np.ndarray:
    """Long plate, both long edges simply supported, in-plane shear, Pa.

    Seydel (1933) as given by Kollár 2003 table 1 and Kollár & Springer, Mechanics of
    Composite Structures (2003) sec. 5.6 (from memory), theta = sqrt(D11 D22) / D3:

        N_cr = 4 (D11 D22^3)^(1/4) / b^2 (8.125 + 5.045 / theta)        theta >= 1
        N_cr = 4 sqrt(D22 D3) / b^2 (11.7 + 0.532 theta + 0.938 theta^2)  theta <= 1

    Isotropic limit 4 x 13.17 / pi^2 = 5.34.
    """
    d11, d22, d3 = material.plate_moduli()
    ratio = np.asarray(thickness, dtype=float) / np.asarray(width, dtype=float)
    theta = np.sqrt(d11 * d22) / d3
    stiff_twist = np.sqrt(d22 * d3) * (11.7 + 0.532 * theta + 0.938 * theta**2)
    weak_twist = (d11 * d22**3) ** 0.25 * (8.125 + 5.045 / np.maximum(theta, 1.0))
    return 4.0 / 12.0 * np.where(theta >= 1.0, weak_twist, stiff_twist) * ratio**2


BENDING_TERMS = 12
"""Sine terms across the width in the bending Galerkin solution; 12 converge the isotropic
coefficient to 23.9 (Timoshenko & Gere get 23.9 with three, sec. 9.6)."""

_WAVE_GRID = np.geomspace(0.25, 4.0, 49)


def long_plate_bending_coefficient(twisting_ratio: np.ndarray | float) -> np.ndarray:
    """k* of a long simply supported plate under in-plane pure bending (psi = -1), 1.

    The energy (Galerkin) solution of Timoshenko & Gere, Theory of Elastic Stability (1961)
    sec. 9.6, w = sin(pi x / l) sum a_n sin(n pi y / b), written for the specially orthotropic
    plate. With the affine buckle length kappa = (b / l) (D11 / D22)^(1/4) the coefficient
    depends on D* alone (Brunelle & Oyibo 1983, from memory):

        N_edge = k*(D*) pi^2 sqrt(D11 D22) / b^2,   k* = min over kappa of the smallest
        eigenvalue mu / (2 kappa^2) of diag(kappa^4 + 2 D* kappa^2 n^2 + n^4) a = mu G a,
        G_mn = integral over 0..1 of (1 - 2 eta) sin(m pi eta) sin(n pi eta) d eta.

    Isotropic limit 23.9. Args: D* of shape ``M``. Returns k* of shape ``M``.

    D* is a property of the material alone, so the arrays of the sizing (materials x
    proportions) repeat few values, and the same ones request after request: each distinct
    value is solved once and kept (:data:`_SOLVED`), then spread.
    """
    given = np.asarray(twisting_ratio, dtype=float)
    distinct, inverse = np.unique(given, return_inverse=True)
    new = [value for value in distinct.tolist() if value == value and value not in _SOLVED]
    if new:
        if len(_SOLVED) + len(new) > _SOLVED_LIMIT:
            _SOLVED.clear()
        _SOLVED.update(zip(new, _bending_coefficient(np.array(new)).tolist(), strict=True))
    solved = np.array([_SOLVED.get(value, np.nan) for value in distinct.tolist()])  # NaN: NaN
    return solved[inverse].reshape(given.shape)


_SOLVED: dict[float, float] = {}
"""k* of every D* solved so far (an unknown D*, NaN, has an unknown k*)."""

_SOLVED_LIMIT = 100_000
"""Entries kept before the memo starts afresh (client materials add values)."""


def _bending_coefficient(twisting: np.ndarray) -> np.ndarray:
    """:func:`long_plate_bending_coefficient` of a 1-D array of distinct D*."""
    n = np.arange(1, BENDING_TERMS + 1, dtype=float)
    m_plus_n = n[:, None] + n[None, :]
    odd = (m_plus_n % 2) == 1
    # integral of eta sin(m pi eta) sin(n pi eta): 1/4 on the diagonal, -4mn/(pi^2 (m^2-n^2)^2)
    # for m + n odd, 0 otherwise; the load is 1 - 2 eta.
    difference = np.where(odd, n[:, None] ** 2 - n[None, :] ** 2, 1.0)
    first_moment = np.where(odd, -4.0 * n[:, None] * n[None, :] / (np.pi**2 * difference**2), 0.0)
    load = np.eye(BENDING_TERMS) * 0.5 - 2.0 * (first_moment + np.eye(BENDING_TERMS) * 0.25)

    def coefficient(kappa: np.ndarray) -> np.ndarray:
        k2 = kappa[..., None] ** 2
        stiffness = k2**2 + 2.0 * twisting[..., None, None] * k2 * n**2 + n**4
        scale = 1.0 / np.sqrt(stiffness)
        # largest eigenvalue of S^-1/2 G S^-1/2 is 1 / (the smallest positive mu)
        symmetric = scale[..., :, None] * load * scale[..., None, :]
        largest = np.linalg.eigvalsh(symmetric)[..., -1]
        return 1.0 / (largest * 2.0 * kappa**2)

    grid = coefficient(np.broadcast_to(_WAVE_GRID, twisting.shape + _WAVE_GRID.shape))
    best = np.clip(np.argmin(grid, axis=-1), 1, _WAVE_GRID.size - 2)
    # a parabola through the best grid point and its neighbours, in log kappa
    log_grid = np.log(_WAVE_GRID)
    step = log_grid[1] - log_grid[0]
    left, centre, right = (np.take_along_axis(grid, (best + shift)[..., None], -1)[..., 0]
                           for shift in (-1, 0, 1))
    curvature = left - 2.0 * centre + right
    offset = np.where(curvature > 0, 0.5 * (left - right) / np.where(curvature > 0, curvature, 1),
                      0.0)
    kappa = np.exp(log_grid[best] + np.clip(offset, -1.0, 1.0) * step)
    return np.minimum(coefficient(kappa[..., None])[..., 0], centre)


def internal_bending_stress(material: OrthotropicElastic, thickness, width) -> np.ndarray:
    """Long plate, both long edges simply supported, in-plane pure bending, Pa: the edge
    compressive stress at buckling, k*(D*) pi^2 sqrt(D11 D22) t^2 / (12 b^2)
    (:func:`long_plate_bending_coefficient`)."""
    coefficient = long_plate_bending_coefficient(material.twisting_ratio())
    return coefficient * _plate_scale(material, thickness, width)


def cylinder_axial_stress(material: OrthotropicElastic, thickness, radius) -> np.ndarray:
    """Classical axial buckling stress of a long thin orthotropic cylinder, Pa.

    Donnell's equations for a specially orthotropic shell (NASA SP-8007, 1968 rev., sec. 4.1
    and 4.2.1, orthotropic cylinders; Jones, Buckling of Bars, Plates and Shells, 2006,
    from memory), buckle w = sin(alpha x) sin(beta y):

        N_x alpha^2 = D11 alpha^4 + 2 D3 alpha^2 beta^2 + D22 beta^4
                      + alpha^4 / (R^2 (a22 alpha^4 + (2 a12 + a66) alpha^2 beta^2 + a11 beta^4))

    Minimised over alpha^2 in closed form, N_x = (2 / R) min over s = (beta / alpha)^2 >= 0 of
    sqrt(P(s) / Q(s)), P = D11 + 2 D3 s + D22 s^2, Q = a22 + (2 a12 + a66) s + a11 s^2; the
    minimum of a ratio of quadratics is at s = 0, s -> infinity or a root of a quadratic. The
    isotropic limit is E t / (R sqrt(3 (1 - nu^2))). No imperfection knockdown here: the
    caller applies SP-8007's, whose equivalent thickness (D_x D_y / (E_x E_y))^(1/4) equals
    t / sqrt 12 for a homogeneous wall, as for an isotropic one.
    """
    e1, e2, g12, nu12 = material.arrays()
    d11, d22, d3 = material.plate_moduli()   # x 12 / t^3
    p = (d11, 2.0 * d3, d22)
    # x t: a22, 2 a12 + a66, a11
    q = (1.0 / e2, 1.0 / g12 - 2.0 * nu12 / e1, 1.0 / e1)
    a2 = p[2] * q[1] - p[1] * q[2]
    a1 = 2.0 * (p[2] * q[0] - p[0] * q[2])
    a0 = p[1] * q[0] - p[0] * q[1]
    discriminant = np.maximum(a1**2 - 4.0 * a2 * a0, 0.0)
    safe_a2 = np.where(np.abs(a2) > 1e-300, a2, 1.0)

    def ratio(s):
        return (p[0] + p[1] * s + p[2] * s**2) / (q[0] + q[1] * s + q[2] * s**2)

    candidates = [ratio(0.0), p[2] / q[2]]
    for sign in (-1.0, 1.0):
        root = (-a1 + sign * np.sqrt(discriminant)) / (2.0 * safe_a2)
        valid = (np.abs(a2) > 1e-300) & (root > 0)
        candidates.append(np.where(valid, ratio(np.where(valid, root, 0.0)), np.inf))
    smallest = np.minimum.reduce(candidates)
    # N = (2 / R) sqrt((t^3 / 12) P' t / Q' ... ) with P = P' t^3 / 12 and Q = Q' / t
    thickness = np.asarray(thickness, dtype=float)
    return 2.0 / np.asarray(radius, dtype=float) * np.sqrt(smallest / 12.0) * thickness


def brazier_moment(material: OrthotropicElastic, thickness, radius) -> np.ndarray:
    """Brazier's limit moment of a long orthotropic tube ovalising in bending, N m.

    Brazier (1927) balances the axial membrane stiffness E1 t against the hoop bending
    stiffness D22; written with both (from memory; it reduces to the isotropic
    (2 sqrt 2 / 9) pi E r t^2 / sqrt(1 - nu^2)):

        M = (2 sqrt 2 / 9) pi r sqrt(E1 t 12 D22 / t) t = (2 sqrt 2 / 9) pi r t^2
            sqrt(E1 E2 / (1 - nu12 nu21))
    """
    e1, _, _, _ = material.arrays()
    _, d22, _ = material.plate_moduli()
    thickness = np.asarray(thickness, dtype=float)
    return (BRAZIER_COEFFICIENT * np.pi * np.asarray(radius, dtype=float) * thickness**2
            * np.sqrt(e1 * d22))


def long_cylinder_torsion_stress(material: OrthotropicElastic, thickness, radius) -> np.ndarray:
    """Classical torsional buckling stress of a long orthotropic tube, Pa (no knockdown).

    The long-tube limit of Timoshenko & Gere (1961) sec. 11.12, tau = E (t/r)^1.5 /
    (3 sqrt 2 (1 - nu^2)^0.75), comes from an ovalising helical buckle that bends the wall
    around the tube and stretches it along the tube only; written with those two stiffnesses
    (hoop bending 12 D22 / t^3 and axial E1) it reads (from memory; derivation as in the
    isotropic case):

        tau = (12 D22 / t^3)^(3/4) E1^(1/4) (t / r)^1.5 / (3 sqrt 2)

    It holds for tubes longer than about 3 r sqrt(r / t) (E1 / E2)^(1/4), the members here.
    """
    e1, _, _, _ = material.arrays()
    _, d22, _ = material.plate_moduli()
    ratio = np.asarray(thickness, dtype=float) / np.asarray(radius, dtype=float)
    return LONG_CYLINDER_TORSION * d22**0.75 * e1**0.25 * ratio**1.5
