"""Random sizing cases for the property tests of the sizing engine and its runs
(tests/core is on the import path of its test modules)."""

from __future__ import annotations

import math

from hypothesis import strategies as st

BENDING = ("cantilever_end_load", "cantilever_uniform_load", "simply_supported_center_load",
           "simply_supported_uniform_load", "fixed_fixed_center_load", "fixed_fixed_uniform_load")


def log_uniform(low, high):
    return st.floats(math.log(low), math.log(high)).map(math.exp)


def optional(strategy):
    return st.one_of(st.none(), strategy)


@st.composite
def numbers(draw, load_case):
    """The numeric fields of one case (those that may differ inside a batched group)."""
    bending = load_case != "torsion"
    return {
        "span": draw(log_uniform(0.3, 4.0)),
        "load": draw(log_uniform(10.0, 30_000.0)) if bending else None,
        "torque": None if bending else draw(log_uniform(5.0, 5_000.0)),
        "max_deflection": draw(optional(log_uniform(5e-4, 0.05))) if bending else None,
        "max_twist": None if bending else draw(optional(log_uniform(0.005, 0.2))),
        "safety_factor": draw(st.floats(1.0, 3.0)),
        # down to 3 mm, so that some cases have no design at all
        "max_depth": draw(optional(log_uniform(0.003, 0.3))),
        "max_width": draw(optional(log_uniform(0.003, 0.3))),
        "min_wall": draw(optional(log_uniform(3e-4, 3e-3))),
    }
