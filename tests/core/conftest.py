"""Fixtures of the core tests: the built-in material table, and materials picked from it."""

import numpy as np
import pytest

from service.core.materials import load_builtin
from service.core.sizing.values import MaterialValues


@pytest.fixture(scope="module")
def table():
    return load_builtin()


@pytest.fixture(scope="session")
def pick():
    """``pick(table, *ids)``: those materials of ``table``, in the order given."""
    def take(table, *ids):
        return table.take([table.ids.index(i) for i in ids])
    return take


@pytest.fixture(scope="session")
def demo_values():
    """Two materials' values, (2,) each: invented round numbers of a steel and an aluminium
    alloy (demo values, not data)."""
    return MaterialValues(*(np.array(v) for v in (
        [7850.0, 2700.0], [210e9, 70e9], [81e9, 26e9], [0.3, 0.33], [355e6, 240e6],
        [205e6, 139e6], [1.0, 3.0], [2.0, 9.0])))
