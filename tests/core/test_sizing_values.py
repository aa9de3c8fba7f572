"""Material values on a property basis (service.core.sizing.values), against the contract:
``conservative`` takes the low end of stiffness and strength and the high end of density;
shear strength is strength / sqrt(3) (von Mises) unless the material gives its own."""

from __future__ import annotations

import math

import numpy as np

from service.core.sizing.values import MaterialValues


def test_bases_take_the_ends_the_contract_names(table):
    typical = MaterialValues.from_table(table, "typical")
    conservative = MaterialValues.from_table(table, "conservative")
    for name in ("youngs_modulus", "shear_modulus", "strength"):
        np.testing.assert_array_equal(getattr(conservative, name), table.low[name])
    np.testing.assert_array_equal(conservative.density, table.high["density"])
    np.testing.assert_array_equal(typical.density, table.values("density"))
    own = ~np.isnan(table.values("shear_strength"))
    np.testing.assert_allclose(typical.shear_strength[~own],
                               typical.strength[~own] / math.sqrt(3.0), rtol=1e-15)
    np.testing.assert_array_equal(typical.shear_strength[own],
                                  table.values("shear_strength")[own])
