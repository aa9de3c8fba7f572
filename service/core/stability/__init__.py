"""Whole-member stability: lateral-torsional buckling of beams, columns, ties, beam-columns.

Pure, vectorised numpy functions (every argument broadcasts: materials x sections x cases),
SI units throughout, one idea per module:

- ``lateral_properties``: the section constants lateral-torsional buckling needs (minor
  second moment, torsion and warping constants, load height) and which families can buckle
  that way at all.
- ``critical_moment``: the elastic critical moment M_cr with the moment-gradient and
  load-position factors of each built-in bending load case.
- ``buckling_curves``: the reduction for imperfection and yielding (Ayrton-Perry form of the
  published column and lateral-torsional buckling curves), per material family.
- ``lateral_torsional``: the buckling resistance moment of a beam.
- ``columns``: effective length factors, the Euler load and the column resistance.
- ``ties``: tension resistance and extension of a tie.
- ``beam_column``: amplification of bending by axial compression and the interaction check.
- ``wall_compression``: local buckling of walls in uniform compression.
- ``member``: one member buckling utilisation per load case, on a section's constants.
- ``scaling``: the smallest scale at fixed proportions that meets the member check.

Every formula and factor names its published source beside it; the validation tests in
``tests/validation`` compare with sources outside the project (a finite element solution of
the lateral-torsional buckling energy equation, sectionproperties, classical closed forms).
Local design codes may differ from the curves chosen here: this is preliminary sizing.
"""
