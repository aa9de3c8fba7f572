"""The README's own worked request, read from README.md so that tests and benchmarks send
exactly what a new user copies."""

from __future__ import annotations

import json
import re
from pathlib import Path

README = Path(__file__).resolve().parents[1] / "README.md"


def readme_request() -> dict:
    """The body of the README's first ``curl ... /v1/designs ... -d '...'`` command."""
    text = README.read_text()
    found = re.search(r"/v1/designs \\\n.*?-d '(\{.*?\})'", text, re.S)
    assert found, "README.md no longer has its worked /v1/designs request"
    return json.loads(found.group(1))


README_REQUEST = readme_request()
