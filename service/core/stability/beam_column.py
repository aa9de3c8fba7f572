"""Beam-columns: bending amplified by axial compression, and the interaction check.

Amplification of the first-order moment by an axial compression P (Timoshenko & Gere, Theory
of Elastic Stability, 2nd ed. 1961, sec. 1.11-1.13; AISC 360-16 appendix 8 eq. A-8-3 with
C_m = 1 and alpha = 1 on factored loads; from memory):

    M_amplified = M / (1 - P / P_cr)

P_cr is the Euler load in the plane of bending (about the major axis, with the effective length
of the supports, ``columns.BENDING_END_CONDITIONS``). C_m = 1 is the conservative value for
every moment diagram.

Interaction, a linear sum of the member's utilisations:

    N_tension / N_t + P / N_b + M_amplified / M_b <= 1

with N_t = A f (``ties``), N_b the column resistance about the weaker axis (``columns``) and
M_b the lateral-torsional buckling resistance (``lateral_torsional``). With chi = 1 it is the
first-yield condition N / A + M / Z <= f of an elastic section (EN 1993-1-1:2005 6.2.1(7),
the conservative linear summation, from memory); with buckling it is never less conservative
than AISC 360-16 eq. H1-1a/H1-1b (P/P_c + 8/9 M/M_c, or P/(2 P_c) + M/M_c), which a test
checks. Tension does not amplify bending and is not credited against lateral-torsional
buckling (conservative).
"""

from __future__ import annotations

import numpy as np


def amplification(compression, critical_load) -> np.ndarray:
    """1 / (1 - P / P_cr), dimensionless; ``inf`` where P >= P_cr, 1 where P <= 0.

    Args:
        compression: P, the axial compression, N (negative or zero: no compression).
        critical_load: P_cr, the Euler load in the plane of bending, N.
    """
    ratio = np.maximum(np.asarray(compression, dtype=float), 0.0) / np.asarray(
        critical_load, dtype=float)
    with np.errstate(divide="ignore"):
        return np.where(ratio < 1.0, 1.0 / np.maximum(1.0 - ratio, 0.0), np.inf)


def interaction(axial_force, moment, tension_resistance, compression_resistance,
                moment_resistance, in_plane_critical_load) -> np.ndarray:
    """The beam-column utilisation (see the module docstring), <= 1 where the member holds.

    Args:
        axial_force: N, positive tension, negative compression (the contract's sign), N.
        moment: the peak first-order bending moment |M|, N m.
        tension_resistance: N_t, N.
        compression_resistance: N_b, N.
        moment_resistance: M_b, N m.
        in_plane_critical_load: P_cr in the plane of bending, N.

    Every argument is already factored (loads times the safety factor, or resistances
    divided by it) and broadcasts; the result has the broadcast shape.
    """
    force = np.asarray(axial_force, dtype=float)
    if not np.count_nonzero(force):
        # a beam: both axial terms are 0 / N = 0 (the resistances are positive) and the
        # amplification 1, so the bending term alone is the sum (the same value, several
        # times cheaper: this is most of every scale search's evaluations)
        moment = np.abs(np.asarray(moment, dtype=float))
        loaded = moment > 0.0
        if np.count_nonzero(loaded) < loaded.size:     # (every moment positive: as it is)
            moment = np.where(loaded, moment, 0.0)
        bending = moment / np.asarray(moment_resistance, dtype=float)
        others = (force, tension_resistance, compression_resistance, in_plane_critical_load)
        # (getattr, not np.shape: a float has no shape to make an array for)
        if all(getattr(other, "shape", ()) in ((), bending.shape) for other in others):
            return bending
        shape = np.broadcast_shapes(bending.shape, *(np.shape(other) for other in others))
        return np.broadcast_to(bending, shape).copy()
    tension = np.maximum(force, 0.0)
    compression = np.maximum(-force, 0.0)
    moment = np.abs(np.asarray(moment, dtype=float))
    # a zero moment stays zero even where the compression reaches P_cr (0 x inf)
    with np.errstate(invalid="ignore"):
        amplified = np.where(moment > 0.0, moment * amplification(
            compression, in_plane_critical_load), 0.0)
    return (tension / np.asarray(tension_resistance, dtype=float)
            + compression / np.asarray(compression_resistance, dtype=float)
            + amplified / np.asarray(moment_resistance, dtype=float))
