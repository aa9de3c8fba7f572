"""The sweep chart: the best design's mass (or another column) against one varied input, a
line per section family or per material.

A sweep's own table keeps the best designs of each case over every family and material, so
the best of one family may be missing from it. The chart therefore runs the sweep once per
series, restricted to that family (or material), with one design per case: each line is the
best that family (or material) can do at each value of the varied input. A case where it has
no feasible design breaks its line.
"""

from __future__ import annotations

import dataclasses
import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass

import numpy as np
from matplotlib.figure import Figure

from service.charts.designs import AXIS_TEXT, family_words
from service.charts.render import (
    MAX_SERIES,
    basis_words,
    footnote,
    log_axes,
    new_figure,
    series_style,
)
from service.core.errors import InputError
from service.core.materials import MaterialTable
from service.core.sizing import DesignRequest, validate_request
from service.core.sizing.engine import CaseSizer
from service.core.sizing.fields import at_contract_paths
from service.core.sweeps import Sweep, build_sweep, sweep_rows

INPUT_TEXT = {
    "load_case.span": ("span", "m", 1.0),
    "load_case.load": ("load", "N", 1.0),
    "load_case.torque": ("torque", "N m", 1.0),
    "requirements.max_deflection": ("max. deflection", "mm", 1e3),
    "requirements.max_twist": ("max. twist", "rad", 1.0),
    "requirements.safety_factor": ("safety factor", "", 1.0),
    "envelope.max_depth": ("max. depth", "mm", 1e3),
    "envelope.max_width": ("max. width", "mm", 1e3),
    "min_wall": ("min. wall", "mm", 1e3),
}
"""Varied path -> (words, unit shown, SI value x scale = value shown). Only numeric inputs can
be an x axis."""

SERIES = ("family", "material")
SCALES = ("linear", "log")


@dataclass(frozen=True)
class SweepChart:
    """A sweep chart request (the sweep already loaded to SI).

    Attributes:
        base: the request every case starts from.
        materials, cores: candidate materials and sandwich cores.
        grid, cases: the sweep's cases, as /v1/sweeps takes them (one of the two).
        x: the varied path on the x axis.
        y: the column drawn: ``mass``, ``cost``, ``carbon`` or ``dimensions.<name>``.
        series: a line per ``"family"`` or per ``"material"``.
        x_scale, y_scale: ``"linear"`` or ``"log"``.
        max_cases: the service's limit of cases per sweep.
        width, height: pixels.
        title: the chart title, or None.
    """

    base: DesignRequest
    materials: MaterialTable
    cores: MaterialTable
    grid: Mapping[str, Sequence[object]] | None
    cases: Sequence[Mapping[str, object]] | None
    x: str | None = None
    y: str = "mass"
    series: str = "family"
    x_scale: str = "linear"
    y_scale: str = "linear"
    max_cases: int = 100_000
    width: int = 800
    height: int = 520
    title: str | None = None


@dataclass(frozen=True)
class Line:
    """One series: its name and its y value at each x (NaN where it has no design)."""

    name: str
    x: np.ndarray
    y: np.ndarray


def _located(error: InputError) -> InputError:
    return error.prefixed("request")


def _sweep(chart: SweepChart, base: DesignRequest) -> Sweep:
    try:
        return build_sweep(base, grid=chart.grid, cases=chart.cases, top=1,
                           max_cases=chart.max_cases)
    except InputError as error:
        raise _located(error) from None


def _x_path(chart: SweepChart, sweep: Sweep) -> str:
    """The varied path drawn on x; every other varied path must keep one value."""
    x = chart.x
    if x is None:
        if len(sweep.paths) != 1:
            raise InputError.single("x", "the sweep varies several inputs: name the one to "
                                    "draw along x (" + ", ".join(sweep.paths) + ")")
        x = sweep.paths[0]
    if x not in sweep.paths:
        raise InputError.single("x", f"is not varied by the sweep ({', '.join(sweep.paths)})")
    if x not in INPUT_TEXT:
        raise InputError.single("x", "must be a numeric input: one of " + ", ".join(INPUT_TEXT))
    where = "request.grid" if chart.grid is not None else "request.cases"
    errors = {
        f"{where}.{path}" if chart.grid is not None else where: [
            f"a sweep chart varies one input ({x}); give {path} one value"]
        for k, path in enumerate(sweep.paths)
        if path != x and len({case[k] for case in sweep.cases}) > 1
    }
    if errors:
        raise InputError(errors)
    return x


def sweep_lines(chart: SweepChart) -> tuple[str, list[Line], list[str]]:
    """(x path, one line per series, series with no feasible design at all, with the reason
    where the request rules the whole family out).

    Raises:
        InputError: a bad sweep (at ``request....``), ``x``, ``y``, ``series`` or too many
            series (at ``request.sections`` or ``request.base.materials``).
    """
    sweep = _sweep(chart, chart.base)
    x_path = _x_path(chart, sweep)
    columns = sweep.columns()
    if chart.y not in ("mass", "cost", "carbon") and not (
            chart.y.startswith("dimensions.") and chart.y in columns):
        raise InputError.single("y", "must be mass, cost, carbon or one of " + ", ".join(
            c for c in columns if c.startswith("dimensions.")))
    skipped: list[str] = []
    if chart.series == "family":
        groups = []
        for family in sweep.families():
            base = dataclasses.replace(chart.base, sections=(family,))
            try:
                validate_request(base)
            except InputError as error:
                # A family the request does not name and cannot size at all (a sandwich
                # without a panel width): /v1/designs rejects it with this reason too.
                first = next(iter(at_contract_paths(error).errors.items()))
                skipped.append(f"{family_words(family)} ({first[0]} {first[1][0]})")
                continue
            groups.append((family_words(family), base, chart.materials))
        where = "request.base.sections"
    else:
        groups = [(chart.materials.names[i], chart.base, chart.materials.take([i]))
                  for i in range(len(chart.materials))]
        where = "request.base.materials"
    if len(groups) > MAX_SERIES:
        raise InputError.single(where, f"gives {len(groups)} series ({chart.series}); a chart "
                                f"draws at most {MAX_SERIES}: choose fewer")
    x_column, y_column = columns.index(x_path), columns.index(chart.y)
    lines, empty = [], []
    for name, base, materials in groups:
        series_sweep = dataclasses.replace(sweep, base=base)
        rows = list(sweep_rows(series_sweep, CaseSizer(materials, chart.cores)))
        x = np.array([float(row[x_column]) for row in rows])
        y = np.array([math.nan if row[y_column] is None else float(row[y_column])
                      for row in rows])
        order = np.argsort(x, kind="stable")
        if np.all(np.isnan(y)):
            empty.append(name)
        else:
            lines.append(Line(name, x[order], y[order]))
    return x_path, lines, empty + skipped


def _y_text(column: str) -> tuple[str, float]:
    if column.startswith("dimensions."):
        return column.removeprefix("dimensions.").replace("_", " ") + " (mm)", 1e3
    return AXIS_TEXT[column], 1.0


def build(chart: SweepChart) -> Figure:
    """Draw the sweep chart (sizes every series first).

    Raises:
        InputError: see :func:`sweep_lines`; a log scale over values of zero or below (at
            ``x_scale`` or ``y_scale``).
    """
    x_path, lines, empty = sweep_lines(chart)
    words, unit, x_factor = INPUT_TEXT[x_path]
    y_text, y_factor = _y_text(chart.y)
    if chart.x_scale == "log" and any(np.any(line.x <= 0) for line in lines):
        raise InputError.single("x_scale", f"log: {x_path} takes values of zero or below")
    if chart.y_scale == "log" and any(np.any(line.y[~np.isnan(line.y)] <= 0)
                                      for line in lines):
        raise InputError.single("y_scale", f"log: {chart.y} has values of zero or below")
    remarks = [f"Each line is the best design of one {chart.series} at each {words}; a gap "
               "is a case it cannot meet."]
    if empty:
        remarks.append("No feasible design in any case: " + ", ".join(empty) + ".")
    figure = new_figure(chart.width, chart.height,
                        footnote(basis_words(chart.base.property_basis), remarks))
    axes = figure.add_subplot()
    log_axes(axes, chart.x_scale == "log", chart.y_scale == "log")
    axes.grid(True)
    for position, line in enumerate(lines):
        style = series_style(position)
        axes.plot(line.x * x_factor, line.y * y_factor, color=style.color,
                  marker=style.marker, linestyle=style.line_style, linewidth=1.4,
                  markersize=5, label=line.name)
    axes.set_xlabel(f"{words} ({unit})" if unit else words)
    axes.set_ylabel(y_text)
    title = chart.title or f"Best design by {chart.series}: {chart.y} against {words}"
    axes.set_title(title, loc="left")
    if lines:
        axes.legend(loc="best", handlelength=3.0)
    else:
        axes.text(0.5, 0.5, "No feasible design in any case.", ha="center", va="center",
                  transform=axes.transAxes)
    figure.set_label(f"{title}; {len(lines)} series")
    return figure
