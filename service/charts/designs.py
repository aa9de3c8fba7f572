"""The design trade-off chart: mass against cost or embodied carbon, with the Pareto front.

One point per returned design, a series (colour, marker) per section family, each point
labelled by its rank, material and section. The Pareto front (taken by the sizing core over
every design of the request, not only those returned) is drawn as a staircase: no design lies
below and to the left of it, and each step is a design that no other beats in both.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np
from matplotlib.figure import Figure

from service.charts.labels import place_labels
from service.charts.render import (
    INK,
    MAX_SERIES,
    basis_words,
    footnote,
    freeze_layout,
    log_axes,
    new_figure,
    series_style,
)
from service.core.errors import InputError

FAMILY_WORDS = {
    "solid_round": "solid round",
    "solid_rectangle": "solid rectangle",
    "round_tube": "round tube",
    "rectangular_tube": "box tube",
    "i_section": "I-section",
    "sandwich_panel": "sandwich",
}
"""Section family id -> short words for labels and legends (the id where not listed)."""

AXIS_TEXT = {
    "mass": "mass (kg)",
    "cost": "cost (currency units of the price data, indicative)",
    "carbon": "embodied carbon (kg CO\u2082e, indicative)",
}

LOG_SPAN = 20.0
"""Axes whose values span more than this factor are drawn on a log scale."""

MAX_LABEL_LENGTH = 34


@dataclass(frozen=True)
class TradeOffPoint:
    """One design: rank, material name, section family id, mass (kg) and the other value."""

    rank: int
    material: str
    family: str
    mass: float
    other: float


@dataclass(frozen=True)
class TradeOffChart:
    """A trade-off chart.

    Attributes:
        points: the designs, best first.
        front: the Pareto front designs, lightest first (rank 0: not among ``points``).
        versus: ``"cost"`` or ``"carbon"``.
        basis: the property basis the designs were sized on.
        empty_reason: why there is no design, when there is none.
        width, height: pixels.
        title: the chart title, or None.
    """

    points: Sequence[TradeOffPoint]
    front: Sequence[TradeOffPoint]
    versus: str
    basis: str
    empty_reason: str = ""
    width: int = 800
    height: int = 560
    title: str | None = None


def family_words(family: str) -> str:
    return FAMILY_WORDS.get(family, family)


def _short(name: str) -> str:
    return name if len(name) <= MAX_LABEL_LENGTH else name[: MAX_LABEL_LENGTH - 1] + "\u2026"


def build(chart: TradeOffChart) -> Figure:
    """Draw the trade-off chart.

    Raises:
        InputError: at ``request.sections`` when the designs fall in more section families
            than there are series styles.
    """
    families = list(dict.fromkeys(p.family for p in chart.points))
    if len(families) > MAX_SERIES:
        raise InputError.single("request.sections", f"the designs fall in {len(families)} "
                                f"section families; a chart draws at most {MAX_SERIES}")
    remarks = ["Numbers are the designs' ranks; unnumbered rings are front designs beyond "
               "those returned."]
    if chart.front:
        remarks.append("The staircase is the Pareto front over every feasible design: none "
                       f"is both lighter and lower in {chart.versus}.")
    figure = new_figure(chart.width, chart.height, footnote(basis_words(chart.basis), remarks))
    axes = figure.add_subplot()
    title = chart.title or f"Designs: mass against {chart.versus}"
    axes.set_title(title, loc="left")
    axes.set_xlabel(AXIS_TEXT["mass"])
    axes.set_ylabel(AXIS_TEXT[chart.versus])
    figure.set_label(f"{title}; {len(chart.points)} designs")
    axes.grid(True)
    if not chart.points:
        axes.set_xticks([])
        axes.set_yticks([])
        axes.text(0.5, 0.5, "No feasible design.\n" + chart.empty_reason, ha="center",
                  va="center", wrap=True, transform=axes.transAxes, color=INK)
        return figure

    mass = np.array([p.mass for p in chart.points])
    other = np.array([p.other for p in chart.points])
    front = np.array([(p.mass, p.other) for p in chart.front], dtype=float).reshape(-1, 2)
    every_x = np.concatenate([mass, front[:, 0]])
    every_y = np.concatenate([other, front[:, 1]])
    log_x = every_x.max() > LOG_SPAN * every_x.min()
    log_y = every_y.max() > LOG_SPAN * every_y.min()
    log_axes(axes, log_x, log_y)
    if len(front):
        _front(axes, front, chart.versus)
    for position, family in enumerate(families):
        style = series_style(position)
        rows = [k for k, p in enumerate(chart.points) if p.family == family]
        axes.plot(mass[rows], other[rows], linestyle="none", marker=style.marker,
                  color=style.color, markersize=6, markeredgecolor="white",
                  markeredgewidth=0.6, label=family_words(family), zorder=3)
    _pad(axes, every_x, every_y, log_x, log_y)
    # beside the axes, not over them: a sweep of every material fills every corner
    axes.legend(loc="upper left", bbox_to_anchor=(1.01, 1.0), borderaxespad=0.0,
                handlelength=2.4)
    freeze_layout(figure)
    front_only = [p for p in chart.front if p.rank == 0]
    labelled = [*chart.points, *front_only]
    place_labels(
        axes, np.array([(p.mass, p.other) for p in labelled]),
        [_label(p) for p in labelled],
        fallbacks=[str(p.rank) if p.rank else None for p in labelled],
    )
    return figure


def _label(point: TradeOffPoint) -> str:
    text = f"{_short(point.material)}, {family_words(point.family)}"
    return f"{point.rank} {text}" if point.rank else text


def _front(axes, front: np.ndarray, versus: str) -> None:
    """The front as a staircase from the lightest design down to the lowest ``versus``."""
    xs, ys = front[:, 0], front[:, 1]
    stairs_x = np.repeat(xs, 2)[1:]
    stairs_y = np.repeat(ys, 2)[:-1]
    (line,) = axes.plot(stairs_x, stairs_y, color="#555555", linewidth=1.0,
                        linestyle=(0, (4, 2)), zorder=2, label=f"Pareto front (mass, {versus})")
    line.set_gid("pareto-front")
    axes.plot(xs, ys, linestyle="none", marker="o", markersize=10, markerfacecolor="none",
              markeredgecolor="#555555", markeredgewidth=0.9, zorder=2)


def _pad(axes, xs: np.ndarray, ys: np.ndarray, log_x: bool, log_y: bool) -> None:
    for values, log, setter in ((xs, log_x, axes.set_xlim), (ys, log_y, axes.set_ylim)):
        low, high = float(values.min()), float(values.max())
        if log:
            setter(low / 1.35, high * 1.35)
        else:
            span = (high - low) or abs(high) or 1.0
            setter(max(0.0, low - 0.12 * span) if low >= 0 else low - 0.12 * span,
                   high + 0.12 * span)
