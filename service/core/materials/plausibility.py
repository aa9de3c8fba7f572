"""Physically possible ranges of every material property, to catch unit slips.

A client that sends ``"youngs_modulus": {"low": 200, ...}`` meaning GPa gets a 200 Pa material
and, without this check, a 20-tonne tube for a 10 N load (issue 20). Each range is wide enough
for every solid used in a structure (or as a sandwich core) and still excludes values off by a
factor of 1000 from any of them; a value outside is refused with the unit prefix that would
bring it inside, as a hint.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass
from types import MappingProxyType

import numpy as np


@dataclass(frozen=True)
class PlausibleRange:
    """Smallest and largest possible value of a property (SI), and where they come from."""

    low: float
    high: float
    source: str


_STRENGTH = PlausibleRange(
    1e4, 1e10,
    "10 kPa (the weakest cellular cores, about 0.1 MPa, with a 10x margin) to 10 GPa (above "
    "the strongest commercial fibres, about 7 GPa: Ashby, Materials Selection in Mechanical "
    "Design, 5th ed., chart 4.3); common practice",
)
_MODULUS = PlausibleRange(
    1e4, 1.3e12,
    "10 kPa (soft foams, about 0.1-1 MPa, with a margin) to 1.3 TPa (diamond, 1.05-1.22 TPa: "
    "CRC Handbook of Chemistry and Physics, elastic constants of single crystals); from memory",
)

PLAUSIBLE: Mapping[str, PlausibleRange] = MappingProxyType({
    "density": PlausibleRange(
        1.0, 2.3e4,
        "1 kg/m^3 (silica aerogels, the lightest solids) to 23 000 kg/m^3 (osmium, "
        "22 590 kg/m^3, the densest element: CRC Handbook of Chemistry and Physics); from memory",
    ),
    "youngs_modulus": _MODULUS,
    "transverse_modulus": _MODULUS,
    "shear_modulus": PlausibleRange(
        3e3, 6e11,
        "3 kPa (soft foams) to 600 GPa (diamond, about 530 GPa: CRC Handbook); from memory",
    ),
    "poisson_ratio": PlausibleRange(
        1e-3, 0.5,
        "above 0 for the materials this service accepts, at most 0.5 (incompressible limit of "
        "isotropic elasticity: Timoshenko & Goodier, Theory of Elasticity, 3rd ed., sec. 5)",
    ),
    "strength": _STRENGTH,
    "tensile_strength": _STRENGTH,
    "shear_strength": _STRENGTH,
    "compressive_strength": _STRENGTH,
    "fatigue_strength": _STRENGTH,
    "fracture_toughness": PlausibleRange(
        1e4, 5e8,
        "0.01 MPa m^0.5 (foams) to 500 MPa m^0.5 (above the toughest steels, about 200-300: "
        "Ashby, Materials Selection in Mechanical Design, 5th ed., chart 4.7); from memory",
    ),
    "elongation": PlausibleRange(
        1e-5, 10.0,
        "1e-5 (glass and ceramics break near 1e-4) to 10, i.e. 1000 % (elastomers); "
        "common practice",
    ),
    "price": PlausibleRange(
        1e-3, 1e5,
        "0.001 to 100 000 currency units per kg (from bulk aggregates to precious metals); "
        "common practice",
    ),
    "embodied_carbon": PlausibleRange(
        1e-3, 1e3,
        "0.001 to 1000 kg CO2e per kg (timber's fossil share to sintered specialty ceramics and "
        "precious metals); common practice",
    ),
    "max_service_temperature": PlausibleRange(
        20.0, 4000.0,
        "20 K (cryogenic service) to 4000 K (above the melting point of tungsten, 3695 K: CRC "
        "Handbook of Chemistry and Physics); from memory",
    ),
})
"""Property -> its possible range. Every property of the material vocabulary has one (tested)."""

_SLIPS = (1e3, 1e6, 1e9, 1e-3, 1e-6)
"""Factors of a unit prefix left off (k, M, G) or added (m, µ), tried in this order."""


def implausible(prop: str, values: np.ndarray) -> dict[int, str]:
    """Row index -> message for each finite positive value outside ``prop``'s range.

    Args:
        prop: a property name with an entry in :data:`PLAUSIBLE`.
        values: shape (n,), SI, NaN where absent (absent and non-positive values are reported
            by the other checks).
    """
    bounds = PLAUSIBLE[prop]
    with np.errstate(invalid="ignore"):
        outside = np.isfinite(values) & (values > 0) & (
            (values < bounds.low) | (values > bounds.high)
        )
    return {int(i): _message(prop, float(values[i]), bounds) for i in np.flatnonzero(outside)}


def _message(prop: str, value: float, bounds: PlausibleRange) -> str:
    text = (
        f"{value:g} is outside the possible range of {prop}, {bounds.low:g} to {bounds.high:g} "
        f"(SI; {bounds.source})"
    )
    possible = [
        f"{value * factor:g}"
        for factor in _SLIPS
        if math.isfinite(value * factor) and bounds.low <= value * factor <= bounds.high
    ]
    if possible:
        return (f"{text}; {' or '.join(possible)} would be possible: was a unit prefix left off "
                "or added? send the value with its unit")
    return text
