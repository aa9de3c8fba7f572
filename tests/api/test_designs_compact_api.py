"""Compact answers of POST /v1/designs (schemas/README.md, "Agreed additions", "Compact answers"):
rejections grouped by reason by default, every one or none on request, and gzip for clients
that accept it. Targets from issue 16: the README's worked request answered in under 15 kB by
default; gzip as RFC 9110 sec. 8.4.1.3 defines the coding (checked with Python's gzip)."""

from __future__ import annotations

import gzip
import json

import pytest

from service import create_app
from service.core.sizing.results import reason_summary
from service.core.sizing.split import family_split
from tests.readme import README_REQUEST

URL = "/v1/designs"


@pytest.fixture(scope="module")
def answers(app):
    client = app.test_client()
    return {mode: client.post(URL, json={**README_REQUEST, **body})
            for mode, body in (("default", {}), ("grouped", {"rejections": "grouped"}),
                               ("all", {"rejections": "all"}),
                               ("none", {"rejections": "none"}))}


def test_the_readme_answer_is_under_15_kB_with_its_rejections_grouped(answers):
    default = answers["default"]
    assert default.status_code == 200
    assert len(default.data) < 15_000, len(default.data)
    assert default.get_json() == answers["grouped"].get_json()
    assert len(answers["all"].data) > 3 * len(default.data)


def test_every_rejection_is_in_the_group_of_its_reason(answers):
    """Each v1 entry (rejections: all) falls in exactly the group of its reason's summary,
    which names its material and family; the counts add up to the v1 list."""
    groups = answers["default"].get_json()["rejected"]
    every = answers["all"].get_json()["rejected"]
    assert all(set(group) == {"reason", "materials", "sections", "count"} for group in groups)
    by_reason = {group["reason"]: group for group in groups}
    assert len(by_reason) == len(groups)
    for entry in every:
        group = by_reason[reason_summary(entry["reason"])]
        assert entry["material"]["id"] in group["materials"], entry
        assert entry["section"] in group["sections"], entry
    assert sum(group["count"] for group in groups) == len(every)
    assert groups[-1]["reason"] == "not made in this form"  # actionable reasons first


def test_rejections_none_leaves_them_out_with_the_same_designs(answers):
    none = answers["none"].get_json()
    assert none["rejected"] == []
    assert none["designs"] == answers["default"].get_json()["designs"]


def test_an_unknown_rejections_mode_is_a_422_at_its_path(client):
    response = client.post(URL, json={**README_REQUEST, "rejections": "some"})
    assert response.status_code == 422
    assert "rejections" in response.get_json()["errors"]


def test_gzip_when_the_client_accepts_it(client, answers):
    zipped = client.post(URL, json=README_REQUEST, headers={"Accept-Encoding": "gzip, br"})
    assert zipped.headers["Content-Encoding"] == "gzip"
    assert "Accept-Encoding" in zipped.headers["Vary"]
    assert json.loads(gzip.decompress(zipped.data)) == answers["default"].get_json()
    assert len(zipped.data) < len(answers["default"].data) / 2
    assert "Content-Encoding" not in answers["default"].headers
    refused = client.post(URL, json=README_REQUEST, headers={"Accept-Encoding": "gzip;q=0"})
    assert "Content-Encoding" not in refused.headers


def test_streamed_sweeps_are_sent_as_they_are_computed(client):
    base = {key: value for key, value in README_REQUEST.items() if key != "top"}
    body = {"base": {**base, "sections": ["round_tube"]},
            "grid": {"load_case.span": ["0.6 m", "0.9 m"]}, "top": 1}
    streamed = client.post("/v1/sweeps", json=body, headers={
        "Accept": "application/x-ndjson", "Accept-Encoding": "gzip"})
    assert streamed.status_code == 200
    assert "Content-Encoding" not in streamed.headers
    assert [json.loads(line)["case"] for line in streamed.get_data(as_text=True).splitlines()
            ] == [0, 1]


def test_the_answer_is_the_same_sized_on_one_process_or_two():
    """DESIGN_WORKERS: the README's request with its families sized in two shares side by
    side (service.core.sizing.split) is answered byte for byte as in one process."""
    assert family_split(2).ready(timeout=120.0)
    bodies = [create_app({"TESTING": True, "DESIGN_WORKERS": workers}).test_client()
              .post(URL, json={**README_REQUEST, "rejections": "all"}) for workers in (1, 2)]
    assert bodies[0].status_code == bodies[1].status_code == 200
    assert bodies[0].data == bodies[1].data
