"""Classical elastic plate buckling shared by the flat-walled families.

Flat plate with simply supported loaded edges, long in the loading direction
(Timoshenko & Gere, Theory of Elastic Stability, 2nd ed. 1961, ch. 9; Bulson, The Stability
of Flat Plates, 1970 — from memory):

    sigma_cr = k pi^2 E / (12 (1 - nu^2)) (t / b)^2

The buckling coefficients below are the long-plate minima (the plates of a member are many
widths long, so the minimum over buckle wavelengths applies).
"""

from __future__ import annotations

import numpy as np

from service.core.sections.base import Elastic

INTERNAL_COMPRESSION = 4.0
"""k for an internal element (both long edges simply supported) in uniform compression
(Timoshenko & Gere sec. 9.2, from memory)."""

OUTSTAND_COMPRESSION = 0.425
"""k for an outstand (one long edge simply supported, one free) in uniform compression
(Timoshenko & Gere sec. 9.3; Bulson ch. 2, from memory)."""

INTERNAL_BENDING = 23.9
"""k for an internal element under in-plane pure bending, stress zero at mid-width
(Timoshenko & Gere sec. 9.6, from memory)."""

INTERNAL_SHEAR = 5.34
"""k for a long internal element (both long edges simply supported) in pure shear, the
a/b -> infinity limit of k = 5.34 + 4 (b/a)^2 (Timoshenko & Gere sec. 9.7, from memory)."""


def plate_buckling_stress(
    coefficient: float, material: Elastic, thickness: np.ndarray, width: np.ndarray | float
) -> np.ndarray:
    """Critical stress of a long flat plate, Pa (normal or shear, as the coefficient's load).

    Args:
        coefficient: k, one of this module's constants.
        material: E (Pa) and nu of the plate, broadcastable with the geometry.
        thickness: plate thickness t, m.
        width: loaded plate width b between its supported edges (or support to free edge), m.

    Returns:
        k pi^2 E / (12 (1 - nu^2)) (t / b)^2, Pa, the broadcast shape of the inputs.
    """
    nu = np.asarray(material.poisson_ratio, dtype=float)
    plate_modulus = (
        np.pi**2 * np.asarray(material.youngs_modulus, dtype=float) / (12.0 * (1.0 - nu**2))
    )
    return coefficient * plate_modulus * (np.asarray(thickness) / np.asarray(width)) ** 2


def no_buckling(*arrays: np.ndarray | float) -> np.ndarray:
    """``inf`` in the broadcast shape of the arrays: a mode the element cannot have."""
    return np.full(np.broadcast_shapes(*(np.shape(a) for a in arrays)), np.inf)
