"""Reading matplotlib's SVG output back: texts, elements by id, and the axes' log scales.

Only what the chart tests need; the file is parsed as XML, so a malformed file fails here.
"""

from __future__ import annotations

import math
import re
import xml.etree.ElementTree as ET

SVG_NS = "{http://www.w3.org/2000/svg}"
XLINK_HREF = "{http://www.w3.org/1999/xlink}href"
_SUPERSCRIPTS = str.maketrans("\u207b\u2070\u00b9\u00b2\u00b3\u2074\u2075\u2076\u2077\u2078"
                              "\u2079", "-0123456789")


def parse(data: bytes) -> ET.Element:
    return ET.fromstring(data)


def texts(root: ET.Element) -> list[str]:
    """Every text node's full text, in document order."""
    return ["".join(node.itertext()) for node in root.iter(f"{SVG_NS}text")]


def by_id(root: ET.Element, element_id: str) -> ET.Element | None:
    return next((node for node in root.iter() if node.get("id") == element_id), None)


def path_points(group: ET.Element) -> list[tuple[float, float]]:
    """The vertices (SVG units) of the first path in a group (``M x y L x y ...``)."""
    path = next(group.iter(f"{SVG_NS}path"))
    numbers = [float(v) for v in re.findall(r"-?\d+(?:\.\d+)?(?:e-?\d+)?", path.get("d"))]
    return list(zip(numbers[::2], numbers[1::2], strict=True))


def tick_value(text: str) -> float | None:
    """``"100"`` -> 100, ``"0.01"`` -> 0.01, ``"10\u2075"`` -> 1e5; None for anything else."""
    text = text.strip()
    exponent = text[2:]
    if text.startswith("10") and exponent and exponent != exponent.translate(_SUPERSCRIPTS):
        return 10.0 ** int(exponent.translate(_SUPERSCRIPTS))
    try:
        return float(text)
    except ValueError:
        return None


def decade_scale(root: ET.Element, axis: str) -> tuple[float, float]:
    """(SVG units per decade, SVG coordinate of value 1) of a log axis, from its labelled
    major ticks (``xtick_*`` or ``ytick_*`` groups: a tick mark and its label)."""
    positions, logs = [], []
    for group in root.iter(f"{SVG_NS}g"):
        if not (group.get("id") or "").startswith(f"{axis}tick_"):
            continue
        labels = [tick_value(t) for t in texts(group)]
        marks = list(group.iter(f"{SVG_NS}use"))
        if len(labels) != 1 or labels[0] is None or not marks:
            continue
        coordinate = float(marks[0].get("x" if axis == "x" else "y"))
        positions.append(coordinate)
        logs.append(math.log10(labels[0]))
    if len(positions) < 2:
        raise AssertionError(f"fewer than two labelled {axis} ticks")
    per_decade = (positions[-1] - positions[0]) / (logs[-1] - logs[0])
    return per_decade, positions[0] - per_decade * logs[0]
