"""Every chart endpoint: SVG by default, PNG by Accept or format, 406 otherwise, byte-stable."""

from __future__ import annotations

import io

import pytest
from PIL import Image
from readme_scenario import BOOM
from svg_reading import parse, texts

BODIES = {
    "properties": {"guide": {"loading": "bending", "limit": "stiffness"}, "top": 6},
    "designs": {"request": {**BOOM, "top": 5}},
    "sweeps": {"request": {"base": BOOM,
                           "grid": {"load_case.span": ["0.6 m", "0.9 m", "1.2 m"]}},
               "series": "family"},
    "section": {"family": "round_tube",
                "dimensions": {"outer_diameter": "30 mm", "wall": "1.2 mm"}},
}


@pytest.mark.parametrize("kind", list(BODIES))
def test_svg_by_default_parses_and_carries_the_caution(client, kind):
    response = client.post(f"/v1/charts/{kind}", json=BODIES[kind])
    assert response.status_code == 200, response.json
    assert response.mimetype == "image/svg+xml"
    words = " ".join(texts(parse(response.data)))
    assert "Preliminary sizing only" in words and "qualified engineer" in words
    assert "Data basis:" in words


@pytest.mark.parametrize("kind", list(BODIES))
def test_png_by_accept_decodes_at_the_asked_size(client, kind):
    body = {**BODIES[kind], "width": 640, "height": 480}
    response = client.post(f"/v1/charts/{kind}", json=body, headers={"Accept": "image/png"})
    assert response.status_code == 200
    assert response.mimetype == "image/png"
    image = Image.open(io.BytesIO(response.data))
    image.load()
    assert image.format == "PNG" and image.size == (640, 480)


@pytest.mark.parametrize("kind", ["properties", "section"])
def test_same_request_same_bytes(client, kind):
    for accept in ("image/svg+xml", "image/png"):
        first = client.post(f"/v1/charts/{kind}", json=BODIES[kind], headers={"Accept": accept})
        second = client.post(f"/v1/charts/{kind}", json=BODIES[kind],
                             headers={"Accept": accept})
        assert first.data == second.data, accept


def test_format_field_chooses_png(client):
    response = client.post("/v1/charts/section", json={**BODIES["section"], "format": "png"})
    assert response.mimetype == "image/png"
    assert response.data.startswith(b"\x89PNG")


@pytest.mark.parametrize("accept", ["application/json", "text/csv", "image/jpeg"])
def test_an_accept_no_image_type_meets_is_406(client, accept):
    response = client.post("/v1/charts/section", json=BODIES["section"],
                           headers={"Accept": accept})
    assert response.status_code == 406
    assert response.mimetype == "application/problem+json"


def test_format_field_against_accept_is_406(client):
    response = client.post("/v1/charts/section", json={**BODIES["section"], "format": "png"},
                           headers={"Accept": "image/svg+xml"})
    assert response.status_code == 406


@pytest.mark.parametrize(("body", "path"), [
    ({**BODIES["section"], "width": 10}, "width"),
    ({**BODIES["section"], "format": "gif"}, "format"),
    ({"family": "round_tube", "dimensions": {"outer_diameter": "30 mm", "wall": "20 mm"}},
     "dimensions.wall"),
    ({"family": "round_tube", "dimensions": {"outer_diameter": "30 kg", "wall": "1 mm"}},
     "dimensions.outer_diameter"),
])
def test_section_bad_input_names_the_field(client, body, path):
    response = client.post("/v1/charts/section", json=body)
    assert response.status_code == 422
    assert path in response.json["errors"], response.json


def test_explorer_page_is_served_with_its_assets(client):
    with client.get("/") as page:
        assert page.status_code == 200 and page.mimetype == "text/html"
        assert "default-src 'self'" in page.headers["Content-Security-Policy"]
        html = page.get_data(as_text=True)
    assert "qualified engineer" in html
    for asset in ("/explorer/static/explorer.js", "/explorer/static/explorer.css",
                  "/explorer/static/icon.svg"):
        assert asset in html
        with client.get(asset) as response:
            assert response.status_code == 200
    assert "http://" not in html and "https://" not in html
