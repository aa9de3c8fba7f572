"""Warnings of a designs answer: what the request left open that a client should know.

Each is a sentence a designer can act on; :func:`design_warnings` lists those that apply to
a request and its designs (best first).
"""

from __future__ import annotations

import math
from collections.abc import Sequence

from service.core.sizing.request import DesignRequest
from service.core.sizing.results import Design


def design_warnings(request: DesignRequest, designs: Sequence[Design]) -> list[str]:
    """The warnings of ``request`` answered by ``designs`` (best first; may be empty)."""
    loading = request.case.loading
    found: list[str] = []
    if loading == "bending" and request.max_deflection is None:
        found.append(_no_stiffness("requirements.max_deflection", "deflection",
                                   _deflection_words(request, designs)))
    if loading == "torsion" and request.max_twist is None:
        found.append(_no_stiffness("requirements.max_twist", "twist",
                                   _twist_words(designs)))
    return found


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
