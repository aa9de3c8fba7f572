"""High-cycle fatigue of a member under steady, reversed and pulsating actions.

Method (Shigley's Mechanical Engineering Design, 10th ed., ch. 6, from memory):

1. Mean and alternating parts. Every action is split by its cyclic kind
   (``service.core.loading.actions.CYCLIC_PARTS``, eq. 6-36); because the member is linear,
   the internal actions of the mean and of the alternating loading are the two loadings
   solved apart (``member_loading(..., part="mean" | "alternating")``). All alternating
   actions are taken in phase (one load cycle): amplitudes add, which is exact for one source
   and the usual assumption for several. On a ``rotating`` shaft the bending stress reverses
   once per turn whatever the load does: :func:`rotating_bending` makes the whole bending
   moment alternating. Both parts are cut into the same pieces
   (:mod:`service.core.loading.segments`: the positions, and so the breakpoints, are the
   same); taking each part's largest |M| in a piece pairs them at the same section, or, where
   they peak at different points of the piece, errs on the safe side.
2. Equivalent stresses by distortion energy (section 6-14, eqs. 6-66 and 6-67, with the
   fatigue stress-concentration factors K_f = K_fs = 1 of a plain member and the axial
   alternating stress divided by the axial load factor 0.85):

       sigma'_a = sqrt((sigma_a,bending + sigma_a,axial / 0.85)^2 + 3 tau_a^2)
       sigma'_m = sqrt((sigma_m,bending + sigma_m,axial)^2 + 3 tau_m^2)

   (:func:`equivalent_alternating_and_mean`; the stresses are those of the outer fibre of
   ``service.core.loading.stress``).
3. Endurance strength of the part: S_e = k_a k_b S_e' (Marin's equation, eq. 6-18) with the
   surface factor k_a = a S_ut^b (table 6-2, eq. 6-19; capped at 1, common practice) and the
   size factor k_b (eq. 6-20; for a non-rotating section the equivalent diameter of
   eqs. 6-23 and 6-25). The load factor is 1 in the combined equation (step 2). S_e' is the
   material's fatigue strength at its own cycle count (the material table's
   ``fatigue_strength`` of smooth specimens, fully reversed, and ``fatigue_cycles``:
   10^6 for steels, whose value is an endurance limit, 5e8 for aluminium alloys and 10^7 to
   10^8 for others, which have none; data/README.md).
4. Life. The S-N line runs straight on log-log axes from f S_ut at 10^3 cycles to the
   fatigue strength at its reference count (eqs. 6-13 to 6-16, there with 10^6 cycles and
   f = 0.9); below 10^3 cycles the strength is f S_ut. Beyond the reference count a material
   with an endurance limit (steels) keeps that strength; one without (aluminium, copper
   alloys, polymers) follows the line further down (an extrapolation: on the safe side for
   the usual straight or flattening S-N curves).
5. Mean-stress rule: modified Goodman (section 6-12, eq. 6-41):
   n_f = 1 / (sigma'_a / S_f + sigma'_m / S_ut). A compressive mean normal stress is given
   no credit (the criterion is taken flat on that side, section 6-12). Static yielding on
   the first cycle (sigma'_a + sigma'_m <= S_y) is the static combined-stress check's job.

Everything broadcasts; stresses in Pa, strengths in Pa, cycles as counts.
"""

from __future__ import annotations

import math

import numpy as np

SURFACE_FACTORS = {
    # finish -> (a for S_ut in MPa, exponent b): Shigley 10th ed., table 6-2 (from memory)
    "ground": (1.58, -0.085),
    "machined": (4.51, -0.265),   # also cold-drawn
    "hot_rolled": (57.7, -0.718),
    "as_forged": (272.0, -0.995),
}
"""Surface finish -> Marin surface factor constants (a, b), k_a = a S_ut[MPa]^b."""

AXIAL_LOAD_FACTOR = 0.85
"""k_c for axial loading (Shigley 10th ed., eq. 6-26, from memory)."""

LOW_CYCLE_FRACTION = 0.9
"""f: the fraction of S_ut reached at 10^3 cycles (Shigley 10th ed., section 6-7, the value
for S_ut below 490 MPa, used for every material: common practice for a first estimate)."""


def surface_factor(ultimate_strength, finish: str = "machined"):
    """Marin k_a = a S_ut^b (S_ut in Pa, converted to MPa for the table), at most 1."""
    a, b = SURFACE_FACTORS[finish]
    return np.minimum(a * (np.asarray(ultimate_strength, dtype=float) / 1e6) ** b, 1.0)


def size_factor(diameter, rotating: bool = True, shape: str = "round", width=None):
    """Marin k_b for bending and torsion (Shigley 10th ed., eqs. 6-20, 6-23, 6-25).

    Args:
        diameter: d, m (for ``shape="rectangle"``, the depth h).
        rotating: True for a rotating round; otherwise the equivalent diameter
            d_e = 0.370 d (round) or 0.808 sqrt(h b) (rectangle) is used.
        shape: ``"round"`` or ``"rectangle"``.
        width: b, m, for rectangles.

    k_b = (d / 7.62 mm)^-0.107 for 2.79 mm <= d <= 51 mm, 1.51 d[mm]^-0.157 up to 254 mm;
    the 254 mm value above (beyond the published range). Capped at 1 (no credit for sizes
    below the 7.62 mm test specimen: conservative, common practice).
    """
    d = np.asarray(diameter, dtype=float) * 1e3
    if shape == "rectangle":
        d = 0.808 * np.sqrt(d * np.asarray(width, dtype=float) * 1e3)
    elif not rotating:
        d = 0.370 * d
    d = np.clip(d, 2.79, 254.0)
    return np.minimum(np.where(d <= 51.0, (d / 7.62) ** -0.107, 1.51 * d**-0.157), 1.0)


def fatigue_strength_at(cycles, ultimate_strength, reference_strength, reference_cycles,
                        endurance_limit):
    """S_f at ``cycles``, Pa: the S-N line of step 4 in the module docstring.

    Args:
        cycles: N, count (>= 1).
        ultimate_strength: S_ut, Pa.
        reference_strength: the fatigue strength of the part (S_e after Marin factors), Pa,
            at ``reference_cycles``.
        reference_cycles: its cycle count (> 10^3).
        endurance_limit: bool: True keeps the reference strength beyond its count.
    """
    cycles = np.asarray(cycles, dtype=float)
    low = LOW_CYCLE_FRACTION * np.asarray(ultimate_strength, dtype=float)
    reference = np.asarray(reference_strength, dtype=float)
    reference_cycles = np.asarray(reference_cycles, dtype=float)
    # Basquin line S = low (N / 10^3)^b through (10^3, f S_ut) and the reference point
    exponent = np.log10(reference / low) / np.log10(reference_cycles / 1e3)
    on_line = low * (np.maximum(cycles, 1e3) / 1e3) ** exponent
    flat = np.asarray(endurance_limit, dtype=bool) & (cycles > reference_cycles)
    return np.minimum(np.where(flat, reference, on_line), low)


def rotating_bending(mean_moment, alternating_moment):
    """(mean, alternating) bending moment of a rotating shaft, N m: fully reversed,
    amplitude |M_m| + |M_a| (the worst phase of a fluctuating load on a turning section)."""
    mean = np.abs(np.asarray(mean_moment, dtype=float))
    alternating = np.abs(np.asarray(alternating_moment, dtype=float))
    return np.zeros_like(mean + alternating), mean + alternating


def equivalent_alternating_and_mean(alternating_bending, alternating_axial, alternating_shear,
                                    mean_bending, mean_axial, mean_shear):
    """(sigma'_a, sigma'_m), Pa, by eqs. 6-66 and 6-67 (module docstring, step 2).

    Arguments are stresses at the outer fibre, Pa: bending and axial normal stresses and the
    shear stress, each as its alternating amplitude and its mean (signed; the axial mean is
    positive in tension). The fibre where the mean bending stress is tensile is taken (it is
    the worse of the two: same amplitude, larger mean). A compressive mean normal stress is
    given no credit: it counts as zero, and the mean shear still counts.
    """
    alternating = np.hypot(np.abs(np.asarray(alternating_bending, dtype=float))
                           + np.abs(np.asarray(alternating_axial, dtype=float))
                           / AXIAL_LOAD_FACTOR,
                           math.sqrt(3.0) * np.asarray(alternating_shear, dtype=float))
    mean_normal = np.abs(np.asarray(mean_bending, dtype=float)) + np.asarray(mean_axial,
                                                                             dtype=float)
    mean = np.hypot(np.maximum(mean_normal, 0.0),
                    math.sqrt(3.0) * np.asarray(mean_shear, dtype=float))
    return alternating, mean


def goodman_utilization(alternating, mean, fatigue_strength, ultimate_strength,
                        safety_factor=1.0):
    """Modified Goodman demand over capacity, n_required (sigma'_a / S_f + sigma'_m / S_ut),
    dimensionless (<= 1 passes; eq. 6-41), from :func:`equivalent_alternating_and_mean`."""
    ratio = (np.asarray(alternating, dtype=float) / np.asarray(fatigue_strength, dtype=float)
             + np.asarray(mean, dtype=float) / np.asarray(ultimate_strength, dtype=float))
    return np.asarray(safety_factor, dtype=float) * ratio
