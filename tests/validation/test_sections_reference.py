"""Section properties against sectionproperties (PyPI) and published steel section tables.

Reference 1: sectionproperties 3.x, a finite element solution of the Saint-Venant warping
problem on quadratic triangles (geometric, plastic and warping analyses, and the torsion
stress field for Q). It knows nothing of our formulas. Meshes are coarse (about 400 elements
per section, max element area A/400); refining to A/3000 changes J and the peak shear stress
by under 0.3 %, so the coarse mesh costs nothing in the tolerances below, which are set by
the formulas' own accuracy:

- area, second moments, elastic and plastic moduli: 0.5 % (exact formulas; the round
  sections' reference is a 128-sided polygon, 0.1 % short of the circle).
- torsion constant K and modulus Q: 0.5 % where our formula is exact (circle, annulus,
  rectangle by series); per family below where it is an engineering approximation.

The sharp re-entrant corners of the box and I outlines are stress singularities, so the FE
peak stress for Q is read away from them: on the side mid-planes of the box walls, and
further than max(t_f, t_w) from the I-section's re-entrant corners. That is where our Q
puts the peak (real sections have fillets there; see the modules' docstrings).

Every test reports all its mismatches at once.

Reference 2: EN 10365 rolled I-sections and EN 10210-2 hot-finished hollow sections, values
as printed in manufacturers' tables (from memory). The tables include root fillets and
corner radii, which our sharp-cornered outlines omit: hence the few-percent tolerances, with
the fillets' own area and second moment added back where that is exact geometry.
"""

from __future__ import annotations

import functools
import math

import numpy as np
import pytest
from sectionproperties.analysis.section import Section
from sectionproperties.pre.library import (
    circular_hollow_section,
    circular_section,
    i_section,
    rectangular_hollow_section,
    rectangular_section,
)
from sectionproperties.pre.pre import DEFAULT_MATERIAL, Material

from service.core.sections import FAMILIES, sandwich

POLYGON_SIDES = 128
ELEMENTS = 400


@functools.cache
def fe_reference(kind: str, *size: float, elements: int = ELEMENTS) -> dict[str, float]:
    """FE properties of one outline (cached for the session: each case is solved once)."""
    geometry = _geometry(kind, *size)
    section = Section(geometry.create_mesh(mesh_sizes=[geometry.calculate_area() / elements]))
    section.calculate_geometric_properties()
    section.calculate_warping_properties()
    section.calculate_plastic_properties()
    ixx, iyy, _ = section.get_ic()
    zxx_plus, zxx_minus, zyy_plus, zyy_minus = section.get_z()
    sxx, _ = section.get_s()
    shear = section.calculate_stress(mzz=1.0).get_stress()[0]["sig_zxy_mzz"]
    x, y = section.mesh_nodes[:, 0], section.mesh_nodes[:, 1]
    return {
        "area": section.get_area(),
        "second_moment_major": ixx,
        "second_moment_minor": iyy,
        "section_modulus_major": min(zxx_plus, zxx_minus),
        "section_modulus_minor": min(zyy_plus, zyy_minus),
        "plastic_modulus_major": sxx,
        "torsion_constant": section.get_j(),
        "torsion_modulus": 1.0 / shear[_peak_region(kind, x, y, *size)].max(),
    }


def _geometry(kind, *size):
    if kind == "circle":
        (diameter,) = size
        return circular_section(d=diameter, n=POLYGON_SIDES)
    if kind == "annulus":
        outer, wall = size
        return circular_hollow_section(d=outer, t=wall, n=POLYGON_SIDES)
    if kind == "rectangle":
        depth, width = size
        return rectangular_section(d=depth, b=width)
    if kind == "box":
        depth, width, wall = size
        return rectangular_hollow_section(d=depth, b=width, t=wall, r_out=0.0, n_r=1)
    depth, width, flange, web = size
    return i_section(d=depth, b=width, t_f=flange, t_w=web, r=0.0, n_r=1)


def _peak_region(kind, x, y, *size):
    """Nodes where the FE peak shear stress is read (away from re-entrant corners)."""
    if kind == "box":
        depth, width, _ = size
        band = 0.05 * min(depth, width)
        return (np.abs(x - width / 2) < band) | (np.abs(y - depth / 2) < band)
    if kind == "i":
        depth, width, flange, web = size
        corner_distance = np.hypot(
            np.abs(x - width / 2) - web / 2, np.abs(y - depth / 2) - (depth / 2 - flange)
        )
        return corner_distance > max(flange, web)
    return np.ones_like(x, dtype=bool)


def ours(family_id: str, dims: dict[str, float]) -> dict[str, float]:
    props = FAMILIES[family_id].properties(dims)
    return {name: float(getattr(props, name)) for name in props.__dataclass_fields__}


def mismatches(computed, reference, tolerances, label=""):
    """Every quantity whose relative deviation exceeds its tolerance, as readable lines."""
    lines = []
    for quantity, tolerance in tolerances.items():
        deviation = computed[quantity] / reference[quantity] - 1
        if abs(deviation) > tolerance:
            lines.append(
                f"{label} {quantity}: ours {computed[quantity]:.6g}, reference "
                f"{reference[quantity]:.6g}, deviation {deviation:+.2%} > {tolerance:.1%}"
            )
    return lines


EXACT = 0.005
BENDING = dict.fromkeys(
    (
        "area",
        "second_moment_major",
        "second_moment_minor",
        "section_modulus_major",
        "section_modulus_minor",
        "plastic_modulus_major",
    ),
    EXACT,
)
ALL_EXACT = {**BENDING, "torsion_constant": EXACT, "torsion_modulus": EXACT}


# --- exact families ---------------------------------------------------------------------------


@pytest.mark.parametrize("diameter", [1.0])
def test_solid_round(diameter):
    problems = mismatches(
        ours("solid_round", {"diameter": diameter}), fe_reference("circle", diameter), ALL_EXACT
    )
    assert not problems, "\n".join(problems)


@pytest.mark.parametrize(("depth", "width"), [(1.0, 1.0), (2.0, 1.0), (1.0, 3.0), (10.0, 1.0)])
def test_solid_rectangle(depth, width):
    problems = mismatches(
        ours("solid_rectangle", {"depth": depth, "width": width}),
        fe_reference("rectangle", depth, width),
        ALL_EXACT,
    )
    assert not problems, "\n".join(problems)


@pytest.mark.parametrize("wall_ratio", [0.01, 0.05, 0.2, 0.45])
def test_round_tube(wall_ratio):
    computed = ours("round_tube", {"outer_diameter": 1.0, "wall": wall_ratio})
    # The reference's faceted inner boundary has weakly re-entrant vertices (182.8 degrees);
    # on the thinnest wall they lift the FE peak stress by 0.7 %, so Q gets 1 % there.
    tolerances = {**ALL_EXACT, "torsion_modulus": 0.01}
    problems = mismatches(computed, fe_reference("annulus", 1.0, wall_ratio), tolerances)
    assert not problems, "\n".join(problems)


# --- rectangular tube: Bredt-Batho with the EN 10219-2 thick-wall term ------------------------
# Measured against the FE solution: K is low by 0.4 % (wall 1 % of the side) to 2.5 % (5 %)
# and at most 6.2 % (20 % and beyond; the sharp outer corners hold material the mid-line model
# misses), so the tolerance is 3 % to wall/side 0.05 and 7 % beyond, always on the low side.
# Q is within 0.6 % to wall/side 0.2 and 5.4 % low (conservative) at 0.4.

BOX_CASES = [
    (1.0, 1.0, 0.01),
    (1.0, 1.0, 0.05),
    (2.0, 1.0, 0.05),
    (1.0, 4.0, 0.02),
    (1.0, 1.0, 0.2),
    (1.0, 0.3, 0.1),
    (1.0, 1.0, 0.4),
]


@pytest.mark.parametrize(("depth", "width", "wall"), BOX_CASES)
def test_rectangular_tube(depth, width, wall):
    computed = ours("rectangular_tube", {"depth": depth, "width": width, "wall": wall})
    reference = fe_reference("box", depth, width, wall)
    wall_ratio = wall / min(depth, width)
    tolerances = {
        **BENDING,
        "torsion_constant": 0.03 if wall_ratio <= 0.05 else 0.07,
        "torsion_modulus": 0.01 if wall_ratio <= 0.2 else 0.06,
    }
    problems = mismatches(computed, reference, tolerances)
    if computed["torsion_constant"] > reference["torsion_constant"] * (1 + EXACT):
        problems.append(
            "torsion_constant above the FE value: the correction should be conservative"
        )
    assert not problems, "\n".join(problems)


# --- I-section: El Darwish & Johnston junction term, Q = K / D ---------------------------------
# Measured: K within +3.0 % (the junction term is calibrated on rolled proportions; the stubby
# web of the 0.3-wide, 0.08-web case is the worst), Q within 2.4 % low to 3.0 % high, so both
# tolerances are 3.5 %.

I_CASES = [
    (1.0, 0.5, 0.04, 0.025),
    (1.0, 0.5, 0.085, 0.056),
    (1.0, 1.0, 0.1, 0.06),
    (1.0, 0.2, 0.01, 0.005),
    (1.0, 1.0, 0.2, 0.1),
    (1.0, 0.3, 0.02, 0.08),
    (1.0, 0.5, 0.15, 0.03),
    (1.0, 0.2, 0.05, 0.1),
]


@pytest.mark.parametrize(("depth", "width", "flange", "web"), I_CASES)
def test_i_section(depth, width, flange, web):
    dims = {"depth": depth, "flange_width": width, "flange_thickness": flange, "web_thickness": web}
    tolerances = {**BENDING, "torsion_constant": 0.035, "torsion_modulus": 0.035}
    problems = mismatches(
        ours("i_section", dims), fe_reference("i", depth, width, flange, web), tolerances
    )
    assert not problems, "\n".join(problems)


# --- sandwich panel: the faces, and Allen's two-material bending stiffness ---------------------

SANDWICH_CASES = [(1.0, 0.1, 0.005), (1.0, 0.05, 0.02), (0.5, 0.2, 0.1)]


def _faces(width, core, face, material=DEFAULT_MATERIAL):
    bottom = rectangular_section(d=face, b=width, material=material)
    return bottom, bottom.shift_section(y_offset=core + face)


@pytest.mark.parametrize(("width", "core", "face"), SANDWICH_CASES)
def test_sandwich_faces(width, core, face):
    bottom, top = _faces(width, core, face)
    geometry = bottom + top
    section = Section(geometry.create_mesh(mesh_sizes=[geometry.calculate_area() / ELEMENTS]))
    section.calculate_geometric_properties()
    section.calculate_plastic_properties()
    ixx, iyy, _ = section.get_ic()
    zxx_plus, _, zyy_plus, _ = section.get_z()
    # A slender strip needs a few elements through its thickness for its peak stress: with
    # five elements per unit of aspect ratio the FE K and Q are converged to 0.05 %.
    strip = fe_reference("rectangle", face, width, elements=max(ELEMENTS, int(5 * width / face)))
    reference = {
        "area": section.get_area(),
        "second_moment_major": ixx,
        "second_moment_minor": iyy,
        "section_modulus_major": zxx_plus,
        "section_modulus_minor": zyy_plus,
        "plastic_modulus_major": section.get_s()[0],
        # Two independent strips twist together: K and Q add.
        "torsion_constant": 2 * strip["torsion_constant"],
        "torsion_modulus": 2 * strip["torsion_modulus"],
    }
    dims = {"width": width, "core_thickness": core, "face_thickness": face}
    problems = mismatches(ours("sandwich_panel", dims), reference, ALL_EXACT)
    assert not problems, "\n".join(problems)


@pytest.mark.parametrize(("width", "core", "face"), SANDWICH_CASES)
def test_sandwich_flexural_rigidity_matches_composite_section(width, core, face):
    # sectionproperties' modulus-weighted (transformed) section gives E I of the three layers.
    face_modulus, core_modulus = 70e9, 80e6
    face_material = Material("aluminium", face_modulus, 0.33, 270e6, 2700.0, "grey")
    core_material = Material("foam", core_modulus, 0.3, 1e6, 100.0, "yellow")
    bottom, top = _faces(width, core, face, face_material)
    middle = rectangular_section(d=core, b=width, material=core_material).shift_section(
        y_offset=face
    )
    geometry = bottom + middle + top
    section = Section(geometry.create_mesh(mesh_sizes=[geometry.calculate_area() / ELEMENTS]))
    section.calculate_geometric_properties()
    eixx, _, _ = section.get_eic()
    dims = {"width": width, "core_thickness": core, "face_thickness": face}
    rigidity = float(sandwich.flexural_rigidity(dims, face_modulus, core_modulus))
    assert rigidity == pytest.approx(eixx, rel=EXACT)


# --- published steel tables -------------------------------------------------------------------
# Table values are strings so that each one's tolerance can be half a unit in its last printed
# digit (the table's own rounding) where the comparison is exact.


def _rounding(value: str) -> float:
    """Half a unit in the last significant printed digit, relative ("1710" is 3 figures)."""
    if "." in value:
        unit = 10.0 ** -len(value.split(".")[1])
    else:
        unit = 10.0 ** (len(value) - len(value.rstrip("0")))
    return 0.5 * unit / float(value)


# EN 10365 rolled I-sections (ArcelorMittal sales programme tables, from memory): h, b, t_w,
# t_f, r in mm; A cm^2, I cm^4, W cm^3.
ROLLED_I = {
    "IPE 200": (
        (200.0, 100.0, 5.6, 8.5, 12.0),
        {"A": "28.48", "Iy": "1943", "Wely": "194.3", "Wply": "220.6", "Iz": "142.4", "It": "6.98"},
    ),
    "IPE 300": (
        (300.0, 150.0, 7.1, 10.7, 15.0),
        {
            "A": "53.81",
            "Iy": "8356",
            "Wely": "557.1",
            "Wply": "628.4",
            "Iz": "603.8",
            "It": "20.12",
        },
    ),
    "HEA 200": (
        (190.0, 200.0, 6.5, 10.0, 18.0),
        {"A": "53.83", "Iy": "3692", "Wely": "388.6", "Wply": "429.5", "Iz": "1336", "It": "20.98"},
    ),
}

# A circular spandrel (square r x r less a quarter circle): area (1 - pi/4) r^2, centroid
# (10 - 3 pi) / (12 - 3 pi) r = 0.2234 r from each straight side (exact plane geometry).
SPANDREL_AREA = 1 - math.pi / 4
SPANDREL_CENTROID = (10 - 3 * math.pi) / (12 - 3 * math.pi)


@pytest.mark.parametrize("designation", ROLLED_I)
def test_rolled_i_sections_against_en_10365_tables(designation):
    (h, b, tw, tf, r), table = ROLLED_I[designation]
    props = ours(
        "i_section", {"depth": h, "flange_width": b, "flange_thickness": tf, "web_thickness": tw}
    )
    computed = {
        "A": props["area"] / 1e2,
        "Iy": props["second_moment_major"] / 1e4,
        "Wely": props["section_modulus_major"] / 1e3,
        "Wply": props["plastic_modulus_major"] / 1e3,
        "Iz": props["second_moment_minor"] / 1e4,
        "It": props["torsion_constant"] / 1e4,
    }
    reference = {key: float(value) for key, value in table.items()}
    problems = []
    # Raw: the four fillets add 3.5-5.5 % to A, Iy, W (they sit near the flanges); ours is lower.
    for key in ("A", "Iy", "Wely", "Wply"):
        if not 0.94 < computed[key] / reference[key] < 1.0:
            problems.append(
                f"{designation} {key}: ours {computed[key]:.4g} vs table {reference[key]}"
            )
    # Iz: the fillets lie close to the minor axis and add under 0.5 %.
    problems += mismatches(computed, reference, {"Iz": 0.005}, designation)
    # Adding the fillets back (exact geometry; their own centroidal inertia, < 0.01 % of Iy,
    # is neglected) must reproduce the table to its rounding plus 0.1 %.
    fillets = 4 * SPANDREL_AREA * r**2
    arm = h / 2 - tf - SPANDREL_CENTROID * r
    with_fillets = {
        "A": computed["A"] + fillets / 1e2,
        "Iy": computed["Iy"] + fillets * arm**2 / 1e4,
        "Wply": computed["Wply"] + fillets * arm / 1e3,
    }
    problems += mismatches(
        with_fillets,
        reference,
        {key: _rounding(table[key]) + 0.001 for key in with_fillets},
        f"{designation} with fillets",
    )
    # It: the fillets enlarge the web-flange junctions, raising It by a quarter to a third
    # (El Darwish & Johnston's alpha and D grow with r); the sharp outline is a lower bound.
    if not 0.65 < computed["It"] / reference["It"] < 1.0:
        problems.append(f"{designation} It: ours {computed['It']:.4g} vs table {reference['It']}")
    assert not problems, "\n".join(problems)


# EN 10210-2 hot-finished circular hollow sections (manufacturers' tables, from memory):
# D, t in mm; A cm^2, I cm^4, W cm^3, It cm^4, Ct cm^3. No radii: exact to table rounding.
CHS = {
    "CHS 60.3x3.2": (
        (60.3, 3.2),
        {"A": "5.74", "I": "23.5", "Wel": "7.78", "Wpl": "10.4", "It": "46.9", "Ct": "15.6"},
    ),
    "CHS 114.3x3.6": (
        (114.3, 3.6),
        {"A": "12.5", "I": "192", "Wel": "33.6", "Wpl": "44.1", "It": "384", "Ct": "67.2"},
    ),
    "CHS 168.3x5.0": (
        (168.3, 5.0),
        {"A": "25.7", "I": "856", "Wel": "102", "Wpl": "133", "It": "1710", "Ct": "203"},
    ),
}


@pytest.mark.parametrize("designation", CHS)
def test_circular_hollow_sections_against_en_10210_tables(designation):
    (outer, wall), table = CHS[designation]
    props = ours("round_tube", {"outer_diameter": outer, "wall": wall})
    computed = {
        "A": props["area"] / 1e2,
        "I": props["second_moment_major"] / 1e4,
        "Wel": props["section_modulus_major"] / 1e3,
        "Wpl": props["plastic_modulus_major"] / 1e3,
        "It": props["torsion_constant"] / 1e4,
        "Ct": props["torsion_modulus"] / 1e3,
    }
    reference = {key: float(value) for key, value in table.items()}
    tolerances = {key: _rounding(value) + 1e-4 for key, value in table.items()}
    problems = mismatches(computed, reference, tolerances, designation)
    assert not problems, "\n".join(problems)


# EN 10210-2 hot-finished square and rectangular hollow sections (from memory): h, b, t in
# mm, corner radii r_o = 1.5 t outside and r_i = t inside (EN 10210-2 table for the
# properties). The sharp outline holds (4 - pi)(r_o^2 - r_i^2) more area, 1-2 % of A and
# 2-3 % of I and W, so ours is up to 3.5 % above; It (EN's own corner-radius formula) is 0-5 %
# above ours and Ct within 3 %.
RHS = {
    "SHS 100x100x5": (
        (100.0, 100.0, 5.0),
        {"A": "18.7", "I": "279", "Wel": "55.9", "Wpl": "65.9", "It": "451", "Ct": "84.0"},
    ),
    "RHS 200x100x6.3": (
        (200.0, 100.0, 6.3),
        {"A": "35.8", "I": "1829", "Wel": "183", "Wpl": "228", "It": "1475", "Ct": "208"},
    ),
}


@pytest.mark.parametrize("designation", RHS)
def test_rectangular_hollow_sections_against_en_10210_tables(designation):
    (h, b, t), table = RHS[designation]
    props = ours("rectangular_tube", {"depth": h, "width": b, "wall": t})
    computed = {
        "A": props["area"] / 1e2,
        "I": props["second_moment_major"] / 1e4,
        "Wel": props["section_modulus_major"] / 1e3,
        "Wpl": props["plastic_modulus_major"] / 1e3,
        "It": props["torsion_constant"] / 1e4,
        "Ct": props["torsion_modulus"] / 1e3,
    }
    reference = {key: float(value) for key, value in table.items()}
    problems = []
    for key, (low, high) in {
        "A": (1.0, 1.035),
        "I": (1.0, 1.035),
        "Wel": (1.0, 1.035),
        "Wpl": (1.0, 1.035),
        "It": (0.95, 1.0),
        "Ct": (0.97, 1.03),
    }.items():
        if not low <= computed[key] / reference[key] <= high:
            problems.append(
                f"{designation} {key}: ours {computed[key]:.4g} vs table {reference[key]}"
            )
    corners = (4 - math.pi) * ((1.5 * t) ** 2 - t**2) / 1e2
    problems += mismatches(
        {"A": computed["A"] - corners},
        reference,
        {"A": _rounding(table["A"]) + 1e-3},
        f"{designation} less corners",
    )
    assert not problems, "\n".join(problems)


# Transverse shear. Reference: the sectionproperties FE shear stress field for a unit shear
# force V_y (the Saint-Venant flexure solution, with nu = 0.3), peak over the section. Our
# shear_area: elementary beam theory tau = V S / (I t) for the thin webs of box and I
# sections and for the narrow rectangle, and the exact disc value (round tubes' exact peak is
# checked at several Poisson's ratios in test_shear_reference.py, on a finer polygon).
# Tolerances: 3 % for the exact cases, 5 % where elementary theory neglects the shear flow's
# spread across a flange.
SHEAR_MATERIAL = Material("shear reference", 200e9, 0.3, 1e9, 7850, "grey")
SHEAR_CASES = {
    "solid_round": ("circle", {"diameter": 0.05}, 0.03),
    "solid_rectangle narrow": ("rectangle", {"depth": 0.08, "width": 0.02}, 0.03),
    "rectangular_tube": ("box", {"depth": 0.1, "width": 0.05, "wall": 0.003}, 0.05),
    "i_section": ("i", {"depth": 0.2, "flange_width": 0.1, "flange_thickness": 0.008,
                        "web_thickness": 0.005}, 0.05),
}
_SHEAR_KIND = {"circle": "solid_round", "annulus": "round_tube", "rectangle": "solid_rectangle",
               "box": "rectangular_tube", "i": "i_section"}


@functools.cache
def fe_peak_transverse_shear(kind: str, *size: float) -> float:
    """Peak |tau| of the FE flexure solution for V_y = 1 N, read within 2 % of the depth of
    the neutral axis (where it peaks; away from every re-entrant corner)."""
    geometry = _geometry(kind, *size)
    geometry.material = SHEAR_MATERIAL
    section = Section(geometry.create_mesh(mesh_sizes=[geometry.calculate_area() / 1500]))
    section.calculate_geometric_properties()
    section.calculate_warping_properties()
    shear = section.calculate_stress(vy=1.0).get_stress()[0]["sig_zxy_vy"]
    _, centroid_y = section.get_c()
    y = section.mesh_nodes[:, 1]
    depth = y.max() - y.min()
    return float(np.abs(shear[np.abs(y - centroid_y) < 0.02 * depth]).max())


@pytest.mark.parametrize("case", list(SHEAR_CASES))
def test_shear_area_against_fe_flexure_solution(case):
    kind, dims, tolerance = SHEAR_CASES[case]
    ours_peak = 1.0 / float(FAMILIES[_SHEAR_KIND[kind]].shear_area(dims))
    reference = fe_peak_transverse_shear(kind, *dims.values())
    deviation = ours_peak / reference - 1
    assert abs(deviation) <= tolerance, (
        f"{case}: ours {ours_peak:.5g} Pa, FE {reference:.5g} Pa, {deviation:+.2%}")
