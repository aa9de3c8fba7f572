"""The design trade-off, sweep and section pictures: what they show and what they refuse."""

from __future__ import annotations

import pytest
from readme_scenario import BOOM
from svg_reading import by_id, parse, path_points, texts

from service.charts.section import MATERIAL_FILL, millimetres


def test_tradeoff_labels_every_design_and_draws_the_front(client):
    designs = client.post("/v1/designs", json={**BOOM, "top": 4}).json["designs"]
    response = client.post("/v1/charts/designs", json={"request": {**BOOM, "top": 4},
                                                       "versus": "carbon"})
    assert response.status_code == 200
    root = parse(response.data)
    words = texts(root)
    assert "embodied carbon (kg CO\u2082e, indicative)" in words and "mass (kg)" in words
    labels = [w for w in words if w[:2] in {f"{d['rank']} " for d in designs}]
    # Every design gets its label (or at least its rank, where the full label has no room).
    for design in designs:
        assert any(w.startswith(f"{design['rank']} ") or w == str(design["rank"])
                   for w in labels + words), design["rank"]
    assert by_id(root, "pareto-front") is not None


def test_tradeoff_front_matches_the_designs_endpoint(client):
    """The staircase's corners are the /v1/designs Pareto front (same core call)."""
    front = client.post("/v1/designs", json={**BOOM, "pareto": ["mass", "cost"]}).json["pareto"]
    response = client.post("/v1/charts/designs", json={"request": BOOM})
    points = path_points(by_id(parse(response.data), "pareto-front"))
    # A staircase through n designs has 2n - 1 vertices.
    assert len(points) == 2 * len(front) - 1


def test_tradeoff_without_feasible_design_says_why(client):
    impossible = {**BOOM, "requirements": {"max_deflection": "0.001 mm"},
                  "envelope": {"max_depth": "2 mm", "max_width": "2 mm"}}
    response = client.post("/v1/charts/designs", json={"request": impossible})
    assert response.status_code == 200
    assert any("No feasible design" in w for w in texts(parse(response.data)))


def test_tradeoff_bad_inner_request_names_its_path(client):
    response = client.post("/v1/charts/designs", json={
        "request": {**BOOM, "load_case": {"type": "cantilever_end_load", "span": "-1 m"}}})
    assert response.status_code == 422
    assert "request.load_case.span" in response.json["errors"]


SWEEP = {"base": BOOM, "grid": {"load_case.span": ["0.6 m", "0.9 m", "1.2 m"]}}


def test_sweep_chart_draws_a_line_per_family(client):
    response = client.post("/v1/charts/sweeps", json={"request": SWEEP})
    assert response.status_code == 200
    words = texts(parse(response.data))
    assert "span (m)" in words and "mass (kg)" in words
    for family in ("round tube", "box tube", "solid round"):
        assert family in words


def test_sweep_chart_leaves_out_a_family_the_request_rules_out_and_says_why(client):
    """Without a panel width no sandwich can be sized; /v1/sweeps skips it, so does the chart."""
    no_width = {**BOOM, "envelope": {"max_depth": "30 mm"}}
    response = client.post("/v1/charts/sweeps", json={"request": {**SWEEP, "base": no_width}})
    assert response.status_code == 200
    words = " ".join(texts(parse(response.data)))
    assert "sandwich (envelope.max_width is required" in words


def test_inner_request_errors_are_placed_under_request(client):
    sandwich = {**BOOM, "envelope": {}, "sections": ["sandwich_panel"]}
    response = client.post("/v1/charts/designs", json={"request": sandwich})
    assert response.status_code == 422
    assert list(response.json["errors"]) == ["request.envelope.max_width"]
    response = client.post("/v1/charts/sweeps", json={"request": {
        **SWEEP, "base": {**BOOM, "materials": {"ids": ["unobtainium"]}}}})
    assert response.status_code == 422
    assert list(response.json["errors"]) == ["request.base.materials.ids.0"]


def test_sweep_chart_by_material(client):
    body = {"request": {**SWEEP, "base": {**BOOM, "materials": {"ids": [
        "al_6061_t6", "s355j2", "cfrp_qi_sm"]}}}, "series": "material", "y": "cost"}
    response = client.post("/v1/charts/sweeps", json=body)
    assert response.status_code == 200
    words = texts(parse(response.data))
    assert "Aluminium 6061-T6" in words and "Structural steel S355J2" in words


@pytest.mark.parametrize(("body", "path"), [
    ({"request": SWEEP, "series": "material"}, "request.base.materials"),
    ({"request": {**SWEEP, "grid": {"load_case.span": ["0.6 m", "0.9 m"],
                                    "load_case.load": [20, 40]}}}, "x"),
    ({"request": {**SWEEP, "grid": {"load_case.span": ["0.6 m", "0.9 m"],
                                    "load_case.load": [20, 40]}}, "x": "load_case.span"},
     "request.grid.load_case.load"),
    ({"request": SWEEP, "x": "load_case.load"}, "x"),
    ({"request": SWEEP, "y": "colour"}, "y"),
    ({"request": {"base": {**BOOM, "requirements": {"max_deflection": "4 mm",
                                                    "self_weight": True}},
                  "grid": {"load_case.load": [0, 20, 40]}}, "x_scale": "log"}, "x_scale"),
    ({"request": {**SWEEP, "grid": {"load_case.span": ["-1 m"]}}},
     "request.grid.load_case.span.0"),
])
def test_sweep_chart_bad_input_names_the_field(client, body, path):
    response = client.post("/v1/charts/sweeps", json=body)
    assert response.status_code == 422, response.data[:200]
    assert path in response.json["errors"], response.json


def test_section_drawing_is_to_scale_with_mm_dimensions(client):
    response = client.post("/v1/charts/section", json={
        "family": "solid_rectangle", "dimensions": {"depth": "40 mm", "width": "16 mm"}})
    root = parse(response.data)
    words = texts(root)
    assert "40 mm" in words and "16 mm" in words
    assert by_id(root, "plane-of-bending") is not None
    filled = [g for g in root.iter() if (g.get("id") or "").startswith("patch_")
              and any(MATERIAL_FILL in (p.get("style") or "") for p in g)]
    assert len(filled) == 1
    xs, ys = zip(*path_points(filled[0]), strict=True)
    # Tolerance: coordinates are written to 6 digits.
    assert (max(ys) - min(ys)) / (max(xs) - min(xs)) == pytest.approx(40 / 16, rel=1e-4)


@pytest.mark.parametrize(("family", "dimensions", "words"), [
    ("i_section", {"depth": "100 mm", "flange_width": "60 mm", "flange_thickness": "6 mm",
                   "web_thickness": "4 mm"}, ["100 mm", "60 mm", "flange 6 mm", "web 4 mm"]),
    ("rectangular_tube", {"depth": "30 mm", "width": "20 mm", "wall": "0.7 mm"},
     ["30 mm", "20 mm", "wall 0.7 mm"]),
    ("sandwich_panel", {"width": "300 mm", "core_thickness": "20 mm",
                        "face_thickness": "1 mm"}, ["300 mm", "22 mm", "face 1 mm",
                                                    "core 20 mm"]),
    ("solid_round", {"diameter": "12.5 mm"}, ["\u00d8 12.5 mm"]),
])
def test_section_drawing_labels_every_dimension(client, family, dimensions, words):
    response = client.post("/v1/charts/section", json={"family": family,
                                                      "dimensions": dimensions})
    assert response.status_code == 200
    drawn = texts(parse(response.data))
    for word in words:
        assert word in drawn, (word, drawn)


@pytest.mark.parametrize(("metres", "text"), [(0.0007, "0.7"), (0.02954, "29.54"),
                                              (0.3, "300"), (0.0305, "30.5")])
def test_millimetres(metres, text):
    assert millimetres(metres) == text
