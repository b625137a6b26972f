"""Drawing a solved cycle on a pressure-enthalpy chart, as SVG or PNG bytes.

The numbers come from :mod:`heatlift.diagram_data` in SI; they are written in the caller's
units through :func:`schemas.fields.current_units` (the boundary conversion) and drawn with
matplotlib's object-oriented API (a ``Figure`` per request, no pyplot; the only global touched
is the ``rc_context`` of one render, and the workers are single-threaded).

The picture: enthalpy across, absolute pressure up on a logarithmic axis; the saturation dome
in grey with its two-phase region lightly shaded; a few dashed grey isotherms, each labelled
on its level stretch inside the dome (or where it enters the chart); the cycle as one dark
path with arrowheads in the direction of flow and numbered states; on the right a table of
the numbered states (place, p, T, h), the performance and the caution. Equal requests give
byte-identical SVG (a fixed ``svg.hashsalt``, no date in the metadata).
"""

from __future__ import annotations

import io
import math
import textwrap
from collections.abc import Iterable, Sequence
from dataclasses import dataclass
from typing import Any

import matplotlib
import numpy as np
from flask import Response

matplotlib.use("Agg")  # no display: never pick an interactive backend

from matplotlib import rc_context  # noqa: E402
from matplotlib.axes import Axes  # noqa: E402
from matplotlib.backends.backend_agg import FigureCanvasAgg  # noqa: E402
from matplotlib.collections import LineCollection  # noqa: E402
from matplotlib.figure import Figure  # noqa: E402
from matplotlib.text import Text  # noqa: E402
from matplotlib.ticker import FuncFormatter, LogLocator, NullLocator  # noqa: E402
from PIL import Image  # noqa: E402
from PIL.PngImagePlugin import PngInfo  # noqa: E402

import heatlift  # noqa: E402
from heatlift.cycle.result import CycleResult  # noqa: E402
from heatlift.diagram_data import (  # noqa: E402
    ChartData,
    Isotherm,
    NumberedState,
    chart_data,
    temperature_floor,
)
from heatlift.properties import LIBRARY_VERSION  # noqa: E402
from schemas.cycle import CYCLE_CAUTION  # noqa: E402
from schemas.fields import current_units  # noqa: E402
from schemas.units import UnitContext  # noqa: E402

MEDIA_TYPES = {"svg": "image/svg+xml", "png": "image/png"}

INK = "#1b1f24"  # the cycle and the text
DOME = "#7d8590"
ISOTHERM = "#b4bac2"
ISOTHERM_TEXT = "#6b7280"
SHADE = "#f3f4f6"
MUTED = "#4b5563"
REMARK = "#9a3412"

_RC: dict[Any, Any] = {
    "svg.hashsalt": "heatlift-pressure-enthalpy",
    "svg.fonttype": "none",  # text stays text: searchable, small, readable by tests
    "font.family": "sans-serif",
    "font.sans-serif": ["DejaVu Sans", "Arial", "Helvetica"],
    "font.monospace": ["DejaVu Sans Mono", "Menlo", "Consolas"],
    "font.size": 9.0,
    "axes.edgecolor": "#6b7280",
    "axes.linewidth": 0.8,
    "xtick.color": "#374151",
    "ytick.color": "#374151",
    "path.simplify": False,
}
_CIRCUIT_WORDS = {
    "single_stage": "single-stage cycle",
    "economized": "economised cycle",
    "two_stage": "two-stage cycle",
    "transcritical": "transcritical cycle",
}
# how unit strings of the contract are written on a chart (names only, no conversion)
_UNIT_TEXT = {"degC": "°C", "degF": "°F", "delta_degF": "°F", "m^3/h": "m³/h",
              "ft^3/min": "ft³/min", "kg/m^3": "kg/m³", "1": ""}
# a logarithmic axis needs absolute pressures: a gauge output unit is drawn in its absolute twin
_ABSOLUTE = {"psig": "psi", "barg": "bar", "kpag": "kPa", "mpag": "MPa"}

# layout [fractions of the figure]
_AXES = (0.075, 0.085, 0.57, 0.80)
_PANEL_LEFT = 0.672
_PANEL_RIGHT = 0.985
_TOP = 0.885
_PT = 100.0 / 72.0  # px per pt at 100 dpi
_LINE = 1.2  # line pitch of DejaVu Sans [em] (its OS/2 ascender, descender and line gap)


@dataclass(frozen=True)
class ChartOptions:
    """``title`` (None: refrigerant and circuit), image ``width`` and ``height`` [px]."""

    title: str | None = None
    width: int = 1100
    height: int = 720


def media_type(fmt: str | None, accept: Iterable[tuple[str, float]] | None) -> str:
    """``svg`` or ``png``: the ``format`` query parameter if given, else PNG when the Accept
    header rates image/png above image/svg+xml, else SVG."""
    if fmt:
        return fmt
    quality = {"svg": 0.0, "png": 0.0}
    for mime, q in accept or ():
        for key, name in MEDIA_TYPES.items():
            if mime == name:
                quality[key] = max(quality[key], q)
    return "png" if quality["png"] > quality["svg"] else "svg"


# -- units ----------------------------------------------------------------------------------------


@dataclass(frozen=True)
class _Units:
    """The caller's units for the chart (pressure always absolute)."""

    ctx: UnitContext
    pressure: str

    @classmethod
    def current(cls) -> _Units:
        ctx = current_units()
        unit = ctx.output_unit("pressure")
        return cls(ctx, _ABSOLUTE.get(unit.lower(), unit))

    def h(self, value: float) -> float:
        return self.ctx.from_si(value, "specific_enthalpy")

    def p(self, value: float) -> float:
        return self.ctx.from_si(value, "pressure", self.pressure)

    def t(self, value: float) -> float:
        return self.ctx.from_si(value, "temperature")

    def xy(self, points: Sequence[tuple[float, float]]) -> list[tuple[float, float]]:
        return [(self.h(h), self.p(p)) for h, p in points]

    def unit(self, kind: str) -> str:
        unit = self.pressure if kind == "pressure" else self.ctx.output_unit(kind)
        return _UNIT_TEXT.get(unit, unit)

    def text(self, value: float, kind: str, digits: int = 4) -> str:
        unit = self.pressure if kind == "pressure" else self.ctx.output_unit(kind)
        number = self.ctx.from_si(value, kind, unit)
        return f"{_number(number, digits, kind)} {self.unit(kind)}".rstrip()


def _number(value: float, digits: int, kind: str = "") -> str:
    """``digits`` significant digits without exponent; temperatures with one decimal."""
    if not math.isfinite(value):
        return "–"
    if kind == "temperature":
        text = f"{value:.1f}"
    else:
        magnitude = math.floor(math.log10(abs(value))) if value else 0
        text = f"{value:.{max(0, digits - 1 - magnitude)}f}"
    return text.replace("-", "−")


def _place(label: str) -> str:
    return label.replace("_", " ")  # the place names of POST /v1/cycle, spaced


# -- default isotherms ----------------------------------------------------------------------------


def default_isotherms(result: CycleResult) -> list[float]:
    """Up to 6 round temperatures [K] in the caller's temperature unit between the cycle's
    coldest and hottest states: the multiples of the finest step of 5, 10, 20, 25, 40, 50,
    100 or 200 that gives at most 6."""
    units = _Units.current()
    temps = [units.t(p.state.temperature) for p in result.states]
    low, high = min(temps), max(temps)
    floor = units.t(temperature_floor(result.refrigerant))
    values: list[int] = []
    for step in (5, 10, 20, 25, 40, 50, 100, 200):
        values = [k * step for k in range(math.ceil(low / step), math.floor(high / step) + 1)]
        if len(values) <= 6:
            break
    unit = units.ctx.output_unit("temperature")
    return [units.ctx.to_si(float(v), unit, "temperature") for v in values if v > floor]


# -- the response ---------------------------------------------------------------------------------


def respond(result: CycleResult, args: dict[str, Any], fmt: str) -> Response:
    """The chart of ``result`` as an ``fmt`` (svg or png) response. ``args``: the loaded
    request (``isotherms`` [K] or None for :func:`default_isotherms`, ``title``, ``width``,
    ``height``). The cycle's remark codes go to the ``X-Heatlift-Warnings`` header."""
    temperatures = args.get("isotherms")
    if temperatures is None:
        temperatures = default_isotherms(result)
    options = ChartOptions(args.get("title"), args.get("width", 1100), args.get("height", 720))
    image = render(result, chart_data(result, temperatures), options, fmt)
    response = Response(image, mimetype=MEDIA_TYPES[fmt])
    response.headers["Vary"] = "Accept"
    if result.remarks:
        response.headers["X-Heatlift-Warnings"] = ", ".join(r.code for r in result.remarks)
    return response


# -- drawing --------------------------------------------------------------------------------------


def render(result: CycleResult, data: ChartData, options: ChartOptions, fmt: str) -> bytes:
    """The chart as ``svg`` or ``png`` bytes."""
    units = _Units.current()
    title = options.title or _default_title(result)
    with rc_context(_RC):
        fig = Figure(figsize=(options.width / 100, options.height / 100), dpi=100,
                     facecolor="white")
        ax = fig.add_axes(_AXES)
        _draw_chart(ax, data, units)
        fig.text(_AXES[0], 0.955, title, fontsize=13, fontweight="bold", color=INK,
                 va="center", gid="title")
        fig.text(_AXES[0], 0.918, "Pressure-enthalpy chart of the solved cycle", fontsize=9,
                 color=MUTED, va="center")
        _draw_panel(fig, result, data, units)
        buffer = io.BytesIO()
        creator = f"heatlift {heatlift.__version__}, {LIBRARY_VERSION}, matplotlib"
        if fmt == "png":
            _write_png(fig, buffer, {"Software": creator, "Title": title,
                                     "Description": CYCLE_CAUTION})
        else:
            fig.savefig(buffer, format="svg", facecolor="white",
                        metadata={"Date": None, "Creator": creator, "Title": title,
                                  "Description": CYCLE_CAUTION})
    return buffer.getvalue()


def _write_png(fig: Figure, buffer: io.BytesIO, text: dict[str, str]) -> None:
    """The figure as an RGB PNG (no alpha channel: the background is white), compressed at
    zlib level 3, which costs about half the time of the default level for a file a few per
    cent larger."""
    canvas = FigureCanvasAgg(fig)
    canvas.draw()
    image = Image.fromarray(np.asarray(canvas.buffer_rgba())).convert("RGB")
    info = PngInfo()
    for key, value in text.items():
        info.add_text(key, value)
    image.save(buffer, format="png", pnginfo=info, dpi=(100, 100), compress_level=3)


def _default_title(result: CycleResult) -> str:
    words = _CIRCUIT_WORDS.get(result.circuit, result.circuit.replace("_", " "))
    return f"{result.refrigerant}, {words}"


def _limits(data: ChartData, units: _Units) -> tuple[tuple[float, float], tuple[float, float]]:
    top = data.pressure_range[1]
    hs = [units.h(h) for h, p in (*data.bubble, *data.dew) if p <= top]
    for seg in data.segments:
        hs += [units.h(h) for h, _ in seg.points]
    h_low, h_high = min(hs), max(hs)
    span = h_high - h_low
    return ((h_low - 0.04 * span, h_high + 0.10 * span),
            (units.p(data.pressure_range[0]), units.p(top)))


def _draw_chart(ax: Axes, data: ChartData, units: _Units) -> None:
    (x0, x1), (y0, y1) = _limits(data, units)
    ax.set_yscale("log")
    ax.set_xlim(x0, x1)
    ax.set_ylim(y0, y1)
    ax.yaxis.set_major_locator(LogLocator(base=10.0, subs=(1.0, 2.0, 5.0)))
    ax.yaxis.set_minor_locator(NullLocator())
    ax.yaxis.set_major_formatter(FuncFormatter(lambda v, _: f"{v:g}"))
    ax.grid(True, which="major", color="#e5e7eb", linewidth=0.6)
    ax.set_axisbelow(True)
    ax.set_xlabel(f"Specific enthalpy h [{units.unit('specific_enthalpy')}]", fontsize=10)
    ax.set_ylabel(f"Absolute pressure p [{units.unit('pressure')}]", fontsize=10)
    for side in ("top", "right"):
        ax.spines[side].set_visible(False)

    bubble, dew = units.xy(data.bubble), units.xy(data.dew)
    if bubble and dew:
        outline = bubble + dew[::-1]
        ax.fill([x for x, _ in outline], [y for _, y in outline], color=SHADE, zorder=0.5,
                linewidth=0, gid="two-phase-region")
        ax.plot([x for x, _ in bubble], [y for _, y in bubble], color=DOME, linewidth=1.4,
                zorder=2, gid="saturation-bubble")
        ax.plot([x for x, _ in dew], [y for _, y in dew], color=DOME, linewidth=1.4,
                zorder=2, gid="saturation-dew")
    if data.critical_point is not None and bubble and dew:
        ax.plot([bubble[-1][0], dew[-1][0]], [bubble[-1][1], dew[-1][1]], color=DOME,
                linewidth=1.4, zorder=2)
        h_c, p_c = units.h(data.critical_point[0]), units.p(data.critical_pressure)
        ax.plot([h_c], [p_c], marker="o", markersize=3.5, color=DOME, zorder=2,
                gid="critical-point")
        if data.circuit == "transcritical":
            ax.axhline(p_c, color=DOME, linewidth=0.7, linestyle=(0, (4, 3)), zorder=1,
                       gid="critical-pressure")
            ax.text(x0 + 0.01 * (x1 - x0), p_c * 1.025, "critical pressure", fontsize=7.5,
                    color=ISOTHERM_TEXT, va="bottom")
    paths = [units.xy(seg.points) for seg in data.segments]
    if bubble and dew:
        _label_dome(ax, bubble, dew, _path_samples(ax, paths, 6.0))
    _draw_isotherms(ax, data.isotherms, units, bubble, dew, paths)
    _draw_cycle(ax, data, units, paths)


def _label_dome(ax: Axes, bubble: list[tuple[float, float]], dew: list[tuple[float, float]],
                busy: list[tuple[float, float]]) -> None:
    """'bubble line' left of the bubble curve and 'dew line' right of the dew curve, each at
    the height in the lower 60 % of the chart where its text is clearest of the cycle path
    (``busy``: path samples in display coordinates)."""
    box = _box(ax)
    style = {"fontsize": 7.5, "color": DOME, "va": "center", "style": "italic", "zorder": 2}
    samples = np.asarray(busy, dtype=float).reshape(-1, 2)
    for curve, text, side in ((bubble, "bubble line  ", -1.0), (dew, "  dew line", 1.0)):
        pix = np.asarray(_pixels(ax, curve), dtype=float).reshape(-1, 2)
        far = pix[:, 0] + side * 58.0
        height = (pix[:, 1] - box[1]) / (box[3] - box[1])
        usable = ((0.06 < height) & (height < 0.6) & (np.minimum(pix[:, 0], far) > box[0] + 2)
                  & (np.maximum(pix[:, 0], far) < box[2] - 2))
        if not usable.any():
            continue
        # distance from each path sample to the text's box (58 px long, 12 px high)
        x_lo, x_hi = np.minimum(pix[:, 0], far), np.maximum(pix[:, 0], far)
        if len(samples):
            bx, by = samples[None, :, 0], samples[None, :, 1]
            gap_x = np.maximum(np.maximum(x_lo[:, None] - bx, bx - x_hi[:, None]), 0.0)
            gap_y = np.maximum(np.abs(by - pix[:, 1][:, None]) - 6.0, 0.0)
            clear = np.sqrt(gap_x ** 2 + gap_y ** 2).min(axis=1)
        else:
            clear = np.full(len(pix), 99.0)
        score = np.where(usable, np.minimum(clear, 20.0) - 4.0 * height, -np.inf)
        x, y = curve[int(np.argmax(score))]
        ax.text(x, y, text, ha="right" if side < 0 else "left", **style)  # type: ignore[arg-type]


Box = tuple[float, float, float, float]  # left, bottom, right, top [px]


def _nearest(points: np.ndarray, obstacles: np.ndarray, default: float = 99.0) -> np.ndarray:
    """For each of ``points`` (n, 2) the distance to the nearest of ``obstacles`` (m, 2) [px]."""
    if len(obstacles) == 0:
        return np.full(len(points), default)
    diff = points[:, None, :] - obstacles[None, :, :]
    return np.sqrt((diff ** 2).sum(axis=2)).min(axis=1)


def _box(ax: Axes) -> Box:
    """The axes' frame in display coordinates."""
    (x0, y0), (x1, y1) = ax.transAxes.transform(((0.0, 0.0), (1.0, 1.0)))
    return float(x0), float(y0), float(x1), float(y1)


def _pixels(ax: Axes, points: Sequence[tuple[float, float]]) -> list[tuple[float, float]]:
    return [(float(x), float(y)) for x, y in ax.transData.transform(points)] if points else []


def _path_samples(ax: Axes, paths: Sequence[Sequence[tuple[float, float]]], every: float = 6.0
                  ) -> list[tuple[float, float]]:
    """Points every ``every`` px along the cycle path, in display coordinates."""
    out: list[tuple[float, float]] = []
    for path in paths:
        pts = _pixels(ax, path)
        for (ax0, ay0), (ax1, ay1) in zip(pts, pts[1:], strict=False):
            steps = max(1, int(math.dist((ax0, ay0), (ax1, ay1)) / every))
            out += [(ax0 + (ax1 - ax0) * k / steps, ay0 + (ay1 - ay0) * k / steps)
                    for k in range(steps + 1)]
    return out


def _draw_isotherms(ax: Axes, isotherms: Sequence[Isotherm], units: _Units,
                    bubble: list[tuple[float, float]], dew: list[tuple[float, float]],
                    paths: Sequence[Sequence[tuple[float, float]]]) -> None:
    lines = [units.xy(iso.points) for iso in isotherms]
    if not lines:
        return
    ax.add_collection(LineCollection(
        lines, colors=ISOTHERM, linewidths=0.8, linestyles=(0, (5, 3)), zorder=1.5,
        gid="isotherms"))
    busy = _path_samples(ax, paths, 8.0)
    box = _box(ax)
    taken: list[tuple[float, float]] = []
    for iso, line in zip(isotherms, lines, strict=True):
        spot = _two_phase_spot(ax, iso, line, units, busy, box) or _entry_spot(ax, line, box)
        if spot is None:
            continue
        x, y, ha, va = spot
        px, py = _pixels(ax, [(x, y)])[0]
        if any(abs(px - a) < 40 and abs(py - b) < 11 for a, b in taken):
            continue
        taken.append((px, py))
        text = f"{units.t(iso.temperature):.4g} {units.unit('temperature')}".replace("-", "−")
        ax.text(x, y, text, fontsize=7.5, color=ISOTHERM_TEXT, ha=ha, va=va, zorder=1.6,
                gid=f"isotherm-label-{len(taken)}",
                bbox={"boxstyle": "round,pad=0.12", "facecolor": SHADE if ha == va
                      else "white", "edgecolor": "none"})


def _two_phase_spot(ax: Axes, iso: Isotherm, line: list[tuple[float, float]], units: _Units,
                    busy: list[tuple[float, float]],
                    box: Box
                    ) -> tuple[float, float, str, str] | None:
    """On the isotherm's stretch inside the dome (from its dew to its bubble point): the spot
    farthest from the cycle path, when it is at least 12 px clear of it."""
    if iso.two_phase is None:
        return None
    first, last = iso.two_phase
    stretch = _pixels(ax, line[first:last + 1])
    lengths = [math.dist(a, b) for a, b in zip(stretch, stretch[1:], strict=False)]
    total = sum(lengths)
    if total < 60.0:
        return None
    spots: list[tuple[float, float]] = []
    for f in (0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8):
        run, goal = 0.0, f * total
        for (pa, pb), length in zip(zip(stretch, stretch[1:], strict=False), lengths,
                                    strict=True):
            if run + length >= goal and length > 0:
                t = (goal - run) / length
                px, py = pa[0] + t * (pb[0] - pa[0]), pa[1] + t * (pb[1] - pa[1])
                if box[0] + 25 < px < box[2] - 25 and box[1] + 8 < py < box[3] - 8:
                    spots.append((px, py))
                break
            run += length
    if not spots:
        return None
    clear = _nearest(np.asarray(spots), np.asarray(busy, dtype=float).reshape(-1, 2))
    best = int(np.argmax(clear))
    if clear[best] < 12.0:
        return None
    x, y = ax.transData.inverted().transform(spots[best])
    return float(x), float(y), "center", "center"


def _entry_spot(ax: Axes, line: list[tuple[float, float]],
                box: Box
                ) -> tuple[float, float, str, str] | None:
    """Where the isotherm, followed from its low-pressure end, comes into the chart: at the
    bottom edge or the right edge (inset a little)."""
    left, bottom = box[0], box[1] + 10.0
    right, top = box[2] - 4.0, box[3] - 8.0
    inverse = ax.transData.inverted()
    previous = None
    for (px, py) in _pixels(ax, line):
        if left <= px <= right and bottom <= py <= top:
            if previous is None:
                x, y = inverse.transform((px, py))
                return float(x), float(y), "center", "bottom"
            qx, qy = previous
            if qx > right and px != qx:  # came in through the right edge
                ey = qy + (py - qy) * (right - qx) / (px - qx)
                x, y = inverse.transform((right, ey))
                return float(x), float(y), "right", "center"
            t = (bottom - qy) / (py - qy) if py != qy else 0.0
            x, y = inverse.transform((qx + t * (px - qx), bottom))
            return float(x), float(y), "center", "bottom"
        previous = (px, py)
    return None


def _draw_cycle(ax: Axes, data: ChartData, units: _Units,
                paths: Sequence[Sequence[tuple[float, float]]]) -> None:
    ax.add_collection(LineCollection(
        paths, colors=INK, linewidths=1.9, zorder=4, capstyle="round", joinstyle="round",
        gid="cycle-path"))
    for path in paths:
        _arrow(ax, path)
    xy = [(units.h(s.state.enthalpy), units.p(s.state.pressure)) for s in data.states]
    ax.scatter([x for x, _ in xy], [y for _, y in xy], s=26, facecolor="white", edgecolor=INK,
               linewidths=1.3, zorder=5, gid="cycle-states")
    offsets = _place_numbers(ax, data.states, xy, paths)
    for state, point, offset in zip(data.states, xy, offsets, strict=True):
        ax.annotate(str(state.number), point, xytext=offset, textcoords="offset points",
                    ha="center", va="center", fontsize=10, fontweight="bold", color=INK,
                    zorder=6, gid=f"state-{state.number}")


def _arrow(ax: Axes, path: Sequence[tuple[float, float]]) -> None:
    """A small arrowhead halfway along a path (by its length on screen), pointing downstream."""
    pixels = _pixels(ax, path)
    lengths = [math.dist(a, b) for a, b in zip(pixels, pixels[1:], strict=False)]
    total = sum(lengths)
    if total < 45.0:
        return
    run = 0.0
    for i, length in enumerate(lengths):
        if run + length >= total / 2 and length > 0:
            t = (total / 2 - run) / length
            (xa, ya), (xb, yb) = pixels[i], pixels[i + 1]
            ux, uy = (xb - xa) / length, (yb - ya) / length
            mx, my = xa + t * (xb - xa), ya + t * (yb - ya)
            inverse = ax.transData.inverted()
            start = inverse.transform((mx - 4 * ux, my - 4 * uy))
            end = inverse.transform((mx + 4 * ux, my + 4 * uy))
            ax.annotate("", xy=(float(end[0]), float(end[1])),
                        xytext=(float(start[0]), float(start[1])), zorder=4.5,
                        arrowprops={"arrowstyle": "-|>,head_length=0.55,head_width=0.28",
                                    "color": INK, "linewidth": 0, "shrinkA": 0,
                                    "shrinkB": 0})
            return
        run += length


# candidate offsets [pt] of a state number from its marker: 12 directions, two distances
_OFFSETS = np.array([(r * math.cos(math.radians(a)), r * math.sin(math.radians(a)))
                     for r in (11.0, 17.0) for a in range(0, 360, 30)])


def _place_numbers(ax: Axes, states: Sequence[NumberedState], xy: Sequence[tuple[float, float]],
                   paths: Sequence[Sequence[tuple[float, float]]]) -> list[tuple[float, float]]:
    """Offsets [pt] of each state number from its marker: away from the middle of the cycle,
    clear of the path, the markers and the numbers placed before (greedy, in number order)."""
    px = _pixels(ax, xy)
    cx = sum(p[0] for p in px) / len(px)
    cy = sum(p[1] for p in px) / len(px)
    obstacles = np.asarray(_path_samples(ax, paths) + px, dtype=float)
    box = _box(ax)
    taken: list[tuple[float, float]] = []
    out: list[tuple[float, float]] = []
    for x, y in px:
        away = np.array([x - cx, y - cy]) / (math.hypot(x - cx, y - cy) or 1.0)
        centre = np.array([x, y])
        offsets = _OFFSETS * _PT  # [px]
        spots = centre + offsets
        clear = _nearest(spots, obstacles)
        crowd = _nearest(spots, np.asarray(taken, dtype=float).reshape(-1, 2))
        inside = ((spots[:, 0] > box[0] + 8) & (spots[:, 0] < box[2] - 8)
                  & (spots[:, 1] > box[1] + 8) & (spots[:, 1] < box[3] - 8))
        radius = np.hypot(_OFFSETS[:, 0], _OFFSETS[:, 1])
        score = (np.minimum(clear, 14.0) + 1.2 * np.minimum(crowd, 22.0)
                 + 3.0 * (_OFFSETS @ away) / radius - 0.15 * radius
                 - np.where(inside, 0.0, 40.0))
        best = int(np.argmax(score))
        taken.append((float(spots[best, 0]), float(spots[best, 1])))
        out.append((float(_OFFSETS[best, 0]), float(_OFFSETS[best, 1])))
    return out


# -- the panel on the right -----------------------------------------------------------------------


def _draw_panel(fig: Figure, result: CycleResult, data: ChartData, units: _Units) -> None:
    """The numbered states (place, p, T, h), the performance, remarks, provenance, caution.

    Each table is one monospaced text (columns by character: exact alignment, and few text
    objects keep the render fast), its size chosen so that the widest line fits the panel."""
    left, right = _PANEL_LEFT, _PANEL_RIGHT
    width_pt = (right - left) * fig.get_figwidth() * 72
    states, performance = _state_rows(data, units), _performance_rows(result, units)
    widest = max(len(line) for line in (*states, *performance))
    size = min(8.0, width_pt / (widest * _MONO_ADVANCE))
    mono = {"fontsize": size, "family": "monospace", "va": "top", "color": INK}
    renderer = FigureCanvasAgg(fig).get_renderer()

    def below(text: Text, gap: float) -> float:
        """The figure fraction ``gap`` lines under ``text``."""
        bottom = text.get_window_extent(renderer).y0 / fig.bbox.height
        return float(bottom) - gap * _LINE * size / (fig.get_figheight() * 72)

    heading = fig.text(left, _TOP, "States", fontsize=10, fontweight="bold", color=INK,
                       va="top")
    table = fig.text(left, below(heading, 0.6), "\n".join(states), gid="state-table",
                     **mono)  # type: ignore[arg-type]
    heading = fig.text(left, below(table, 1.2), "Performance", fontsize=10, fontweight="bold",
                       color=INK, va="top")
    block = fig.text(left, below(heading, 0.6), "\n".join(performance), gid="performance",
                     **mono)  # type: ignore[arg-type]
    chars = int(width_pt / (7.5 * 0.55))
    if result.remarks:
        text = ("Check: " + "; ".join(r.code.replace("_", " ") for r in result.remarks)
                + " (POST /v1/cycle explains in meta.warnings)")
        fig.text(left, below(block, 0.9), "\n".join(textwrap.wrap(text, chars)), fontsize=7.5,
                 color=REMARK, va="top")
    foot = [f"heatlift {heatlift.__version__} · {LIBRARY_VERSION}",
            *textwrap.wrap(CYCLE_CAUTION, chars + 6)]
    fig.text(left, _AXES[1], "\n".join(foot), fontsize=7, color=MUTED, va="bottom",
             gid="caution")


# advance of a DejaVu Sans Mono character [em], 0.602, plus room for the rounding of advances
# to whole pixels when the PNG is hinted
_MONO_ADVANCE = 0.65
_PLACE_CHARS = 22


def _state_rows(data: ChartData, units: _Units) -> list[str]:
    """``no. place  p  T  h`` in fixed columns; a state's further names on the lines below."""
    heads = ("place", "p", "T", "h")
    unit_row = ("", f"[{units.unit('pressure')}]", f"[{units.unit('temperature')}]",
                f"[{units.unit('specific_enthalpy')}]")
    body: list[tuple[str, str, str, str, str]] = []
    for state in data.states:
        s = state.state
        lines: list[str] = []
        for label in state.labels:
            lines += textwrap.wrap(_place(label), _PLACE_CHARS)
        body.append((str(state.number), lines[0], _number(units.p(s.pressure), 4),
                     _number(units.t(s.temperature), 4, "temperature"),
                     _number(units.h(s.enthalpy), 4)))
        body += [("", line, "", "", "") for line in lines[1:]]
    place = max(len(heads[0]), *(len(row[1]) for row in body))
    widths = [2 + max(len(unit_row[k]), *(len(row[k + 1]) for row in body)) for k in (1, 2, 3)]
    rows = [f"{'':3}{head[0]:<{place}}" + "".join(
        f"{text:>{w}}" for text, w in zip(head[1:], widths, strict=True))
        for head in (heads, unit_row)]
    for number, name, *values in body:
        rows.append(f"{number:>2} {name:<{place}}" + "".join(
            f"{value:>{w}}" for value, w in zip(values, widths, strict=True)))
    return rows


def _performance_rows(result: CycleResult, units: _Units) -> list[str]:
    perf = result.performance
    rows = [
        ("cooling capacity", units.text(perf.cooling_capacity, "power")),
        ("compressor power", units.text(perf.compressor_power, "power")),
        ("COP (cooling)", _number(perf.cop, 3)),
        ("evaporator mass flow", units.text(perf.mass_flow, "mass_flow")),
        ("pressure ratio", _number(perf.pressure_ratio, 3)),
        ("discharge temperature", units.text(perf.discharge_temperature, "temperature")),
    ]
    if perf.intermediate_pressure is not None:
        rows.insert(5, ("intermediate pressure",
                        units.text(perf.intermediate_pressure, "pressure")))
    name = max(len(n) for n, _ in rows) + 2
    value = max(len(v) for _, v in rows)
    return [f"{'':3}{n:<{name}}{v:>{value}}" for n, v in rows]
