"""General member loading: what acts on a member and what it does to it (issue 13).

Pure numpy over a leading case axis, SI units throughout, one idea per module:

- :mod:`.actions`     the loading of many cases as padded arrays (:class:`MemberLoading`),
                      built from per-case action lists or from the seven shorthand load cases
- :mod:`.internal`    shear, bending moment, torque, axial force and the deflection and twist
                      lines (per unit stiffness) anywhere along the member, exact Euler-Bernoulli
- :mod:`.segments`    the member cut at its breakpoints, each piece's lines as exact
                      polynomials; self-weight of any design added by superposition
- :mod:`.critical`    the sections where the internal actions (and any stress built from them)
                      reach their maxima, found from the shape of the diagrams
- :mod:`.diagrams`    the lines sampled for output, with each design's self-weight and E I
- :mod:`.frequency`   first bending natural frequency: exact eigenvalues, Dunkerley and Rayleigh
                      for attached masses
- :mod:`.stress`      combined stress at the governing points of a section (von Mises, maximum
                      principal stress)
- :mod:`.fatigue`     mean and alternating parts, Marin factors, modified Goodman
- :mod:`.utilization` strength and fatigue utilization over designs x cases (what the
                      engine's checks call)
- :mod:`.problems`    bad input named by its field path, for the API's 422 answers
"""
