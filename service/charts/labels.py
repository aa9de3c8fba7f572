"""Point labels that overlap neither each other nor the points.

A greedy placement, in the order the labels are given (most important first): each label tries
eight positions around its point, near and then farther out (with a leader line), and takes the
first whose box stays inside the axes and clear of every box already taken, of every point's
marker and of the legend. A label that finds no place may fall back to a shorter text (a rank
number) and otherwise is left out; the caller says so in the chart. Deterministic, so charts
stay byte-stable.

The figure's layout must be final before labels are measured (:func:`render.freeze_layout`).
"""

from __future__ import annotations

from collections.abc import Sequence

import numpy as np
from matplotlib.axes import Axes
from matplotlib.text import Annotation, Text
from matplotlib.transforms import Bbox

from service.charts.render import INK

DIRECTIONS = ((1, 1), (1, -1), (-1, 1), (-1, -1), (1, 0), (-1, 0), (0, 1), (0, -1))
DISTANCES = (4.5, 13.0)
"""Offsets of a label from its point, in points; the far ring draws a leader line."""

LABEL_SIZE = 7.5
MARKER_HALF_WIDTH = 4.0
"""Half the side of the box kept clear around every point, in pixels."""

_ALIGN_X = {1: "left", 0: "center", -1: "right"}
_ALIGN_Y = {1: "bottom", 0: "center", -1: "top"}


def place_labels(
    axes: Axes,
    points: np.ndarray,
    texts: Sequence[str | None],
    fallbacks: Sequence[str | None] | None = None,
    obstacles: np.ndarray | None = None,
) -> list[Annotation | None]:
    """Label ``points`` (shape (n, 2), data coordinates) with ``texts`` without overlap.

    Args:
        axes: the axes the points are drawn in, its layout final.
        points: the labelled points, most important first.
        texts: one label per point; None for a point that gets none.
        fallbacks: a shorter text tried where the full one finds no place (None: none).
        obstacles: other drawn points (shape (m, 2)) that labels must not cover.

    Returns:
        The placed annotation of each point, or None where no label was placed.
    """
    renderer = axes.figure.canvas.get_renderer()
    area = axes.get_window_extent(renderer)
    pixels = axes.transData.transform(np.asarray(points, dtype=float).reshape(-1, 2))
    others = np.empty((0, 2)) if obstacles is None or not len(obstacles) else (
        axes.transData.transform(np.asarray(obstacles, dtype=float).reshape(-1, 2)))
    taken = [_marker_box(p) for p in np.vstack([pixels, others])]
    legend = axes.get_legend()
    if legend is not None:
        taken.append(legend.get_window_extent(renderer))
    fallbacks = fallbacks or [None] * len(texts)
    placed: list[Annotation | None] = []
    for index, (point, text, fallback) in enumerate(zip(points, texts, fallbacks, strict=True)):
        label = None
        for candidate in (text, fallback):
            if candidate is None or label is not None:
                continue
            label = _first_free(axes, renderer, area, point, candidate, taken, index)
        placed.append(label)
    return placed


def _first_free(axes, renderer, area: Bbox, point, text: str, taken: list[Bbox], own: int
                ) -> Annotation | None:
    for distance in DISTANCES:
        for dx, dy in DIRECTIONS:
            scale = distance / np.hypot(dx, dy)
            label = axes.annotate(
                text, xy=tuple(point), xytext=(dx * scale, dy * scale),
                textcoords="offset points", fontsize=LABEL_SIZE, color=INK,
                ha=_ALIGN_X[dx], va=_ALIGN_Y[dy], annotation_clip=False,
                arrowprops=None if distance == DISTANCES[0] else {
                    "arrowstyle": "-", "color": "#777777", "linewidth": 0.5,
                    "shrinkA": 0.0, "shrinkB": 3.0},
            )
            box = text_box(label, renderer).padded(1.0)
            if _inside(box, area) and not any(
                box.overlaps(other) for k, other in enumerate(taken) if k != own
            ):
                taken.append(box)
                return label
            label.remove()
    return None


def _marker_box(pixel: np.ndarray) -> Bbox:
    x, y = pixel
    half = MARKER_HALF_WIDTH
    return Bbox.from_extents(x - half, y - half, x + half, y + half)


def _inside(box: Bbox, area: Bbox) -> bool:
    return (area.x0 <= box.x0 and box.x1 <= area.x1 and area.y0 <= box.y0
            and box.y1 <= area.y1)


def label_boxes(labels: Sequence[Annotation | None]) -> list[Bbox]:
    """The text boxes (pixels) of the placed labels, for checks."""
    placed = [label for label in labels if label is not None]
    if not placed:
        return []
    renderer = placed[0].figure.canvas.get_renderer()
    return [text_box(label, renderer) for label in placed]


def text_box(label: Annotation, renderer) -> Bbox:
    """The box of an annotation's text alone (pixels), without its leader line."""
    label.update_positions(renderer)
    return Text.get_window_extent(label, renderer)
