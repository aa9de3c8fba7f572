"""The look every chart shares, and turning a figure into SVG or PNG bytes.

Every chart is a :class:`matplotlib.figure.Figure` built without pyplot (no global figure
state, safe in a threaded server) and written by :func:`draw` under :data:`RC`:

- SVG text stays text (``svg.fonttype = "none"``): searchable, copyable, read by screen readers;
- byte-stable output: a fixed ``svg.hashsalt`` (the ids matplotlib derives for clip paths and
  markers), no date, creator or software entries in the file's metadata;
- one sans-serif font that ships with matplotlib, so label sizes measured here are the same on
  every machine.
"""

from __future__ import annotations

import io
import math
import textwrap
import threading
import warnings
from collections.abc import Callable, Sequence
from dataclasses import dataclass

import matplotlib
from matplotlib.axes import Axes
from matplotlib.backends.backend_agg import FigureCanvasAgg
from matplotlib.figure import Figure
from matplotlib.ticker import FuncFormatter, LogLocator, NullFormatter

SVG = "image/svg+xml"
PNG = "image/png"
FORMATS = {"svg": SVG, "png": PNG}
"""Format name (a request's ``format`` field) -> media type."""

DPI = 100
"""Pixels per inch of PNG output: a chart of width x height pixels is width/100 x height/100
inches."""

RC = {
    "svg.fonttype": "none",
    "svg.hashsalt": "formwise",
    "font.family": "DejaVu Sans",
    "font.size": 9.0,
    "axes.titlesize": 10.0,
    "axes.labelsize": 9.0,
    "legend.fontsize": 8.0,
    "xtick.labelsize": 8.0,
    "ytick.labelsize": 8.0,
    "axes.edgecolor": "#444444",
    "axes.linewidth": 0.8,
    "grid.color": "#d9d9d9",
    "grid.linewidth": 0.5,
    "axes.axisbelow": True,
    "legend.frameon": True,
    "legend.framealpha": 0.92,
    "legend.edgecolor": "#bbbbbb",
    "path.simplify": False,
}
"""rcParams in force while a chart is drawn and written."""

PALETTE = (
    "#0072B2",  # blue
    "#D55E00",  # vermilion
    "#009E73",  # bluish green
    "#CC79A7",  # reddish purple
    "#E69F00",  # orange
    "#56B4E9",  # sky blue
    "#000000",  # black
)
"""Series colours: the colour-blind-safe set of Okabe and Ito, "Color Universal Design"
(J*Fly, 2008), without its yellow (too faint on white), in an order of our own that puts the
most distinct hues first."""

MARKERS = ("o", "s", "^", "D", "v", "P", "X")
LINE_STYLES = ("-", "--", ":", "-.", (0, (6, 2, 1, 2, 1, 2)), (0, (1, 1)), (0, (9, 3)))

MAX_SERIES = len(PALETTE)
"""More series than colours would repeat a style; such requests are refused (422)."""

FADED = "#c4c4c4"
INK = "#222222"

CHART_CAUTION = (
    "Preliminary sizing only: final members, connections and load cases must be checked "
    "against the applicable local design code by a qualified engineer."
)
"""The caution every chart prints in its footnote (the full text travels in the response's
Formwise-Caution header)."""

BASIS_WORDS = {
    "typical": "typical property values",
    "conservative": "conservative values (low stiffness and strength, high density)",
    "design": "design values (low strength, typical stiffness and density)",
}


@dataclass(frozen=True)
class SeriesStyle:
    """How one series is drawn: colour, marker and line style all differ between series, so
    a grey-scale print still tells them apart."""

    color: str
    marker: str
    line_style: object


def series_style(position: int) -> SeriesStyle:
    """The style of the series at ``position`` (0-based, < :data:`MAX_SERIES`)."""
    return SeriesStyle(PALETTE[position], MARKERS[position], LINE_STYLES[position])


def basis_words(basis: str) -> str:
    return BASIS_WORDS.get(basis, f"{basis} property values")


FOOTNOTE_SIZE = 7.0
_CHARACTER_WIDTH = 0.56
"""Mean width of a DejaVu Sans character in ems, to wrap the footnote to the figure."""


def new_figure(width: int, height: int, footnote: str) -> Figure:
    """A blank figure of ``width`` x ``height`` pixels with ``footnote`` wrapped along its
    bottom edge; the constrained layout keeps the axes clear of it."""
    figure = Figure(figsize=(width / DPI, height / DPI), dpi=DPI, layout="constrained")
    FigureCanvasAgg(figure)
    points_per_line = FOOTNOTE_SIZE * _CHARACTER_WIDTH
    columns = max(30, int((width / DPI * 72 - 12) / points_per_line))
    lines = textwrap.wrap(footnote, columns)
    figure.text(0.012, 0.008, "\n".join(lines), fontsize=FOOTNOTE_SIZE, color="#555555",
                ha="left", va="bottom", gid="footnote")
    reserved = (len(lines) * FOOTNOTE_SIZE * 1.25 + 8) / (height / DPI * 72)
    figure.get_layout_engine().set(rect=(0.0, reserved, 1.0, 1.0 - reserved))
    return figure


def footnote(basis_text: str, extra: Sequence[str] = ()) -> str:
    """The footnote: data basis, any remarks, then the caution."""
    return " ".join([f"Data basis: {basis_text}.", *extra, CHART_CAUTION])


def freeze_layout(figure: Figure) -> None:
    """Run the layout once and keep it, so that text placed afterwards is measured where it
    will be drawn (see :mod:`service.charts.labels`)."""
    figure.canvas.draw()
    figure.set_layout_engine("none")


_LOCK = threading.RLock()
"""rcParams are process-wide: one chart at a time is built and written under them."""


def draw(build: Callable[..., Figure], media_type: str, *args: object) -> bytes:
    """Build a figure with ``build(*args)`` and write it as SVG or PNG bytes.

    The same arguments always give the same bytes. The figure's label (``set_label``) becomes
    the file's title: the SVG ``<title>`` element, which screen readers announce, and the PNG
    ``Title`` text chunk.
    """
    with _LOCK, matplotlib.rc_context(RC), warnings.catch_warnings():
        # a character the font lacks (a client's title, say) is drawn as the font's box, and
        # kept as text in SVG: not an error
        warnings.filterwarnings("ignore", message=r"Glyph \d+ .* missing from font",
                                category=UserWarning)
        figure = build(*args)
        buffer = io.BytesIO()
        title = figure.get_label() or "Formwise chart"
        if media_type == SVG:
            metadata = {"Title": title, "Date": None, "Creator": None, "Format": None,
                        "Type": None}
            figure.savefig(buffer, format="svg", metadata=metadata)
        else:
            figure.savefig(buffer, format="png", dpi=DPI,
                           metadata={"Title": title, "Software": None})
        return buffer.getvalue()


_SUPERSCRIPT = str.maketrans("-0123456789", "\u207b\u2070\u00b9\u00b2\u00b3\u2074\u2075"
                             "\u2076\u2077\u2078\u2079")


def log_tick_text(value: float, _position: object = None) -> str:
    """A log-axis tick as plain text (no mathtext, so SVG keeps one text node per tick):
    ``0.01`` ... ``10000`` as decimals, otherwise ``10`` with a superscript exponent."""
    if value <= 0 or not math.isfinite(value):
        return ""
    exponent = math.log10(value)
    if abs(exponent - round(exponent)) > 1e-9:
        return ""
    exponent = round(exponent)
    if -2 <= exponent <= 4:
        return f"{value:.{max(0, -exponent)}f}"
    return "10" + str(exponent).translate(_SUPERSCRIPT)


def log_axes(axes: Axes, x: bool = True, y: bool = True) -> None:
    """Log scale with plain-text decade labels on the chosen axes."""
    for enabled, axis, setter in ((x, axes.xaxis, axes.set_xscale),
                                  (y, axes.yaxis, axes.set_yscale)):
        if not enabled:
            continue
        setter("log")
        axis.set_major_locator(LogLocator(base=10.0, numticks=12))
        axis.set_major_formatter(FuncFormatter(log_tick_text))
        axis.set_minor_formatter(NullFormatter())
