"""Ties: members in axial tension, sized by strength and by extension.

    N_t = A f               (the cross-section's tension resistance, before a safety factor;
                             EN 1993-1-1:2005 6.2.3 eq. 6.6 with gamma_M0 = 1, from memory)
    delta = N L / (E A)     (Hooke's law for a prismatic bar)

f is the design strength of the material (for composites the tensile strength, see the
materials data). Tension does not buckle the member; net sections at holes and connections
are not modelled (preliminary sizing).
"""

from __future__ import annotations

import numpy as np


def tension_resistance(area, strength) -> np.ndarray:
    """A f, N (A in m^2, f in Pa; arrays broadcast)."""
    return np.asarray(area, dtype=float) * np.asarray(strength, dtype=float)


def extension(load, span, youngs_modulus, area) -> np.ndarray:
    """N L / (E A), m (N in N, L in m, E in Pa, A in m^2; arrays broadcast)."""
    return (np.asarray(load, dtype=float) * np.asarray(span, dtype=float)
            / (np.asarray(youngs_modulus, dtype=float) * np.asarray(area, dtype=float)))
