"""The unit-aware number field: the one place where units become SI.

A client may send any numeric input either as a plain number, read as SI, or as a string with
a unit (``"25 mm"``, ``"2.5 kN"``, ``"70 GPa"``, ``"3 deg"``), which pint converts. In a JSON
body a string must carry its unit: ``"5"`` for a length is refused, because a client that forgot
to append ``" mm"`` would otherwise be wrong by 1000x without an error (schemas/README.md,
"Answers a client can trust"). Query strings, where every value is text, keep reading a bare
number as SI, and a dimensionless field accepts a bare number in a string. The core only ever
sees SI floats.
"""

from __future__ import annotations

import math
import re
from functools import cache

import marshmallow as ma
import pint


@cache
def unit_registry() -> pint.UnitRegistry:
    """The process-wide pint registry, built on first use (not at import)."""
    return pint.UnitRegistry(autoconvert_offset_to_baseunit=True)


def to_si(value: object, unit: str, *, bare_strings: bool = False) -> float:
    """Convert a number (already SI) or a unit string to a float in ``unit``.

    ``bare_strings``: a string holding only a number is read as SI (query strings); otherwise
    such a string is refused unless ``unit`` is dimensionless.

    Raises ValueError with a message fit for a client.
    """
    if isinstance(value, bool):
        raise ValueError("must be a number or a string with a unit, not a boolean")
    if isinstance(value, int | float):
        try:
            number = float(value)
        except OverflowError:  # a JSON integer beyond double precision
            number = math.inf
    elif isinstance(value, str):
        number = _parse_string(value, unit, bare_strings or not unit)
    else:
        raise ValueError("must be a number or a string with a unit")
    if not math.isfinite(number):
        raise ValueError("must be a finite number")
    return number


_NUMBER = r"[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?"
_QUANTITY = re.compile(rf"^\s*({_NUMBER})\s*(.*?)\s*$")
_UNIT_WORD = r"[^\W\d]+|%"
_POWER = r"(?:\s*(?:\^|\*\*)\s*-?\d{1,2}(?:\.5)?)?"
# A unit expression: words joined by *, / or spaces, each with an optional small integer or
# half-integer power (^2, **3, ^-1, ^0.5 as in a fracture toughness's MPa*m^0.5). No other
# digits or operators: pint would evaluate arithmetic such as "9 ** 9 ** 9 m", and "1,5 m"
# or "1 000 mm" must not be read as other numbers.
_UNIT = re.compile(
    rf"^(?:{_UNIT_WORD}){_POWER}(?:\s*(?:\*|/|\s)\s*(?:{_UNIT_WORD}){_POWER})*$"
)


def _parse_string(text: str, unit: str, bare_strings: bool) -> float:
    """One number, then one unit expression (see _UNIT; optional with ``bare_strings``)."""
    match = _QUANTITY.match(text)
    if match is None:
        raise ValueError(f"cannot read {text!r}: expected a number, optionally followed by a unit")
    number, unit_text = float(match.group(1)), match.group(2)
    if not unit_text:
        if bare_strings:
            return number
        raise ValueError(
            f"{text!r} has no unit: in a JSON body a string must carry one, e.g. "
            f"\"{match.group(1)} {unit}\", or send the bare number {match.group(1)} for SI ({unit})"
        )
    if not math.isfinite(number):
        raise ValueError("must be a finite number")
    if _UNIT.match(unit_text) is None:
        raise ValueError(f"cannot read {unit_text!r} as a unit")
    registry = unit_registry()
    expected = registry.Unit(unit)
    try:
        given = registry.parse_units(unit_text)
    except Exception:  # pint raises several unrelated types for an unknown unit
        raise ValueError(f"unknown unit {unit_text!r}") from None
    try:
        converted = float(registry.Quantity(number, given).to(expected).magnitude)
    except pint.DimensionalityError:
        wanted = (
            "dimensionless"
            if expected.dimensionless
            else f"{expected:~P} ({expected.dimensionality})"
        )
        raise ValueError(
            f"{text!r} has the wrong dimension: expected a value in {wanted}"
        ) from None
    except (OverflowError, ArithmeticError):
        raise ValueError("must be a finite number") from None
    if not math.isfinite(converted):
        raise ValueError("must be a finite number")
    # pint's conversion factors carry binary noise (2 g/cm^3 -> 1999.9999999999998 kg/m^3);
    # 12 significant digits is far beyond any engineering input and makes such values exact.
    return float(f"{converted:.12g}")


class Quantity(ma.fields.Field):
    """A number in a given SI unit, or a string with a unit converted to it.

    Args:
        unit: the SI unit the core expects, as pint reads it (``"m"``, ``"N"``, ``"Pa"``,
            ``"N*m"``, ``"kg/m^3"``, ``"rad"``, ``""`` for dimensionless).
        minimum: smallest allowed SI value (inclusive), or None.
        exclusive_minimum: values must be strictly greater than this, or None.
        maximum: largest allowed SI value (inclusive), or None.
        bare_strings: read a string holding only a number as SI (for query strings, where
            every value is text); in JSON bodies such a string is refused.
    """

    def __init__(
        self,
        unit: str,
        *,
        minimum: float | None = None,
        exclusive_minimum: float | None = None,
        maximum: float | None = None,
        bare_strings: bool = False,
        **kwargs,
    ):
        metadata = dict(kwargs.pop("metadata", {}))
        metadata.setdefault("x-unit", unit or "1")
        super().__init__(metadata=metadata, **kwargs)
        self.unit = unit
        self.minimum = minimum
        self.exclusive_minimum = exclusive_minimum
        self.maximum = maximum
        self.bare_strings = bare_strings

    def _deserialize(self, value, attr, data, **kwargs) -> float:
        try:
            number = to_si(value, self.unit, bare_strings=self.bare_strings)
        except ValueError as error:
            raise ma.ValidationError(str(error)) from None
        unit_text = f" {self.unit}" if self.unit else ""
        if self.minimum is not None and number < self.minimum:
            raise ma.ValidationError(f"must be at least {self.minimum:g}{unit_text}")
        if self.exclusive_minimum is not None and number <= self.exclusive_minimum:
            raise ma.ValidationError(f"must be greater than {self.exclusive_minimum:g}{unit_text}")
        if self.maximum is not None and number > self.maximum:
            raise ma.ValidationError(f"must be at most {self.maximum:g}{unit_text}")
        return number

    def _serialize(self, value, attr, obj, **kwargs):
        return None if value is None else float(value)


def quantity2properties(self, field, **kwargs) -> dict:
    """apispec attribute function: document Quantity as number-or-unit-string."""
    if not isinstance(field, Quantity):
        return {}
    number: dict[str, object] = {"type": "number"}
    if field.minimum is not None:
        number["minimum"] = field.minimum
    if field.exclusive_minimum is not None:
        number["exclusiveMinimum"] = field.exclusive_minimum
    if field.maximum is not None:
        number["maximum"] = field.maximum
    example = UNIT_EXAMPLES.get(field.unit, f"1 {field.unit}")
    described = (
        f"a number with a unit of the same dimension as {field.unit}"
        if field.unit
        else "a dimensionless number, optionally with a unit such as %"
    )
    unit_string = {
        "type": "string",
        "description": f'{described}, e.g. "{example}"',
        "examples": [example],
    }
    return {"oneOf": [number, unit_string]}


UNIT_EXAMPLES: dict[str, str] = {
    "m": "25 mm",
    "N": "2.5 kN",
    "N*m": "12 N*m",
    "Pa": "70 GPa",
    "rad": "3 deg",
    "kg/m^3": "2.7 g/cm^3",
    "K": "350 K",
    "kg": "1.5 kg",
    "Hz": "30 Hz",
    "1/kg": "4 1/kg",
    "": "1.5",
}
"""A unit string a client could send, per SI unit of a field (OpenAPI examples)."""
