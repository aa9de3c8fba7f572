"""The material property chart: two property quantities on log-log axes with an index line.

Each axis is a product of powers of material properties. Every material with data is drawn at
its value on the request's property basis, with a cross spanning the quantity from the
properties' low ends to their high ends (a negative power takes the other end). The chosen
materials are drawn in colour, a series per material class (or family), the rest faded.

The guide line joins the points of equal index. With index = prod(property^e) and the axes
x = prod(property^px), y = prod(property^py), the index is constant along a line of the chart
exactly when e = a py - b px for some numbers a != 0 and b: then index = y^a / x^b, and in
log-log coordinates ``log y = (b / a) log x + log(index) / a``, a line of slope b / a
(the usual reading of an index line on a property chart; for E^(1/2)/rho on E against rho
the slope is 2). The line passes through one chosen material.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np
from matplotlib.figure import Figure

from service.charts import quantities
from service.charts.labels import place_labels
from service.charts.render import (
    FADED,
    MAX_SERIES,
    basis_words,
    footnote,
    freeze_layout,
    log_axes,
    new_figure,
    series_style,
)
from service.core.errors import InputError
from service.core.materials import MaterialTable

MATERIAL_CLASSES = {
    "steel": "metals",
    "cast_iron": "metals",
    "aluminium": "metals",
    "titanium": "metals",
    "magnesium": "metals",
    "copper": "metals",
    "nickel": "metals",
    "polymer": "polymers",
    "composite": "composites",
    "wood": "woods",
    "ceramic": "ceramics and glasses",
    "glass": "ceramics and glasses",
    "foam": "foams",
}
"""Material family -> the class a chart draws it in (:data:`OTHER_CLASS` where not listed)."""

OTHER_CLASS = "other classes"
CLASS_ORDER = ("metals", "polymers", "composites", "woods", "ceramics and glasses", "foams",
               OTHER_CLASS)
"""Classes in legend order; each keeps its style (colour, marker) on every chart."""

MAX_LABEL_LENGTH = 30


@dataclass(frozen=True)
class Guide:
    """The index line.

    Attributes:
        exponents: material property -> exponent of the index (material part).
        description: the index in words, for the legend.
        through: id of the material the line passes through; None: the highest index among
            the chosen materials.
    """

    exponents: Mapping[str, float]
    description: str
    through: str | None = None


@dataclass(frozen=True)
class PropertyChart:
    """A property chart request, SI values.

    Attributes:
        x, y: property -> power of each axis quantity.
        chosen: ids of the materials drawn in colour (None: all).
        guide: the index line, or None.
        top: keep only the best ``top`` chosen materials by the guide index (needs a guide).
        labels: label at most this many chosen materials (best first when there is a guide).
        series: ``"class"`` (:data:`MATERIAL_CLASSES`) or ``"family"``.
        basis: property basis of the points.
        x_limits, y_limits: axis ranges in the axes' display units, or None (from the data).
        width, height: pixels.
        title: the chart title, or None.
    """

    x: Mapping[str, float]
    y: Mapping[str, float]
    chosen: tuple[str, ...] | None = None
    guide: Guide | None = None
    top: int | None = None
    labels: int = 12
    series: str = "class"
    basis: str = "typical"
    x_limits: tuple[float, float] | None = None
    y_limits: tuple[float, float] | None = None
    width: int = 800
    height: int = 560
    title: str | None = None


def natural_axes(exponents: Mapping[str, float]) -> tuple[dict[str, float], dict[str, float]]:
    """The axes on which an index is a line: x the properties with negative exponents, y the
    positive ones, each normalised by its largest power (E^(1/2)/rho: x = rho, y = E).

    Raises InputError at ``guide`` when the index has no property of one sign.
    """
    rising = {n: e for n, e in exponents.items() if e > 0}
    falling = {n: -e for n, e in exponents.items() if e < 0}
    if not rising or not falling:
        raise InputError.single(
            "guide", "give x and y: an index with exponents of one sign has no natural axes")
    a, b = max(rising.values()), max(falling.values())
    return {n: p / b for n, p in falling.items()}, {n: p / a for n, p in rising.items()}


def guide_slope(exponents: Mapping[str, float], x: Mapping[str, float],
                y: Mapping[str, float]) -> tuple[float, float]:
    """(a, b) with exponents = a y - b x, so index = y^a / x^b and the slope is b / a.

    Raises InputError at ``guide`` when the index is not constant along a line of the chart.
    """
    names = sorted(set(exponents) | set(x) | set(y))
    matrix = np.array([[y.get(n, 0.0), -x.get(n, 0.0)] for n in names])
    target = np.array([exponents.get(n, 0.0) for n in names])
    (a, b), *_ = np.linalg.lstsq(matrix, target, rcond=None)
    if np.max(np.abs(matrix @ [a, b] - target)) > 1e-9 or abs(a) < 1e-12:
        raise InputError.single(
            "guide", "the index is not constant along a line of this chart: its exponents "
            "must be a * (y's powers) - b * (x's powers) with a != 0; choose x and y from "
            "the index's properties")
    return float(a), float(b)


def _quantity(table: MaterialTable, powers: Mapping[str, float], basis: str
              ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """(value, low, high) of an axis quantity, shape (M,) each, SI."""
    value, low, high = (np.ones(len(table)) for _ in range(3))
    for name, power in powers.items():
        ends = (table.low[name], table.high[name])
        low = low * (ends[0] if power > 0 else ends[1]) ** power
        high = high * (ends[1] if power > 0 else ends[0]) ** power
        value = value * np.asarray(table.values(name, basis), dtype=float) ** power
    return value, low, high


def _series_of(table: MaterialTable, series: str) -> list[str]:
    if series == "family":
        return list(table.families)
    return [MATERIAL_CLASSES.get(f, OTHER_CLASS) for f in table.families]


def _short(name: str) -> str:
    return name if len(name) <= MAX_LABEL_LENGTH else name[: MAX_LABEL_LENGTH - 1] + "\u2026"


def build(table: MaterialTable, chart: PropertyChart) -> Figure:
    """Draw the property chart of ``table``'s materials.

    Every property value is above zero (the material data and client materials are
    validated so), so every material with data has a place on the log axes.

    Raises:
        InputError: a guide the axes cannot show or a ``through`` material without data
            (``guide...``), ``top`` without a guide, more chosen series than styles
            (``series``).
    """
    x, x_low, x_high = _quantity(table, chart.x, chart.basis)
    y, y_low, y_high = _quantity(table, chart.y, chart.basis)
    has_data = np.isfinite(x) & np.isfinite(y) & np.isfinite(x_low) & np.isfinite(y_low) \
        & np.isfinite(x_high) & np.isfinite(y_high)
    chosen = np.ones(len(table), bool) if chart.chosen is None else np.isin(
        np.asarray(table.ids), chart.chosen)
    chosen &= has_data

    log_index = None
    slope = None
    better = ""
    if chart.guide is not None:
        a, b = guide_slope(chart.guide.exponents, chart.x, chart.y)
        slope = b / a
        better = "above" if a > 0 else "below"
        log_index = a * np.log10(np.where(has_data, y, 1.0)) - b * np.log10(
            np.where(has_data, x, 1.0))
    order = np.flatnonzero(chosen)
    if log_index is not None:
        order = order[np.lexsort((np.asarray(table.ids)[order], -log_index[order]))]
    if chart.top is not None:
        if log_index is None:
            raise InputError.single("top", "keeps the best materials by the guide index: "
                                    "give guide as well")
        order = order[: chart.top]
        chosen = np.isin(np.arange(len(table)), order)

    names = _series_of(table, chart.series)
    present = list(dict.fromkeys(names[i] for i in order))
    if chart.series == "class":
        present.sort(key=CLASS_ORDER.index)
    if len(present) > MAX_SERIES:
        raise InputError.single(
            "series", f"the chosen materials fall in {len(present)} series; a chart draws at "
            f"most {MAX_SERIES} (choose fewer materials with highlight, or series \"class\")")

    x_scale, x_unit = quantities.display_scale(chart.x, float(np.nanmedian(x[has_data])))
    y_scale, y_unit = quantities.display_scale(chart.y, float(np.nanmedian(y[has_data])))
    missing = int(np.count_nonzero(~has_data))
    remarks = ["Crosses span each quantity from the properties' low to high ends."]
    if chart.guide is not None:
        remarks.insert(0, f"The line joins materials of equal index {chart.guide.description} "
                          f"(slope {quantities.ratio_text(slope)} in log-log axes); materials "
                          f"{better} it do better.")
    if missing:
        remarks.append(f"{missing} material(s) without data for an axis are not drawn.")

    figure = new_figure(chart.width, chart.height, footnote(basis_words(chart.basis), remarks))
    axes = figure.add_subplot()
    log_axes(axes)
    axes.grid(True, which="major")
    faded = np.flatnonzero(has_data & ~chosen)
    if len(faded):
        _crosses(axes, x, x_low, x_high, y, y_low, y_high, faded, x_scale, y_scale,
                 color=FADED, marker="o", size=3.0, label="other materials", zorder=1)
    for position, name in enumerate(present):
        rows = [i for i in order if names[i] == name]
        style = series_style(_style_position(name, position, chart.series))
        _crosses(axes, x, x_low, x_high, y, y_low, y_high, np.asarray(rows), x_scale, y_scale,
                 color=style.color, marker=style.marker, size=4.5, label=name, zorder=3)

    _set_limits(axes.set_xlim, chart.x_limits, x_scale, x_low[has_data], x_high[has_data])
    _set_limits(axes.set_ylim, chart.y_limits, y_scale, y_low[has_data], y_high[has_data])
    if chart.guide is not None and len(order):
        through = _through(table, chart.guide.through, order, has_data)
        _guide_line(axes, slope, x[through] / x_scale, y[through] / y_scale,
                    f"{chart.guide.description} constant, slope "
                    f"{quantities.ratio_text(slope)}\n(through {_short(table.names[through])})")
    axes.set_xlabel(quantities.axis_label(chart.x, x_unit))
    axes.set_ylabel(quantities.axis_label(chart.y, y_unit))
    title = chart.title or "Material property chart"
    axes.set_title(title, loc="left")
    axes.legend(loc="lower right", handlelength=2.6)
    figure.set_label(f"{title}: {axes.get_ylabel()} against {axes.get_xlabel()}")
    freeze_layout(figure)

    labelled = order[: chart.labels]
    points = np.column_stack([x[labelled] / x_scale, y[labelled] / y_scale])
    unlabelled = np.flatnonzero(has_data & ~np.isin(np.arange(len(table)), labelled))
    others = np.column_stack([x[unlabelled] / x_scale, y[unlabelled] / y_scale])
    placed = place_labels(axes, points, [_short(table.names[i]) for i in labelled],
                          obstacles=others)
    left_out = sum(label is None for label in placed)
    if left_out:
        axes.set_title(f"{left_out} label(s) left out for space", loc="right", fontsize=7,
                       color="#555555")
    return figure


def _style_position(name: str, position: int, series: str) -> int:
    """Material classes keep one style each on every chart; families take them in order."""
    return CLASS_ORDER.index(name) if series == "class" else position


def _crosses(axes, x, x_low, x_high, y, y_low, y_high, rows, x_scale, y_scale, *, color,
             marker, size, label, zorder):
    px, py = x[rows] / x_scale, y[rows] / y_scale
    axes.errorbar(
        px, py,
        xerr=np.vstack([px - x_low[rows] / x_scale, x_high[rows] / x_scale - px]),
        yerr=np.vstack([py - y_low[rows] / y_scale, y_high[rows] / y_scale - py]),
        fmt=marker, color=color, markersize=size, markeredgecolor="white",
        markeredgewidth=0.5, elinewidth=0.8, capsize=0, label=label, zorder=zorder,
        alpha=1.0 if zorder > 1 else 0.9,
    )


def _set_limits(setter, limits: tuple[float, float] | None, scale: float, low: np.ndarray,
                high: np.ndarray) -> None:
    """Axis range in display units: the request's (SI) limits, else the data's with a margin."""
    if limits is None:
        lo, hi = math.log10(float(np.min(low / scale))), math.log10(float(np.max(high / scale)))
        pad = max(0.15, 0.06 * (hi - lo))
        limits = (10 ** (lo - pad) * scale, 10 ** (hi + pad) * scale)
    setter(limits[0] / scale, limits[1] / scale)


def _through(table: MaterialTable, material_id: str | None, order: np.ndarray,
             has_data: np.ndarray) -> int:
    if material_id is None:
        return int(order[0])
    if material_id not in table.ids:
        raise InputError.single("guide.through", f"no material {material_id!r} in the chart")
    position = table.position(material_id)
    if not has_data[position]:
        raise InputError.single("guide.through",
                                f"{material_id} has no data for an axis of the chart")
    return position


def _guide_line(axes, slope: float, x0: float, y0: float, label: str) -> None:
    """The line of slope ``slope`` in log-log coordinates through (x0, y0), across the axes."""
    x_ends = np.asarray(axes.get_xlim())
    y_ends = y0 * (x_ends / x0) ** slope
    (line,) = axes.plot(x_ends, y_ends, color="#333333", linewidth=1.1, linestyle=(0, (7, 3)),
                        label=label, zorder=2, scalex=False, scaley=False)
    line.set_gid("guide-line")

