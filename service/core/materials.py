"""Material data: the built-in table from data/, client materials, and array access.

INTERFACE DRAFT (to be completed by the material-data work): the names below are the ones
the rest of the core uses. Keep them; add freely.

- ``PROPERTIES``: tuple of property names every material has (``density``, ``youngs_modulus``,
  ``shear_modulus``, ``poisson_ratio``, ``strength``, ``tensile_strength``, ``price``,
  ``embodied_carbon``, ``max_service_temperature``), ``OPTIONAL_PROPERTIES`` (``shear_strength``).
- ``UNITS``: property -> SI unit string (``"kg/m^3"``, ``"Pa"``, ...).
- ``FAMILIES``: the material family ids. Sandwich cores are the ``"foam"`` family.
- ``PropertyRange(low, high, typical, unit)``, ``Material(id, name, family, properties,
  forms, sources)`` frozen dataclasses.
- ``MaterialTable``: frozen, arrays ready for vectorised use:
  ``ids``, ``names``, ``families`` (tuples), ``forms`` (tuple of frozensets),
  ``low``/``high``/``typical`` (dict property -> float array, NaN where an optional
  property is absent), ``__len__``, ``values(property, basis)`` with basis
  ``"typical"`` | ``"conservative"`` (conservative: low end of youngs_modulus,
  shear_modulus, strength, shear_strength; high end of density; typical for the rest),
  ``shear_strength(basis)`` (own value or strength / sqrt(3), von Mises),
  ``take(indices)``, ``concat(other)``, ``material(id)`` and ``records()``.
- ``load_builtin()``: the validated built-in table, loaded once per process.
- ``load_csv(path)``: validate and load, raising DataError(file, row, column, message).
- ``from_records(records)``: client materials in the contract's Material shape, validated the
  same way, raising InputError with paths like ``"3.properties.density"``.
- ``select(table, families=, ids=, exclude=, where=)``: the contract's MaterialFilter.
"""
