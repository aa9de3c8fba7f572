"""The numerical core: materials, sections, indices and sizing over numpy arrays.

Nothing in this package imports Flask or marshmallow.
"""

CAUTION = (
    "Preliminary sizing only. These results come from idealised beam, shaft and elastic "
    "stability formulas and indicative material data; they are not a design check. "
    "Lateral-torsional buckling uses published moment factors and buckling curves that local "
    "codes may replace, and assumes the member unbraced unless the request says otherwise; "
    "bearing assumes a knife-edge load unless requirements.bearing_length gives one. Not "
    "checked: lateral-torsional buckling of closed tubes, the effect of a torque on "
    "lateral-torsional buckling and of an axial force on the natural frequency, "
    "lateral-torsional buckling of a member whose far support leaves twist free "
    "(open sections are then left out unless restrained), warping of open "
    "sections in torsion, effective widths of brittle and orthotropic walls (they keep the "
    "gross section with the elastic buckling stress as a cap), connections, fatigue and "
    "vibration unless "
    "requirements.fatigue_cycles and min_frequency ask for them (then by modified Goodman and "
    "Dunkerley's estimate), impact and temperature. Final members, "
    "connections and load cases must be checked against the applicable local design code by "
    "a qualified engineer."
)
"""Carried by every response that proposes a structural design."""
