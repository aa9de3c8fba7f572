"""POST /v1/charts/properties: the log-log property chart and its index guide line."""

from __future__ import annotations

import itertools
import math

import matplotlib
import pytest
from svg_reading import by_id, decade_scale, parse, path_points, texts

from service.charts.labels import LABEL_SIZE, label_boxes
from service.charts.properties import Guide, PropertyChart, build
from service.charts.render import RC
from service.core.indices import material_index
from service.core.materials import load_builtin

URL = "/v1/charts/properties"

# Slopes of the guide lines of classic indices, as read off log-log property charts:
# E^(1/2)/rho slope 2 (light stiff beam), sigma^(2/3)/rho slope 3/2 (light strong beam),
# E/rho slope 1 (light stiff tie), G^(1/2)/rho slope 2 (light stiff shaft). Ashby,
# "Materials Selection in Mechanical Design", 4th ed., chapter 5 and its index table
# (from memory).
HANDBOOK_SLOPES = [
    ("bending", "stiffness", "youngs_modulus", 2.0),
    ("bending", "strength", "strength", 1.5),
    ("tension", "stiffness", "youngs_modulus", 1.0),
    ("torsion", "stiffness", "shear_modulus", 2.0),
]


def measured_slope(svg: bytes) -> float:
    """The guide line's slope in decades of y per decade of x, read from the SVG."""
    root = parse(svg)
    group = by_id(root, "guide-line")
    assert group is not None, "no guide line in the SVG"
    (x0, y0), (x1, y1) = path_points(group)[:2]
    x_per_decade, _ = decade_scale(root, "x")
    y_per_decade, _ = decade_scale(root, "y")
    # SVG y grows downward; per-decade scales carry that sign.
    return ((y1 - y0) / y_per_decade) / ((x1 - x0) / x_per_decade)


@pytest.mark.parametrize(("loading", "limit", "y_property", "slope"), HANDBOOK_SLOPES)
def test_guide_line_slope_in_the_svg_is_the_index_exponent_ratio(client, loading, limit,
                                                                  y_property, slope):
    response = client.post(URL, json={"guide": {"loading": loading, "limit": limit}})
    assert response.status_code == 200
    exponents = material_index(loading, limit, "mass").exponents
    ratio = -exponents["density"] / exponents[y_property]
    # Tolerance: SVG coordinates are written to 6 significant digits; 1e-4 relative covers it.
    assert ratio == pytest.approx(slope, rel=1e-12)
    assert measured_slope(response.data) == pytest.approx(ratio, rel=1e-4)


def test_svg_is_xml_with_axis_labels_units_legend_and_caution(client):
    response = client.post(URL, json={"guide": {"loading": "bending", "limit": "stiffness"},
                                      "top": 8})
    assert response.status_code == 200
    assert response.mimetype == "image/svg+xml"
    words = texts(parse(response.data))
    assert "density \u03c1 (kg/m\u00b3)" in words
    assert "Young's modulus E (GPa)" in words
    legend = " ".join(words)
    assert "E^(1/2) / \u03c1 constant, slope 2" in legend
    assert "qualified engineer" in legend and "Data basis: typical property values" in legend
    assert "qualified engineer" in response.headers["Formwise-Caution"]


def test_text_stays_text_and_the_file_carries_no_date(client):
    svg = client.post(URL, json={"x": "density", "y": "strength"}).data
    assert b"<text" in svg
    assert b'id="DejaVuSans-' not in svg  # glyphs as outlines would be defined like this
    assert b"dc:date" not in svg and b"Matplotlib v" not in svg


def test_products_and_powers_on_the_axes(client):
    response = client.post(URL, json={
        "x": {"density": 1, "price": 1}, "y": {"youngs_modulus": 0.5},
        "guide": {"exponents": {"youngs_modulus": 0.5, "density": -1, "price": -1}}})
    assert response.status_code == 200
    words = texts(parse(response.data))
    assert any(w.startswith("\u03c1 Cm (") for w in words), words
    assert measured_slope(response.data) == pytest.approx(1.0, rel=1e-4)


def test_a_guide_the_axes_cannot_show_names_the_guide(client):
    response = client.post(URL, json={"x": "density", "y": "strength",
                                      "guide": {"loading": "bending", "limit": "stiffness"}})
    assert response.status_code == 422
    assert list(response.json["errors"]) == ["guide"]


@pytest.mark.parametrize(("body", "path"), [
    ({"x": {"hardness": 1}, "y": "density"}, "x.hardness"),
    ({"x": "density", "y": {"youngs_modulus": 0}}, "y.youngs_modulus"),
    ({"x": "density"}, "y"),
    ({"x": "density", "y": "strength", "x_limits": [-1, 100]}, "x_limits.0"),
    ({"x": "density", "y": "strength", "y_limits": [5, 1]}, "y_limits"),
    ({"top": 3}, "top"),
    ({"series": "family"}, "series"),
    ({"guide": {"loading": "bending"}}, "guide.limit"),
    ({"guide": {"loading": "bending", "limit": "stiffness", "through": "unobtainium"}},
     "guide.through"),
    ({"highlight": {"ids": ["unobtainium"]}}, "highlight.ids.0"),
])
def test_bad_requests_name_the_field(client, body, path):
    response = client.post(URL, json=body)
    assert response.status_code == 422, response.json
    assert response.mimetype == "application/problem+json"
    assert path in response.json["errors"], response.json


def test_labels_never_overlap():
    table = load_builtin()
    with matplotlib.rc_context(RC):
        figure = build(table, PropertyChart(x={"density": 1}, y={"strength": 1}, labels=60))
    labels = [t for t in figure.axes[0].texts if t.get_fontsize() == LABEL_SIZE]
    boxes = label_boxes(labels)
    assert len(boxes) >= 10, "too few labels placed to test anything"
    overlapping = [(a, b) for a, b in itertools.combinations(range(len(boxes)), 2)
                   if boxes[a].overlaps(boxes[b])]
    assert overlapping == []


def test_guide_through_a_chosen_material(client):
    response = client.post(URL, json={"guide": {"loading": "bending", "limit": "stiffness",
                                                "through": "al_6061_t6"}})
    assert response.status_code == 200
    assert any("through Aluminium 6061-T6" in w for w in texts(parse(response.data)))


def test_guide_line_passes_through_the_chosen_material():
    """The line's equation at the material's own point: index there equals the line's."""
    table = load_builtin()
    with matplotlib.rc_context(RC):
        figure = build(table, PropertyChart(
            x={"density": 1}, y={"youngs_modulus": 1},
            guide=Guide({"youngs_modulus": 0.5, "density": -1}, "E^(1/2) / rho",
                        "al_6061_t6")))
    line = next(ln for ln in figure.axes[0].lines if ln.get_gid() == "guide-line")
    (x0, x1), (y0, y1) = line.get_xdata(), line.get_ydata()
    i = table.position("al_6061_t6")
    x, y = table.typical["density"][i], table.typical["youngs_modulus"][i] / 1e9  # GPa axis
    at_material = math.log10(y0) + 2.0 * (math.log10(x) - math.log10(x0))
    assert at_material == pytest.approx(math.log10(y), abs=1e-12)
    assert math.log10(y1 / y0) / math.log10(x1 / x0) == pytest.approx(2.0, rel=1e-12)


def test_axis_limits_are_si_and_shown_in_display_units(client):
    response = client.post(URL, json={"x": "density", "y": "strength",
                                      "x_limits": [100, 10000], "y_limits": [1e6, 1e9]})
    assert response.status_code == 200
    root = parse(response.data)
    x_per_decade, x_at_one = decade_scale(root, "x")
    y_per_decade, y_at_one = decade_scale(root, "y")
    area = next(g for g in root.iter() if g.get("id") == "patch_2")  # the axes background
    xs, ys = zip(*path_points(area), strict=True)
    # The plotting area spans exactly the limits: 100..10000 kg/m^3, 1..1000 MPa.
    assert (min(xs) - x_at_one) / x_per_decade == pytest.approx(2.0, abs=1e-4)
    assert (max(xs) - x_at_one) / x_per_decade == pytest.approx(4.0, abs=1e-4)
    assert (max(ys) - y_at_one) / y_per_decade == pytest.approx(0.0, abs=1e-4)
    assert (min(ys) - y_at_one) / y_per_decade == pytest.approx(3.0, abs=1e-4)
