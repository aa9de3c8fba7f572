"""The numerical core: materials, sections, indices and sizing over numpy arrays.

Nothing in this package imports Flask or marshmallow.
"""

CAUTION = (
    "Preliminary sizing only. These results come from idealised beam, shaft and elastic "
    "stability formulas and indicative material data; they are not a design check. Not "
    "checked: lateral-torsional and overall buckling of the member, warping of open sections "
    "in torsion, column buckling under an axial compression, connections, fatigue and "
    "vibration unless requirements.fatigue_cycles and min_frequency ask for them (then by "
    "modified Goodman and Dunkerley's estimate), impact and temperature. Final members, "
    "connections and load cases must be checked against the applicable local design code by "
    "a qualified engineer."
)
"""Carried by every response that proposes a structural design."""
