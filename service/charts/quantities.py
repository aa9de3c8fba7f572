"""Names, symbols and units of the quantities charts put on their axes.

An axis quantity is a product of powers of material properties, ``{"youngs_modulus": 0.5,
"density": -1}``; :func:`axis_label` writes it for people, with its unit. A single property
is shown in a unit people read (GPa, MPa); a product stays in SI units.
"""

from __future__ import annotations

from collections.abc import Mapping
from fractions import Fraction

from service.core.materials import UNITS

SYMBOLS = {
    "density": "\u03c1",
    "youngs_modulus": "E",
    "shear_modulus": "G",
    "poisson_ratio": "\u03bd",
    "strength": "\u03c3f",
    "tensile_strength": "\u03c3t",
    "price": "Cm",
    "embodied_carbon": "CO\u2082e",
    "max_service_temperature": "Tmax",
    "shear_strength": "\u03c4f",
}
"""Property -> the symbol used in axis labels of products (the property name otherwise)."""

WORDS = {
    "density": "density",
    "youngs_modulus": "Young's modulus",
    "shear_modulus": "shear modulus",
    "poisson_ratio": "Poisson's ratio",
    "strength": "strength",
    "tensile_strength": "tensile strength",
    "price": "price",
    "embodied_carbon": "embodied carbon",
    "max_service_temperature": "max. service temperature",
    "shear_strength": "shear strength",
}

_READABLE_UNITS = {
    "kg/m^3": "kg/m\u00b3",
    "kg/kg": "kg CO\u2082e/kg",
    "1": "",
}


def power_text(power: float) -> str:
    """``1`` -> ``""``, ``0.5`` -> ``"^(1/2)"``, ``2`` -> ``"^2"``."""
    fraction = Fraction(power).limit_denominator(12)
    if abs(float(fraction) - power) > 1e-9:
        return f"^{power:.3g}"
    if fraction == 1:
        return ""
    if fraction.denominator == 1:
        return f"^{fraction.numerator}"
    return f"^({fraction.numerator}/{fraction.denominator})"


def ratio_text(value: float) -> str:
    """A slope for a legend: a small fraction where it is one (``2``, ``1/2``, ``3/2``)."""
    fraction = Fraction(value).limit_denominator(12)
    if abs(float(fraction) - value) <= 1e-9:
        return str(fraction)
    return f"{value:.3g}"


def product_text(exponents: Mapping[str, float], parts: Mapping[str, str]) -> str:
    """``{"a": 0.5, "b": -1}`` with parts {"a": "E", "b": "rho"} -> ``"E^(1/2) / rho"``."""
    rising = [parts[n] + power_text(p) for n, p in exponents.items() if p > 0]
    falling = [parts[n] + power_text(-p) for n, p in exponents.items() if p < 0]
    top = " ".join(rising) or "1"
    if not falling:
        return top
    bottom = " ".join(falling)
    return f"{top} / ({bottom})" if len(falling) > 1 else f"{top} / {bottom}"


def symbol(name: str) -> str:
    return SYMBOLS.get(name, name)


def readable_unit(unit: str) -> str:
    return _READABLE_UNITS.get(unit, unit)


def display_scale(exponents: Mapping[str, float], typical: float) -> tuple[float, str]:
    """(divide SI values by this, unit text) for an axis.

    A single property in Pa is shown in GPa or MPa (whichever puts ``typical`` at 1 or above
    in it); every other quantity keeps its SI unit.
    """
    if len(exponents) == 1:
        (name, power), = exponents.items()
        unit = UNITS.get(name, "")
        if power == 1 and unit == "Pa":
            return (1e9, "GPa") if typical >= 1e9 else (1e6, "MPa")
        if power == 1:
            return 1.0, readable_unit(unit)
    units = {n: readable_unit(UNITS.get(n, "")) for n in exponents}
    shown = {n: p for n, p in exponents.items() if units[n]}
    return 1.0, product_text(shown, {n: _grouped(units[n]) for n in shown}) if shown else ""


def _grouped(unit: str) -> str:
    return f"({unit})" if any(c in unit for c in " /") else unit


def axis_label(exponents: Mapping[str, float], unit: str) -> str:
    """``density \u03c1 (kg/m\u00b3)`` for one property, ``E^(1/2) / \u03c1 (...)`` for a
    product."""
    if len(exponents) == 1 and next(iter(exponents.values())) == 1:
        name = next(iter(exponents))
        text = f"{WORDS.get(name, name)} {symbol(name)}" if name in SYMBOLS else name
    else:
        text = product_text(exponents, {n: symbol(n) for n in exponents})
    return f"{text} ({unit})" if unit else f"{text} (dimensionless)"
