"""Material data: the built-in table from data/, client materials, and array access.

Every material carries a low, high and typical value of each property in :data:`PROPERTIES`
(and optionally of :data:`OPTIONAL_PROPERTIES`), in SI units (:data:`UNITS`). The values are
held by a frozen :class:`MaterialTable` as one numpy array per property and end, so the
sizing and ranking code works over all materials at once.

One module per idea:

- :mod:`.vocabulary`: property names and units, families, forms, property bases.
- :mod:`.table`: :class:`MaterialTable`, :class:`Material`, :class:`PropertyRange`.
- :mod:`.validation`: the checks every material passes, whatever its origin.
- :mod:`.brittleness`: the rule that makes a material brittle.
- :mod:`.form_limits`: what the usual process makes of a material in each section family.
- :mod:`.csv_file`: :func:`load_builtin` validates ``data/materials.csv`` once per process;
  :func:`load_csv` validates any file of the same layout (documented in ``data/README.md``)
  and raises :class:`MaterialDataError`, a :class:`~service.core.errors.DataError` located
  at the first problem that also lists every other problem.
- :mod:`.records`: :func:`from_records` turns client materials (the contract's Material
  shape, values already SI) into a table, validated by the same checks, raising
  :class:`~service.core.errors.InputError` with paths like ``"3.properties.density"``.
- :mod:`.filters`: :func:`select` applies the contract's MaterialFilter; :func:`sort_by`
  orders a table by a property.
"""

from service.core.materials.brittleness import BRITTLE_ELONGATION, BRITTLE_TOUGHNESS
from service.core.materials.csv_file import (
    BUILTIN_CSV,
    CSV_COLUMNS,
    MaterialDataError,
    load_builtin,
    load_csv,
)
from service.core.materials.filters import select, sort_by
from service.core.materials.form_limits import FORM_LIMITS_CSV, FormLimit, measures, within
from service.core.materials.records import CLIENT_REQUIRED_PROPERTIES, from_records
from service.core.materials.table import Material, MaterialTable, PropertyRange
from service.core.materials.validation import SHEAR_MODULUS_TOLERANCE
from service.core.materials.vocabulary import (
    ALL_PROPERTIES,
    ANISOTROPIC_FAMILIES,
    BASES,
    BASIS_ENDS,
    CONSERVATIVE_END,
    CORE_FAMILY,
    DESIGN_END,
    ENDS,
    FAMILIES,
    FORMS,
    ID_PATTERN,
    OPTIONAL_PROPERTIES,
    PROCESSES,
    PROPERTIES,
    STRUCTURAL_PROPERTIES,
    UNITS,
)

__all__ = [
    "ALL_PROPERTIES",
    "ANISOTROPIC_FAMILIES",
    "BASES",
    "BRITTLE_ELONGATION",
    "BRITTLE_TOUGHNESS",
    "BUILTIN_CSV",
    "CLIENT_REQUIRED_PROPERTIES",
    "BASIS_ENDS",
    "CONSERVATIVE_END",
    "DESIGN_END",
    "CORE_FAMILY",
    "CSV_COLUMNS",
    "ENDS",
    "FAMILIES",
    "FORMS",
    "FORM_LIMITS_CSV",
    "ID_PATTERN",
    "OPTIONAL_PROPERTIES",
    "PROCESSES",
    "PROPERTIES",
    "SHEAR_MODULUS_TOLERANCE",
    "STRUCTURAL_PROPERTIES",
    "UNITS",
    "FormLimit",
    "Material",
    "MaterialDataError",
    "MaterialTable",
    "PropertyRange",
    "from_records",
    "load_builtin",
    "load_csv",
    "measures",
    "select",
    "sort_by",
    "within",
]
