"""Whether a material is brittle: the rule, over arrays of materials.

A material is **brittle** when it breaks at a small strain *and* has a low fracture
toughness (typical values of both):

- elongation at break below :data:`BRITTLE_ELONGATION` (5 %): the usual dividing line between
  brittle and ductile behaviour (Budynas & Nisbett, Shigley's Mechanical Engineering Design,
  9th ed., sec. 5-1: ductile when the strain at fracture is at least 0.05; from memory);
- fracture toughness below :data:`BRITTLE_TOUGHNESS` (20 MPa m^0.5): common practice for
  "tolerates crack-like defects of a few millimetres at working stresses". Structural
  steels (50 and more), wrought aluminium alloys (about 24 and more) and fibre composites
  loaded across their fibres (about 20-60) lie above it; ceramics (3-10), glasses (below 1),
  grey cast iron (about 15) and unfilled glassy polymers (1-3) below.

Either property above its threshold makes the material ductile (fibre composites and cast
irons break at 1-2 % strain yet stop cracks; tough polymers are weak but stretch), so both
must be low. Where one value is unknown the known one decides if it shows ductility;
otherwise (one low, the other unknown) the material is taken as brittle, the safe side.
With neither known, ceramics and glasses (:data:`BRITTLE_FAMILIES`) are brittle and other
families are not.
"""

from __future__ import annotations

from collections.abc import Sequence

import numpy as np

BRITTLE_ELONGATION = 0.05
"""Strain at break below which a material counts as brittle (Shigley, sec. 5-1)."""

BRITTLE_TOUGHNESS = 20e6
"""Fracture toughness, Pa m^0.5, below which a material counts as brittle (common practice)."""

BRITTLE_FAMILIES: frozenset[str] = frozenset({"ceramic", "glass"})
"""Families taken as brittle when neither elongation nor fracture toughness is known."""


def brittle(
    elongation: np.ndarray, fracture_toughness: np.ndarray, families: Sequence[str]
) -> np.ndarray:
    """The brittle flag of each material, bool array of shape (n,).

    Args:
        elongation: typical strain at break, shape (n,), NaN where unknown.
        fracture_toughness: typical K_IC in Pa m^0.5, shape (n,), NaN where unknown.
        families: family id of each material, length n.
    """
    elongation = np.asarray(elongation, dtype=float)
    toughness = np.asarray(fracture_toughness, dtype=float)
    known_strain, known_toughness = ~np.isnan(elongation), ~np.isnan(toughness)
    with np.errstate(invalid="ignore"):
        small_strain = known_strain & (elongation < BRITTLE_ELONGATION)
        low_toughness = known_toughness & (toughness < BRITTLE_TOUGHNESS)
    ductile = (known_strain & ~small_strain) | (known_toughness & ~low_toughness)
    by_family = np.array([family in BRITTLE_FAMILIES for family in families], dtype=bool)
    return np.where(
        ductile, False, np.where(small_strain | low_toughness, True, by_family.reshape(-1))
    ).astype(bool)


def brittle_reason(elongation: float, fracture_toughness: float, family: str) -> str:
    """Why a brittle material counts as brittle, for a rejection: the values below the rule's
    thresholds (NaN where unknown), else its family or its own statement."""
    low = []
    if elongation < BRITTLE_ELONGATION:
        limit = 100 * BRITTLE_ELONGATION
        low.append(f"strain at break {100 * elongation:.2g} % (under {limit:g} %)")
    if fracture_toughness < BRITTLE_TOUGHNESS:
        low.append(
            f"fracture toughness {fracture_toughness / 1e6:.2g} MPa m^0.5 "
            f"(under {BRITTLE_TOUGHNESS / 1e6:g})"
        )
    if low:
        why = " and ".join(low)
    elif family in BRITTLE_FAMILIES and np.isnan(elongation) and np.isnan(fracture_toughness):
        why = f"a {family} without ductility data"
    else:
        why = "stated brittle by its data"
    return f"brittle ({why}): it may break without warning"
