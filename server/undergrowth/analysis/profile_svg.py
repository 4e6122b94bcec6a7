"""Draw a performance profile (Dolan & Moré, Mathematical Programming 91, 2002) as a
standalone SVG image, with a renderer of our own (no plotting dependency).

Input is the dict from `compare.performance_profile`. The x axis is τ on a log₂
scale from 1 to just past the largest finite ratio; the y axis is ρ(τ), the share of
problems a solver finished within a factor τ of the best. Each solver is one
``<polyline class="curve">`` (a step function), told apart by an Okabe–Ito colour
*and* a dash pattern, so the plot survives colour-blindness and grey printing.
"""

from __future__ import annotations

import math
import os
from collections.abc import Mapping
from typing import Any
from xml.sax.saxutils import escape, quoteattr

__all__ = ["profile_svg", "write_profile_svg"]

# Okabe & Ito's colour-blind-safe palette, yellow last (weak on white).
PALETTE = ("#0072B2", "#D55E00", "#009E73", "#CC79A7", "#E69F00", "#56B4E9", "#000000",
           "#F0E442")
DASHES = ("", "7 3", "2 3", "9 3 2 3", "4 4", "1 2")

_MEASURE_WORDS = {"nodes": "nodes", "seconds": "time", "lp_iterations": "LP iterations"}


def _fmt(x: float) -> str:
    return f"{x:.2f}".rstrip("0").rstrip(".")


def _ticks(hi: float, pixels: float) -> list[float]:
    """τ values for the x ticks: powers of two up to 2^hi, plus round values in between
    when the axis spans less than three doublings; at least 30 px apart."""
    top = int(math.floor(hi + 1e-9))
    candidates = {2.0 ** k for k in range(0, top + 1)}
    if top < 3:
        candidates |= {1.25, 1.5, 1.75, 2.5, 3.0, 3.5, 5.0, 6.0, 7.0}
    kept: list[float] = []
    for tau in sorted(t for t in candidates if math.log2(t) <= hi + 1e-9):
        if not kept or pixels * (math.log2(tau) - math.log2(kept[-1])) / hi >= 30:
            kept.append(tau)
    return kept


def profile_svg(profile: Mapping[str, Any], *, title: str | None = None,
                width: int = 680, height: int = 400) -> str:
    """The SVG document (a string) for one performance profile."""
    curves = list(profile["curves"])
    n_problems = len(profile["problems"])
    measure = str(profile["measure"])
    title = title or (f"Performance profile by {_MEASURE_WORDS.get(measure, measure)} "
                      f"({n_problems} problem{'s' if n_problems != 1 else ''})")
    left, right, top, bottom = 64, 230, 44, 58
    height = max(height, top + 52 + 32 * len(curves))  # room for every legend entry
    pw, ph = width - left - right, height - top - bottom
    # x in log2(τ); pad a little past the largest ratio so its step is visible.
    hi = max(1.0, math.log2(max(float(profile["tau_max"]), 1.0)) * 1.08)

    def px(tau: float) -> float:
        return left + pw * min(math.log2(max(tau, 1.0)), hi) / hi

    def py(share: float) -> float:
        # a few pixels of air above ρ = 1 so a curve there does not hide in the frame
        return top + 6 + (ph - 6) * (1.0 - share)

    out: list[str] = [
        f'<svg xmlns="http://www.w3.org/2000/svg" width="{width}" height="{height}" '
        f'viewBox="0 0 {width} {height}" font-family="sans-serif" font-size="12">',
        f"<title>{escape(title)}</title>",
        "<desc>Share of problems (y) each solver finished within a factor tau (x, log2 "
        "scale) of the best solver on that problem; runs that did not finish never count "
        "(Dolan and More 2002).</desc>",
        f'<rect x="0" y="0" width="{width}" height="{height}" fill="#ffffff"/>',
        f'<text x="{left}" y="{top - 18}" font-size="14" font-weight="bold">'
        f"{escape(title)}</text>",
    ]
    # grid and ticks
    for tau in _ticks(hi, pw):
        x = px(tau)
        out.append(f'<line x1="{_fmt(x)}" y1="{top}" x2="{_fmt(x)}" y2="{top + ph}" '
                   'stroke="#dddddd" stroke-width="1"/>')
        out.append(f'<text x="{_fmt(x)}" y="{top + ph + 16}" text-anchor="middle">'
                   f"{_fmt(tau)}</text>")
    for share in (0.0, 0.25, 0.5, 0.75, 1.0):
        y = py(share)
        out.append(f'<line x1="{left}" y1="{_fmt(y)}" x2="{left + pw}" y2="{_fmt(y)}" '
                   'stroke="#dddddd" stroke-width="1"/>')
        out.append(f'<text x="{left - 6}" y="{_fmt(y + 4)}" text-anchor="end">'
                   f"{_fmt(share)}</text>")
    out.append(f'<rect x="{left}" y="{top}" width="{pw}" height="{ph}" fill="none" '
               'stroke="#444444" stroke-width="1"/>')
    out.append(f'<text x="{left + pw / 2:.1f}" y="{height - 16}" text-anchor="middle">'
               f"τ: {escape(_MEASURE_WORDS.get(measure, measure))} as a multiple of the "
               "best (log₂ scale)</text>")
    out.append(f'<text x="16" y="{top + ph / 2:.1f}" text-anchor="middle" '
               f'transform="rotate(-90 16 {top + ph / 2:.1f})">share of problems within τ'
               "</text>")
    # one step function per solver
    x_end = 2.0 ** hi
    for i, curve in enumerate(curves):
        colour = PALETTE[i % len(PALETTE)]
        dash = DASHES[i % len(DASHES)]
        steps = curve["steps"] or [[1.0, 0.0]]
        points = [(px(steps[0][0]), py(steps[0][1]))]
        for tau, share in steps[1:]:
            points.append((px(tau), points[-1][1]))
            points.append((px(tau), py(share)))
        points.append((px(x_end), points[-1][1]))
        coords = " ".join(f"{_fmt(x)},{_fmt(y)}" for x, y in points)
        dash_attr = f' stroke-dasharray="{dash}"' if dash else ""
        out.append(f'<polyline class="curve" data-solver={quoteattr(str(curve["solver"]))} '
                   f'points="{coords}" fill="none" stroke="{colour}" stroke-width="2"'
                   f'{dash_attr}/>')
    # legend: solver, share best (τ = 1), share finished
    lx, ly = left + pw + 16, top + 6
    out.append(f'<text x="{lx}" y="{ly}" font-weight="bold">solver</text>')
    out.append(f'<text x="{lx}" y="{ly + 14}" fill="#555555">best / finished</text>')
    for i, curve in enumerate(curves):
        colour = PALETTE[i % len(PALETTE)]
        dash = DASHES[i % len(DASHES)]
        y = ly + 36 + 32 * i
        dash_attr = f' stroke-dasharray="{dash}"' if dash else ""
        out.append(f'<line x1="{lx}" y1="{y - 4}" x2="{lx + 28}" y2="{y - 4}" '
                   f'stroke="{colour}" stroke-width="2"{dash_attr}/>')
        out.append(f'<text x="{lx + 34}" y="{y}">{escape(str(curve["solver"]))}</text>')
        out.append(f'<text x="{lx + 34}" y="{y + 14}" fill="#555555">'
                   f'{100 * curve["at_one"]:.0f}% / {100 * curve["solved"]:.0f}%</text>')
    out.append("</svg>")
    return "\n".join(out) + "\n"


def write_profile_svg(path: str | os.PathLike[str], profile: Mapping[str, Any], *,
                      title: str | None = None) -> None:
    with open(path, "w", encoding="utf-8") as f:
        f.write(profile_svg(profile, title=title))
