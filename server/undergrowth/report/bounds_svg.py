"""The primal bound, dual bound and gap of a run against nodes, as inline SVG.

The series come from `analysis.series.bound_series`, already reduced to a few
points per pixel (each bucket's lowest and highest point, so no extreme is lost);
here they are only scaled and drawn as step lines, with the same colours as the
web chart: the best solution (primal) in bluish green, the best bound (dual) in
blue, the gap dotted grey in a panel of its own, and a star where an incumbent
was found.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from typing import TYPE_CHECKING
from xml.sax.saxutils import escape

import numpy as np

from .palette import DUAL_COLOUR, GAP_COLOUR, INCUMBENT_COLOUR

if TYPE_CHECKING:
    from ..analysis.series import BoundSeries, Series

__all__ = ["bounds_svg", "nice_ticks"]

PLOT_BACKGROUND = "#fbfbf8"
GRID = "#ecebe4"
TEXT = "#1b1f24"
MUTED = "#5b6169"
MAX_STARS = 300  # incumbent stars with their own hover title


def _n(v: float) -> str:
    s = f"{v:.1f}"
    if s.endswith(".0"):
        s = s[:-2]
    return "0" if s == "-0" else s


def nice_ticks(lo: float, hi: float, count: int = 6, *, min_step: float = 0.0) -> list[float]:
    """Round tick values (1, 2 or 5 times a power of ten apart, at least ``min_step``)
    covering [lo, hi]."""
    if not (math.isfinite(lo) and math.isfinite(hi)):
        return []
    if hi <= lo:
        return [lo]
    raw = max((hi - lo) / max(count - 1, 1), min_step)
    power = 10.0 ** math.floor(math.log10(raw))
    step = next(m * power for m in (1, 2, 5, 10) if m * power >= raw * (1 - 1e-9))
    first = math.ceil(lo / step - 1e-9) * step
    ticks = []
    k = 0
    while first + k * step <= hi + step * 1e-9:
        t = first + k * step
        ticks.append(0.0 if abs(t) < step * 1e-9 else t)
        k += 1
    return ticks


def _count(v: float) -> str:
    return f"{v:,.0f}" if abs(v) >= 1 or v == 0 else f"{v:.2g}"


def _star(x: float, y: float, r: float) -> str:
    pts = []
    for k in range(10):
        rr = r if k % 2 == 0 else r * 0.45
        a = -math.pi / 2 + k * math.pi / 5
        pts.append(f"{_n(x + rr * math.cos(a))} {_n(y + rr * math.sin(a))}")
    return "M" + "L".join(pts) + "Z"


def _steps(s: Series, fx: Callable[[float], float], fy: Callable[[float], float]) -> str:
    """A step line (each value holds until the next x) as a path ``d``."""
    if not len(s):
        return ""
    xs, ys = s.x.tolist(), s.y.tolist()
    d = [f"M{_n(fx(xs[0]))} {_n(fy(ys[0]))}"]
    for x, y in zip(xs[1:], ys[1:], strict=True):
        d.append(f"H{_n(fx(x))}V{_n(fy(y))}")
    return "".join(d)


def bounds_svg(series: BoundSeries, *, sense: str, value: Callable[[float], str],
               id_prefix: str = "bounds", width: int = 1160) -> str:
    """Two stacked panels: objective values (primal and dual) and the relative gap,
    both against the number of nodes processed."""
    left, right, top = 84, 24, 34
    main_h, gap_h, between, bottom = 250, 96, 34, 44
    pw = width - left - right
    height = top + main_h + between + gap_h + bottom
    gap_top = top + main_h + between
    values = np.r_[series.primal.y, series.dual.y]
    values = values[np.isfinite(values)]
    xs = np.r_[series.primal.x, series.dual.x, series.gap.x]
    x_hi = float(xs.max()) if len(xs) else 1.0
    x_lo = 0.0
    x_hi = max(x_hi, 1.0)
    out = [f'<svg class="bounds-chart" viewBox="0 0 {width} {height}" width="{width}" '
           f'height="{height}" role="img" aria-labelledby="{id_prefix}-title {id_prefix}-desc" '
           f'font-size="11" fill="{TEXT}">',
           f'<title id="{id_prefix}-title">Best solution, best bound and gap against nodes'
           "</title>"]
    if not len(values):
        out.append(f'<desc id="{id_prefix}-desc">No bounds were recorded in this run.</desc>'
                   f'<text x="{left}" y="{top + 20}">No bounds were recorded in this run.'
                   "</text></svg>")
        return "\n".join(out)
    y_lo, y_hi = float(values.min()), float(values.max())
    pad = (y_hi - y_lo) * 0.06 or max(abs(y_hi) * 0.05, 1.0)
    y_lo, y_hi = y_lo - pad, y_hi + pad

    def fx(x: float) -> float:
        return left + pw * (x - x_lo) / (x_hi - x_lo)

    def fy(y: float) -> float:
        return top + main_h * (1.0 - (y - y_lo) / (y_hi - y_lo))

    gaps = series.gap.y[np.isfinite(series.gap.y)]
    top_gap = float(gaps.max()) if len(gaps) else 0.0
    g_hi = (top_gap if top_gap > 0 else 0.01) * 1.08  # no gap at all: a 0 to 1% panel

    def fg(g: float) -> float:
        return gap_top + gap_h * (1.0 - min(g, g_hi) / g_hi)

    final = [f"{k} {value(float(s.y[-1]))}" for k, s in (("best solution", series.primal),
                                                         ("best bound", series.dual)) if len(s)]
    out.append(f'<desc id="{id_prefix}-desc">Over {_count(x_hi)} nodes processed; at the end: '
               f"{', '.join(final) or 'no values'}; {len(series.incumbents.objective)} "
               "incumbents found.</desc>")
    out.append(f'<rect x="0" y="0" width="{width}" height="{height}" fill="#ffffff"/>')
    for y0, h in ((top, main_h), (gap_top, gap_h)):
        out.append(f'<rect x="{left}" y="{y0}" width="{pw}" height="{h}" '
                   f'fill="{PLOT_BACKGROUND}"/>')
    # grid and tick labels
    grid: list[str] = []
    labels: list[str] = []
    for t in nice_ticks(x_lo, x_hi, 8, min_step=1.0):  # node counts are whole
        x = fx(t)
        for y0, h in ((top, main_h), (gap_top, gap_h)):
            grid.append(f"M{_n(x)} {y0}V{y0 + h}")
        labels.append(f'<text x="{_n(x)}" y="{gap_top + gap_h + 15}" text-anchor="middle">'
                      f"{_count(t)}</text>")
    for t in nice_ticks(y_lo, y_hi, 6):
        y = fy(t)
        grid.append(f"M{left} {_n(y)}H{left + pw}")
        labels.append(f'<text x="{left - 6}" y="{_n(y + 4)}" text-anchor="end">'
                      f"{escape(value(t))}</text>")
    for t in nice_ticks(0.0, g_hi, 3):
        y = fg(t)
        grid.append(f"M{left} {_n(y)}H{left + pw}")
        labels.append(f'<text x="{left - 6}" y="{_n(y + 4)}" text-anchor="end">'
                      f"{_percent(t)}</text>")
    out.append(f'<path d="{"".join(grid)}" stroke="{GRID}" stroke-width="1" fill="none"/>')
    out.append(f'<g class="ticks" fill="{MUTED}">{"".join(labels)}</g>')
    out.append(f'<text x="{left + pw / 2:.1f}" y="{height - 10}" text-anchor="middle" '
               f'fill="{MUTED}">nodes processed</text>')
    mid = top + main_h / 2
    out.append(f'<text x="14" y="{mid:.1f}" text-anchor="middle" fill="{MUTED}" '
               f'transform="rotate(-90 14 {mid:.1f})">objective ({escape(sense)})</text>')
    gmid = gap_top + gap_h / 2
    out.append(f'<text x="14" y="{gmid:.1f}" text-anchor="middle" fill="{MUTED}" '
               f'transform="rotate(-90 14 {gmid:.1f})">gap</text>')
    # the lines
    dual_d = _steps(series.dual, fx, fy)
    primal_d = _steps(series.primal, fx, fy)
    gap_d = _steps(series.gap, fx, fg)
    if dual_d:
        out.append(f'<path class="line dual" d="{dual_d}" fill="none" stroke="{DUAL_COLOUR}" '
                   'stroke-width="2"><title>best bound (dual)</title></path>')
    if primal_d:
        out.append(f'<path class="line primal" d="{primal_d}" fill="none" '
                   f'stroke="{INCUMBENT_COLOUR}" stroke-width="2">'
                   "<title>best solution (primal)</title></path>")
    if gap_d:
        out.append(f'<path class="line gap" d="{gap_d}" fill="none" stroke="{GAP_COLOUR}" '
                   'stroke-width="1.5" stroke-dasharray="2 3"><title>relative gap</title></path>')
    inc = series.incumbents
    for order, obj, node, src in list(zip(inc.order.tolist(), inc.objective.tolist(),
                                          inc.node.tolist(), inc.source, strict=True))[:MAX_STARS]:
        x = float(order + 1) if order >= 0 else 0.0
        where = f"node {node}" if node >= 0 else "before the search"
        out.append(f'<path class="star" d="{_star(fx(x), fy(obj), 6.5)}" '
                   f'fill="{INCUMBENT_COLOUR}" stroke="#ffffff" stroke-width="1"><title>'
                   f"incumbent {escape(value(obj))} at {where} (from {escape(src)})"
                   "</title></path>")
    # legend, top left, above the plot
    lx, ly = left, 16
    items = [("line", INCUMBENT_COLOUR, "", "best solution (primal)"),
             ("line", DUAL_COLOUR, "", "best bound (dual)"),
             ("star", INCUMBENT_COLOUR, "", "new incumbent"),
             ("line", GAP_COLOUR, "2 3", "gap (lower panel)")]
    legend = []
    for kind, colour, dash, text in items:
        if kind == "line":
            dash_attr = f' stroke-dasharray="{dash}"' if dash else ""
            legend.append(f'<path d="M{lx} {ly - 4}h22" stroke="{colour}" stroke-width="2"'
                          f"{dash_attr}/>")
        else:
            legend.append(f'<path d="{_star(lx + 11, ly - 4, 6)}" fill="{colour}"/>')
        legend.append(f'<text x="{lx + 28}" y="{ly}">{text}</text>')
        lx += 40 + 6.2 * len(text)
    out.append('<g class="legend">' + "".join(legend) + "</g>")
    out.append("</svg>")
    return "\n".join(out)


def _percent(g: float) -> str:
    p = g * 100
    if p == 0:
        return "0%"
    if p < 1:
        return f"{p:.2g}%"
    return f"{p:.3g}%"
