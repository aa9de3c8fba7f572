"""Local buckling of walls in uniform axial compression (columns, and the axial part of a
beam-column), as the critical value of the section's mean stress P / A.

Under uniform compression every wall carries the same stress P / A, so each family's limit is
the lowest critical stress of its walls (plate and shell formulas of ``sections.buckling`` and
``sections.tubes``, the same sources as the bending and torsion limits):

- I-section: the flange outstand (k = 0.425 over b / 2, from the web mid-plane to the tip) or
  the web (internal element, k = 4.0 over h - t_f, between flange mid-planes), whichever is
  lower (Timoshenko & Gere, Theory of Elastic Stability, 2nd ed. 1961, sec. 9.2-9.3).
- rectangular tube: the wider wall as an internal element, k = 4.0 over its mid-line width
  (edges taken as simply supported; the corners' restraint is ignored, conservative).
- round tube: the classical axial bifurcation stress of a cylinder E t / (r sqrt(3 (1 - nu^2)))
  (Timoshenko & Gere sec. 11.4) times the NASA SP-8007 (1968 rev.) axial knockdown
  gamma = 1 - 0.901 (1 - exp(-phi)), phi = sqrt(r / t) / 16 (from memory), r the mid-surface
  radius.
- solid sections: no local mode (``inf``).

The interaction of local and overall buckling (effective sections of slender walls) is not
modelled: each is checked on its own, as the sizing does for bending (preliminary sizing).
"""

from __future__ import annotations

import numpy as np

from service.core.sections import orthotropic
from service.core.sections.base import Dimensions, Elastic, SectionFamily
from service.core.sections.buckling import element_buckling_stress, no_buckling
from service.core.sections.orthotropic import OrthotropicElastic

AXIAL_KNOCKDOWN_AMPLITUDE = 0.901
"""NASA SP-8007 (1968 rev.), Buckling of Thin-Walled Circular Cylinders, axial compression
correlation gamma = 1 - 0.901 (1 - exp(-phi)), phi = sqrt(r/t)/16, for r/t < 1500 (from
memory)."""


def compression_buckling_stress(family: SectionFamily, dims: Dimensions,
                                material: Elastic | OrthotropicElastic) -> np.ndarray:
    """Critical mean stress P / A for local buckling in uniform compression, Pa.

    Args:
        family: a section family that carries compression.
        dims: its dimensions, m, broadcastable to one shape ``S``.
        material: E (Pa) and nu, broadcastable with the dimensions (a materials axis); an
            :class:`~service.core.sections.orthotropic.OrthotropicElastic` (fibres along
            the member) takes the orthotropic long-plate formulas
            (:func:`~service.core.sections.buckling.element_buckling_stress`) and Donnell's
            orthotropic cylinder (:func:`~service.core.sections.orthotropic
            .cylinder_axial_stress`) under the same SP-8007 knockdown.

    Returns:
        The broadcast shape of the dimensions and the material arrays; ``inf`` for solid
        sections.

    Raises:
        ValueError: for a family that does not carry compression (a sandwich panel).
    """
    if "compression" not in family.loadings:
        raise ValueError(f"{family.id} does not carry compression")
    arrays = family.arrays(dims)
    if family.id == "i_section":
        depth, width, flange, web = arrays
        return np.minimum(
            element_buckling_stress("outstand_compression", material, flange, 0.5 * width),
            element_buckling_stress("internal_compression", material, web, depth - flange))
    if family.id == "rectangular_tube":
        depth, width, wall = arrays
        return element_buckling_stress("internal_compression", material, wall,
                                       np.maximum(depth, width) - wall)
    if family.id == "round_tube":
        outer, wall = arrays
        radius = 0.5 * (outer - wall)
        knockdown = 1.0 - AXIAL_KNOCKDOWN_AMPLITUDE * (
            1.0 - np.exp(-np.sqrt(radius / wall) / 16.0))
        if isinstance(material, OrthotropicElastic):
            return knockdown * orthotropic.cylinder_axial_stress(material, wall, radius)
        nu = np.asarray(material.poisson_ratio, dtype=float)
        return knockdown * np.asarray(material.youngs_modulus, dtype=float) * wall / (
            radius * np.sqrt(3.0 * (1.0 - nu**2)))
    return no_buckling(*arrays, material.youngs_modulus, material.poisson_ratio)
