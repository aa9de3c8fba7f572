"""The words of the material data: properties and their SI units, families, forms, bases.

Every module of :mod:`service.core.materials` (and the API schemas built on it) takes its
names from here, so a property, family or form is declared once.
"""

from __future__ import annotations

from collections.abc import Mapping
from types import MappingProxyType

PROPERTIES: tuple[str, ...] = (
    "density",
    "youngs_modulus",
    "shear_modulus",
    "poisson_ratio",
    "strength",
    "tensile_strength",
    "price",
    "embodied_carbon",
    "max_service_temperature",
)
"""Properties every built-in material has. ``strength`` is the design strength: yield or 0.2%
proof for metals and polymers, tensile for composites, modulus of rupture for ceramics, glass
and wood (compressive strength for sandwich cores)."""

OPTIONAL_PROPERTIES: tuple[str, ...] = (
    "shear_strength",
    "fracture_toughness",
    "elongation",
    "fatigue_strength",
    "compressive_strength",
    "transverse_modulus",
)
"""Properties a material may have; absent values are NaN in the table's arrays.

- ``shear_strength``: own shear strength where strength / sqrt(3) (von Mises) is wrong.
- ``fracture_toughness``: plane-strain fracture toughness K_IC (composites: translaminar;
  wood: crack across the grain).
- ``elongation``: strain at break (a fraction, not a percentage).
- ``fatigue_strength``: fully reversed (R = -1) stress amplitude of smooth specimens that
  survive ``fatigue_cycles`` cycles (the material's own count, a separate field).
- ``compressive_strength``: the compression-side counterpart of ``strength`` where the two
  differ (yield in compression for materials that yield, crushing strength otherwise).
- ``transverse_modulus``: E2 of an orthotropic material across the member; absent means
  in-plane isotropic (E2 = ``youngs_modulus``).
"""

STRUCTURAL_PROPERTIES: tuple[str, ...] = ("fracture_toughness", "elongation")
"""Optional properties every built-in material outside :data:`CORE_FAMILY` must have (they
decide whether it is brittle)."""

ALL_PROPERTIES: tuple[str, ...] = PROPERTIES + OPTIONAL_PROPERTIES

UNITS: Mapping[str, str] = MappingProxyType(
    {
        "density": "kg/m^3",
        "youngs_modulus": "Pa",
        "shear_modulus": "Pa",
        "poisson_ratio": "1",
        "strength": "Pa",
        "tensile_strength": "Pa",
        "price": "USD/kg",
        "embodied_carbon": "kg/kg",
        "max_service_temperature": "K",
        "shear_strength": "Pa",
        "fracture_toughness": "Pa*m^0.5",
        "elongation": "1",
        "fatigue_strength": "Pa",
        "compressive_strength": "Pa",
        "transverse_modulus": "Pa",
    }
)
"""Property -> SI unit of its values (price: US dollars of the row's ``price_year`` per kg;
embodied carbon: kg CO2e per kg)."""

PRICE_CURRENCY = "USD"
"""The currency of every price (``UNITS["price"]``), hence of every cost: the built-in prices
are US dollars (data/README.md, ``price``), and a client material's price is read in the
same unit as its Material object states it."""

FAMILIES: tuple[str, ...] = (
    "steel",
    "cast_iron",
    "aluminium",
    "titanium",
    "magnesium",
    "copper",
    "nickel",
    "polymer",
    "composite",
    "wood",
    "ceramic",
    "glass",
    "foam",
)
"""Material family ids. Sandwich cores (foams and honeycombs) are the ``"foam"`` family."""

CORE_FAMILY = "foam"
"""The family of sandwich core materials; its members are made into no section (forms empty)."""

ANISOTROPIC_FAMILIES: frozenset[str] = frozenset({"composite", "wood", "foam"})
"""Families whose client materials default to ``isotropic = False``."""

FORMS: tuple[str, ...] = (
    "solid_round",
    "solid_rectangle",
    "round_tube",
    "rectangular_tube",
    "i_section",
    "sandwich_panel",
)
"""The contract's section family ids a material may be made into (``sandwich_panel``: usable
as a face)."""

BASES: tuple[str, ...] = ("typical", "conservative", "design")
"""Property bases: ``typical`` takes every typical value; ``conservative`` and ``design`` take
the ends named in :data:`CONSERVATIVE_END` and :data:`DESIGN_END`, typical values elsewhere."""

CONSERVATIVE_END: Mapping[str, str] = MappingProxyType(
    {
        "youngs_modulus": "low",
        "shear_modulus": "low",
        "strength": "low",
        "shear_strength": "low",
        "compressive_strength": "low",
        "fatigue_strength": "low",
        "transverse_modulus": "low",
        "density": "high",
    }
)
"""The end of the range the ``"conservative"`` basis takes; other properties use typical."""

DESIGN_END: Mapping[str, str] = MappingProxyType(
    {
        "strength": "low",
        "shear_strength": "low",
        "compressive_strength": "low",
        "fatigue_strength": "low",
    }
)
"""The end of the range the ``"design"`` basis takes: members are sized to the minimum
(guaranteed) strength of a material, as the design codes do with characteristic values (EN 1990
4.2 and Annex D: a strength is a low fractile; stiffness and density are taken as mean values,
EN 1990 4.2(3)); every other property keeps its typical value."""

BASIS_ENDS: Mapping[str, Mapping[str, str]] = MappingProxyType(
    {"typical": MappingProxyType({}), "conservative": CONSERVATIVE_END, "design": DESIGN_END}
)
"""Basis -> property -> the end of its range that basis takes (typical when absent)."""

ID_PATTERN = r"^[a-z0-9][a-z0-9_-]*$"
"""What a material id looks like (a slug)."""


PROCESSES: tuple[str, ...] = (
    "rolled",
    "extruded",
    "drawn",
    "welded",
    "cast",
    "machined",
    "pultruded",
    "filament-wound",
    "laid-up",
    "moulded",
    "sintered",
    "float",
    "sawn",
    "glued-laminated",
    "natural",
)
"""The usual processes that make a material into a section family (``form_limits``):
``float`` is float glass cut to size, ``natural`` a grown form such as a bamboo culm."""

ENDS: tuple[str, ...] = ("low", "high", "typical")
"""The three values of every property range."""
