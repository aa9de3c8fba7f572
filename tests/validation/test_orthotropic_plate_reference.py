"""Orthotropic long-plate buckling against an independent numerical eigenvalue solution.

Reference: the plate equation of a specially orthotropic plate (Whitney 1987 eq. 5.1, from
memory) for an infinitely long plate, w = Re(f(y) exp(i k x)), simply supported long edges
(f = f'' = 0 at y = 0, b):

    D22 f'''' - 2 D3 k^2 f'' + D11 k^4 f = N_x(y) k^2 f - 2 i k N_xy f'

solved here by second-order finite differences across the width (150 nodes) with scipy's
generalised Hermitian eigensolver, and minimised over the buckle wavelength with scipy's
bounded scalar minimiser. It shares nothing with the module's closed forms (compression,
shear) or its sine-series Galerkin (bending).

Measured (150 nodes; 300 nodes move the reference by under 0.01 %): compression within
0.004 %, bending within 0.014 %, shear 0.02 % for the isotropic plate and 1.3 % below the
reference for the four laminates (Seydel's formula is a fit to his series solution).
Tolerances: 0.3 %, 0.5 % (the series is converged to 0.2 %), 2 %.
"""

from __future__ import annotations

import numpy as np
import pytest
from scipy.linalg import eigh
from scipy.optimize import minimize_scalar

from service.core.sections import orthotropic
from service.core.sections.orthotropic import OrthotropicElastic

NODES = 150

# E1, E2, G12, nu12 spanning isotropic to strongly orthotropic walls (D* from about 0.15 to 1;
# typical unidirectional glass, carbon and high-modulus carbon laminates, from memory).
MATERIALS = {
    "isotropic": (70e9, 70e9, 70e9 / 2.6, 0.3),
    "glass UD": (40e9, 10e9, 4e9, 0.28),
    "carbon UD": (140e9, 9e9, 5e9, 0.3),
    "high-modulus carbon UD": (230e9, 6.6e9, 4.8e9, 0.3),
    "aramid UD": (76e9, 5.5e9, 2.3e9, 0.34),
}


def _critical(material: OrthotropicElastic, load: str) -> float:
    """Smallest critical edge stress resultant over buckle wavelengths, plate b = 1, t = 1."""
    d11, d22, d3 = (value / 12.0 for value in material.plate_moduli())
    h = 1.0 / (NODES + 1)
    y = np.arange(1, NODES + 1) * h
    second = (np.diag(-2.0 * np.ones(NODES)) + np.diag(np.ones(NODES - 1), 1)
              + np.diag(np.ones(NODES - 1), -1)) / h**2
    first = (np.diag(np.ones(NODES - 1), 1) - np.diag(np.ones(NODES - 1), -1)) / (2 * h)
    profile = {"compression": np.ones(NODES), "bending": 1.0 - 2.0 * y}

    def resultant(log_k: float) -> float:
        k = np.exp(log_k)
        stiffness = d22 * second @ second - 2.0 * d3 * k**2 * second + d11 * k**4 * np.eye(NODES)
        if load == "shear":
            geometric = -2j * k * first
        else:
            geometric = np.diag(k**2 * profile[load]).astype(complex)
        if load != "shear":
            geometric, stiffness_matrix = geometric.real, stiffness
        else:
            stiffness_matrix = stiffness.astype(complex)
        largest = eigh(geometric, stiffness_matrix, eigvals_only=True,
                       subset_by_index=[NODES - 1, NODES - 1])[0]
        return 1.0 / largest

    result = minimize_scalar(resultant, bounds=(np.log(0.3), np.log(20.0)), method="bounded",
                             options={"xatol": 1e-4})
    return result.fun


FORMULAS = {
    "compression": (orthotropic.internal_compression_stress, 0.003),
    "bending": (orthotropic.internal_bending_stress, 0.005),
    "shear": (orthotropic.internal_shear_stress, 0.02),
}


@pytest.mark.parametrize("load", list(FORMULAS))
def test_long_plate_stress_against_finite_difference_eigenvalue(load):
    formula, tolerance = FORMULAS[load]
    problems = []
    for name, constants in MATERIALS.items():
        material = OrthotropicElastic(*constants)
        ours = float(formula(material, 1.0, 1.0))
        reference = _critical(material, load)
        deviation = ours / reference - 1
        if abs(deviation) > tolerance:
            problems.append(f"{load} {name} (D* {float(material.twisting_ratio()):.3f}): ours "
                            f"{ours:.5g}, FD {reference:.5g}, {deviation:+.2%} > {tolerance:.1%}")
    assert not problems, "\n".join(problems)
