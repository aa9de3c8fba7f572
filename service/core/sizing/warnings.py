"""Warnings of a designs answer: what the request left open that a client should know.

Each is a sentence a designer can act on; :func:`design_warnings` lists those that apply to
a request and its designs (best first).
"""

from __future__ import annotations

import math
from collections.abc import Sequence

import numpy as np

from service.core.sizing.request import DesignRequest
from service.core.sizing.results import Design


def design_warnings(request: DesignRequest, designs: Sequence[Design],
                    brittle: Sequence[bool] | np.ndarray = ()) -> list[str]:
    """The warnings of ``request`` answered by ``designs`` (best first; may be empty).

    ``brittle``: the brittle flag of each row of the material table the designs index
    (:attr:`Design.material_index`); empty when unknown.
    """
    loading = request.case.loading
    found: list[str] = []
    if loading == "bending" and request.max_deflection is None:
        found.append(_no_stiffness("requirements.max_deflection", "deflection",
                                   _deflection_words(request, designs)))
    if loading == "torsion" and request.max_twist is None:
        found.append(_no_stiffness("requirements.max_twist", "twist",
                                   _twist_words(designs)))
    brittle_designs = [design for design in designs
                       if design.material_index < len(brittle) and brittle[design.material_index]]
    if brittle_designs:
        found.append(_brittle_words(brittle_designs))
    return found


def _brittle_words(designs: Sequence[Design]) -> str:
    ids = sorted({design.material_id for design in designs})
    return (f"brittle material in the answer ({', '.join(ids)}; allowed by "
            "requirements.allow_brittle): it breaks without yielding, so a local overload or a "
            "flaw is not redistributed; combined stresses are checked by the maximum principal "
            "stress, but its strength scatters (Weibull statistics) and is sensitive to flaws, "
            "impact and surface damage: use a larger safety factor than for a ductile material "
            "and test the part (common practice)")


def _no_stiffness(field: str, quantity: str, best: str) -> str:
    return (f"no stiffness requirement given ({field}): the designs are sized for strength "
            f"alone and their {quantity} is whatever strength gives{best}; set {field} "
            "to limit it")


def _deflection_words(request: DesignRequest, designs: Sequence[Design]) -> str:
    deflection = designs[0].deflection if designs else None
    if deflection is None or not math.isfinite(deflection) or deflection <= 0:
        return ""
    return (f": the best design deflects {deflection * 1000:.3g} mm, span/"
            f"{request.span / deflection:.0f}")


def _twist_words(designs: Sequence[Design]) -> str:
    angle = designs[0].twist if designs else None
    if angle is None or not math.isfinite(angle):
        return ""
    return f": the best design twists {math.degrees(angle):.3g} deg"
