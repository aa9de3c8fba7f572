"""The section drawing: one cross-section to scale, dimensioned in millimetres.

Depth lies in the plane of bending and is drawn upright (the contract's convention for every
family), width across. The plane of bending is the dash-dot line through the centroid, with
the load arrow on it; the neutral axis is the thin horizontal line. A scale bar keeps the
drawing readable when printed at another size. Sized for a plugin's side panel (420 px square
by default).
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass

from matplotlib.axes import Axes
from matplotlib.figure import Figure
from matplotlib.patches import Circle, Polygon, Rectangle

from service.charts.designs import family_words
from service.charts.render import INK, PALETTE, footnote, new_figure

MATERIAL_FILL = "#9fc3df"
CORE_FILL = "#f3d9a4"
EDGE = "#1f3b57"
DIMENSION = "#333333"
PLANE = PALETTE[1]


@dataclass(frozen=True)
class SectionDrawing:
    """A section drawing request, dimensions in metres.

    Attributes:
        family: section family id.
        dimensions: dimension name -> m (validated by the family already).
        caption: material or design words under the title, or "".
        basis: the property basis of the design drawn, or "" when not a design.
        width, height: pixels.
        title: replaces the title made from the family and dimensions, or None.
    """

    family: str
    dimensions: Mapping[str, float]
    caption: str = ""
    basis: str = ""
    width: int = 420
    height: int = 420
    title: str | None = None


def millimetres(metres: float) -> str:
    """``0.0007`` -> ``"0.7"``, ``0.02954`` -> ``"29.54"``, ``0.3`` -> ``"300"``."""
    value = metres * 1000.0
    text = f"{value:.2f}" if value < 100 else f"{value:.1f}"
    return text.rstrip("0").rstrip(".")


def build(drawing: SectionDrawing) -> Figure:
    """Draw the section (millimetre coordinates, centroid at the origin)."""
    dims = {name: value * 1000.0 for name, value in drawing.dimensions.items()}
    basis = ("the dimensions of a design sized on " + drawing.basis + " property values"
             if drawing.basis else "the dimensions given")
    figure = new_figure(drawing.width, drawing.height, footnote(
        basis, ["Drawn to scale, dimensions in mm; depth lies in the plane of bending."]))
    axes = figure.add_subplot()
    axes.set_aspect("equal")
    axes.set_axis_off()
    half_width, half_depth = DRAWERS[drawing.family](axes, dims)
    size = max(half_width, half_depth) * 2
    _plane_of_bending(axes, half_width, half_depth, size)
    _scale_bar(axes, half_width, half_depth, size)
    margin = 0.42 * size
    axes.set_xlim(-half_width - margin, half_width + margin)
    axes.set_ylim(-half_depth - margin, half_depth + margin)
    title = drawing.title or f"{family_words(drawing.family)}, " + " \u00d7 ".join(
        millimetres(v) for v in drawing.dimensions.values()) + " mm"
    axes.set_title(title + (f"\n{drawing.caption}" if drawing.caption else ""), loc="left",
                   fontsize=9)
    figure.set_label(f"Section drawing: {title}" + (f", {drawing.caption}"
                                                   if drawing.caption else ""))
    return figure


def _fill(patch, core: bool = False):
    patch.set_facecolor(CORE_FILL if core else MATERIAL_FILL)
    patch.set_edgecolor(EDGE)
    patch.set_linewidth(1.0)
    if core:
        patch.set_hatch("..")
    return patch


def _hole(patch):
    patch.set_facecolor("white")
    patch.set_edgecolor(EDGE)
    patch.set_linewidth(1.0)
    return patch


def _solid_round(axes: Axes, d: Mapping[str, float]) -> tuple[float, float]:
    r = d["diameter"] / 2
    axes.add_patch(_fill(Circle((0, 0), r)))
    _dimension(axes, (-r, -r), (r, -r), "below", "\u00d8 " + _mm(d["diameter"]), 2 * r)
    return r, r


def _solid_rectangle(axes: Axes, d: Mapping[str, float]) -> tuple[float, float]:
    b, h = d["width"], d["depth"]
    axes.add_patch(_fill(Rectangle((-b / 2, -h / 2), b, h)))
    _box_dimensions(axes, b, h)
    return b / 2, h / 2


def _round_tube(axes: Axes, d: Mapping[str, float]) -> tuple[float, float]:
    r, t = d["outer_diameter"] / 2, d["wall"]
    axes.add_patch(_fill(Circle((0, 0), r)))
    axes.add_patch(_hole(Circle((0, 0), r - t)))
    _dimension(axes, (-r, -r), (r, -r), "below", "\u00d8 " + _mm(d["outer_diameter"]), 2 * r)
    _callout(axes, (-(r - t / 2) / math.sqrt(2), (r - t / 2) / math.sqrt(2)), (-1, 1), 2 * r,
             "wall " + _mm(t))
    return r, r


def _rectangular_tube(axes: Axes, d: Mapping[str, float]) -> tuple[float, float]:
    b, h, t = d["width"], d["depth"], d["wall"]
    axes.add_patch(_fill(Rectangle((-b / 2, -h / 2), b, h)))
    axes.add_patch(_hole(Rectangle((-b / 2 + t, -h / 2 + t), b - 2 * t, h - 2 * t)))
    _box_dimensions(axes, b, h)
    _callout(axes, (-b / 2 + t / 2, h / 4), (-1, 1), max(b, h), "wall " + _mm(t))
    return b / 2, h / 2


def _i_section(axes: Axes, d: Mapping[str, float]) -> tuple[float, float]:
    h, bf = d["depth"], d["flange_width"]
    tf, tw = d["flange_thickness"], d["web_thickness"]
    x, y = bf / 2, h / 2
    outline = [(-x, y), (x, y), (x, y - tf), (tw / 2, y - tf), (tw / 2, -y + tf), (x, -y + tf),
               (x, -y), (-x, -y), (-x, -y + tf), (-tw / 2, -y + tf), (-tw / 2, y - tf),
               (-x, y - tf)]
    axes.add_patch(_fill(Polygon(outline, closed=True)))
    _box_dimensions(axes, bf, h)
    size = max(bf, h)
    _callout(axes, (-x * 0.6, y - tf / 2), (-1, 1), size, "flange " + _mm(tf))
    _callout(axes, (-tw / 2, -y / 3), (-1, -0.4), size, "web " + _mm(tw))
    return x, y


def _sandwich_panel(axes: Axes, d: Mapping[str, float]) -> tuple[float, float]:
    b, c, f = d["width"], d["core_thickness"], d["face_thickness"]
    y = c / 2 + f
    axes.add_patch(_fill(Rectangle((-b / 2, c / 2), b, f)))
    axes.add_patch(_fill(Rectangle((-b / 2, -c / 2), b, c), core=True))
    axes.add_patch(_fill(Rectangle((-b / 2, -y), b, f)))
    _box_dimensions(axes, b, 2 * y)
    size = max(b, 2 * y)
    _callout(axes, (-b / 4, c / 2 + f / 2), (-1, 1), size, "face " + _mm(f))
    _callout(axes, (-b / 2 * 0.8, -c / 4), (-1, -1), size, "core " + _mm(c))
    return b / 2, y


DRAWERS = {
    "solid_round": _solid_round,
    "solid_rectangle": _solid_rectangle,
    "round_tube": _round_tube,
    "rectangular_tube": _rectangular_tube,
    "i_section": _i_section,
    "sandwich_panel": _sandwich_panel,
}
"""Section family id -> drawer: draws the section in mm and returns its (half width, half
depth) in mm."""


def _mm(value_mm: float) -> str:
    return millimetres(value_mm / 1000.0)


def _box_dimensions(axes: Axes, width: float, depth: float) -> None:
    """Width below and depth to the right of a section's bounding box (centred, mm)."""
    size = max(width, depth)
    x, y = width / 2, depth / 2
    _dimension(axes, (-x, -y), (x, -y), "below", _mm(width), size)
    _dimension(axes, (x, -y), (x, y), "right", _mm(depth), size)


def _dimension(axes: Axes, start, end, side: str, text: str, size: float) -> None:
    """A dimension line parallel to start-end, offset outward (``"below"`` or ``"right"``)
    by a share of the drawing's size, with extension lines and its value in mm."""
    (x0, y0), (x1, y1) = start, end
    dx, dy = (0.0, -1.0) if side == "below" else (1.0, 0.0)
    gap = DIMENSION_OFFSET * size
    ax0, ay0, ax1, ay1 = x0 + dx * gap, y0 + dy * gap, x1 + dx * gap, y1 + dy * gap
    for (px, py), (qx, qy) in (((x0, y0), (ax0, ay0)), ((x1, y1), (ax1, ay1))):
        axes.plot([px + dx * gap * 0.15, qx + dx * gap * 0.25],
                  [py + dy * gap * 0.15, qy + dy * gap * 0.25],
                  color=DIMENSION, linewidth=0.6)
    axes.annotate("", xy=(ax0, ay0), xytext=(ax1, ay1),
                  arrowprops={"arrowstyle": "<|-|>", "color": DIMENSION, "linewidth": 0.8,
                              "shrinkA": 0, "shrinkB": 0, "mutation_scale": 7})
    mid = ((ax0 + ax1) / 2, (ay0 + ay1) / 2)
    if side == "below":
        axes.annotate(text + " mm", mid, xytext=(0, -3), textcoords="offset points",
                      ha="center", va="top", fontsize=8, color=INK)
    elif abs(y1 - y0) < SHORT_DIMENSION * size:
        axes.annotate(text + " mm", mid, xytext=(4, 0), textcoords="offset points",
                      ha="left", va="center", fontsize=8, color=INK)
    else:
        axes.annotate(text + " mm", mid, xytext=(3, 0), textcoords="offset points",
                      ha="center", va="top", fontsize=8, color=INK, rotation=90,
                      rotation_mode="anchor")


DIMENSION_OFFSET = 0.14
"""Distance of a dimension line from the section, as a share of the section's size."""
SHORT_DIMENSION = 0.3
"""An upright dimension shorter than this share of the section's size is written across."""


def _callout(axes: Axes, point, direction, size: float, text: str) -> None:
    """A label with a leader line to a thin part (a wall, a flange, a face)."""
    dx, dy = direction
    norm = math.hypot(dx, dy)
    reach = 0.3 * size
    target = (point[0] + dx / norm * reach, point[1] + dy / norm * reach)
    axes.annotate(text + " mm", point, xytext=target, textcoords="data",
                  ha="right" if dx < 0 else "left", va="center", fontsize=8, color=INK,
                  arrowprops={"arrowstyle": "-|>", "color": DIMENSION, "linewidth": 0.7,
                              "mutation_scale": 7, "shrinkA": 2, "shrinkB": 0})


def _plane_of_bending(axes: Axes, half_width: float, half_depth: float, size: float) -> None:
    reach = half_depth + 0.3 * size
    (plane,) = axes.plot([0, 0], [-reach, reach], color=PLANE, linewidth=1.0,
                         linestyle=(0, (8, 3, 2, 3)), zorder=4)
    plane.set_gid("plane-of-bending")
    axes.annotate("", xy=(0, half_depth + 0.02 * size), xytext=(0, reach),
                  arrowprops={"arrowstyle": "-|>", "color": PLANE, "linewidth": 1.2,
                              "mutation_scale": 12, "shrinkA": 0, "shrinkB": 0}, zorder=5)
    axes.annotate("load, in the plane of bending", (0, reach), xytext=(4, 0),
                  textcoords="offset points", ha="left", va="center", fontsize=8, color=PLANE)
    axes.plot([-half_width - 0.08 * size, half_width + 0.08 * size], [0, 0], color="#777777",
              linewidth=0.6, linestyle=(0, (2, 2)), zorder=4)
    axes.annotate("neutral axis", (-half_width - 0.08 * size, 0), xytext=(-3, 0),
                  textcoords="offset points", ha="right", va="center", fontsize=7,
                  color="#555555")


def _scale_bar(axes: Axes, half_width: float, half_depth: float, size: float) -> None:
    """A bar of a round length (1, 2 or 5 x 10^n mm) at the lower left."""
    target = 0.3 * size
    exponent = math.floor(math.log10(target))
    length = max(m * 10.0**exponent for m in (1, 2, 5) if m * 10.0**exponent <= target)
    x0 = -half_width - 0.36 * size
    y0 = -half_depth - 0.36 * size
    axes.plot([x0, x0 + length], [y0, y0], color=INK, linewidth=2.0, solid_capstyle="butt")
    axes.annotate(f"{length:g} mm", (x0 + length / 2, y0), xytext=(0, 3),
                  textcoords="offset points", ha="center", va="bottom", fontsize=7, color=INK)
