"""Explore boom designs for a small camera crane over a range of reaches and payloads.

Scenario (ours; every number is invented demo data): a rental house builds a portable camera
crane whose boom is a cantilever from the pivot. Reaches run from 1.5 m to 4 m and payloads
(camera, head and a dynamic allowance) from 60 N to 240 N. The tip may sag at most 1/200 of
the reach, the boom must fit an 80 mm x 80 mm clamp, and walls are at least 1 mm for handling.
The script asks a running Formwise service for the lightest design of each case and writes
one CSV row per case and rank.

    make serve &
    python examples/camera_crane_boom.py --url http://127.0.0.1:8000 -o crane.csv

It uses only the standard library, so it runs from any Python 3.11.
Preliminary sizing only: final members are checked against the local design code by a
qualified engineer.
"""

from __future__ import annotations

import argparse
import json
import sys
import urllib.error
import urllib.request

REACHES_M = [1.5, 2.0, 2.5, 3.0, 3.5, 4.0]
PAYLOADS_N = [60, 120, 180, 240]


def sweep_request(top: int = 3) -> dict:
    """The /v1/sweeps body: one explicit case per reach and payload (the sag limit follows the
    reach, so the cases are listed rather than gridded)."""
    base = {
        "load_case": {"type": "cantilever_end_load", "span": REACHES_M[0], "load": PAYLOADS_N[0]},
        "requirements": {"max_deflection": REACHES_M[0] / 200, "safety_factor": 2.0,
                         "self_weight": True},
        "envelope": {"max_depth": "80 mm", "max_width": "80 mm"},
        "min_wall": "1 mm",
        "sections": ["round_tube", "rectangular_tube"],
        "materials": {"families": ["aluminium", "composite", "steel"]},
    }
    cases = [
        {"load_case.span": reach, "load_case.load": payload,
         "requirements.max_deflection": reach / 200}
        for reach in REACHES_M
        for payload in PAYLOADS_N
    ]
    return {"base": base, "cases": cases, "top": top}


def run(url: str, output: str) -> int:
    """POST the sweep, ask for CSV, and write it to ``output``. Returns the number of rows."""
    request = urllib.request.Request(
        url.rstrip("/") + "/v1/sweeps",
        data=json.dumps(sweep_request()).encode(),
        headers={"Content-Type": "application/json", "Accept": "text/csv"},
        method="POST",
    )
    with urllib.request.urlopen(request, timeout=120) as response:
        text = response.read().decode()
        caution = response.headers.get("Formwise-Caution", "")
    with open(output, "w", newline="") as handle:
        handle.write(text)
    print(caution, file=sys.stderr)
    return text.count("\n") - 1


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--url", default="http://127.0.0.1:8000")
    parser.add_argument("-o", "--output", default="camera_crane_boom.csv")
    args = parser.parse_args(argv)
    try:
        rows = run(args.url, args.output)
    except urllib.error.HTTPError as error:
        print(f"the service refused the request ({error.code}): {error.read().decode()}",
              file=sys.stderr)
        return 1
    except urllib.error.URLError as error:
        print(f"cannot reach {args.url}: {error.reason}", file=sys.stderr)
        return 1
    print(f"wrote {rows} rows to {args.output}", file=sys.stderr)
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
