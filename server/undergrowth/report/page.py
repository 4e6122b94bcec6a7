"""The review report: one self-contained HTML page about one or more runs.

`build_report(runs)` returns the page as a string. Everything it shows is
computed by the analysis package (summary figures, `diagnose` findings, the
forecast and its back-test, bound series, the tidy layout, comparison rows);
this module only lays it out. The page holds its own CSS and inline SVG
pictures and refers to nothing outside itself (no scripts, fonts, images or
links to other sites), so it opens from a file, offline, and prints (a print
stylesheet keeps figures whole and drops the screen's colours where they only
decorate). docs/report.md describes what each part shows.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, field
from datetime import UTC, datetime
from html import escape
from typing import TYPE_CHECKING, Any

import numpy as np

from .. import __version__
from ..analysis.compare import best_marks, rows_for_tables
from ..analysis.findings import diagnose
from ..analysis.forecast import backtest, forecast
from ..analysis.layout import table_layout
from ..analysis.measures import measures
from ..analysis.series import bound_series
from ..runlog.codes import STATUSES
from .bounds_svg import bounds_svg
from .palette import INCUMBENT_COLOUR, NOTE_COLOUR, STATUS_STYLE, shape_path
from .tree_svg import COLLAPSE_PX, tree_picture

if TYPE_CHECKING:
    from ..analysis.findings import Finding
    from ..analysis.layout import TreeLayout
    from ..analysis.table import RunTable
    from ..model import Problem

__all__ = ["ReportRun", "build_report", "format_gap", "format_seconds", "format_value"]

DASH = "\u2014"
CHART_WIDTH = 1160  # px; the page is 1240 px wide at most, and pictures scale down
# Bound series points per line: two per pixel of the chart's plot area.
SERIES_POINTS = 2 * CHART_WIDTH
MAX_DETAIL_ROWS = 25  # rows of a finding's per-item table shown (the evidence has the count)


@dataclass
class ReportRun:
    """One run to report on. ``label`` names it on the page (the file name or run id);
    ``problem`` is its model, when known, for the model checks; ``model_note`` says
    where the model came from or why there is none; ``notes`` are the reviewers'
    notes (`runlog.notes.read_notes`); ``layout`` the tidy layout if already at hand."""

    table: RunTable
    label: str
    problem: Problem | None = None
    model_note: str | None = None
    notes: list[dict[str, Any]] = field(default_factory=list)
    layout: TreeLayout | None = None


# ------------------------------------------------------------------ formatting
def format_value(v: float | None, digits: int = 6) -> str:
    """An objective or bound for people: up to ``digits`` significant digits (as the
    web's formatValue)."""
    if v is None or (isinstance(v, float) and math.isnan(v)):
        return DASH
    v = float(v)
    if math.isinf(v):
        return "+\u221e" if v > 0 else "\u2212\u221e"
    if v == 0:
        return "0"
    a = abs(v)
    if a >= 1e9 or a < 1e-4:
        mant, exp = f"{v:.{digits - 1}e}".split("e")
        if "." in mant:
            mant = mant.rstrip("0").rstrip(".")
        s = f"{mant}e{int(exp)}"
    else:
        decimals = max(0, digits - 1 - math.floor(math.log10(a)))
        s = f"{v:.{min(decimals, 12)}f}"
        if "." in s:
            s = s.rstrip("0").rstrip(".")
    return s.replace("-", "\u2212")


def format_gap(g: float | None) -> str:
    """A relative gap as a percentage, as on the web page."""
    if g is None or not math.isfinite(g):
        return DASH
    p = g * 100
    if p == 0:
        return "0%"
    if p < 0.01:
        return "<0.01%"
    if p < 10:
        return f"{p:.2f}%"
    if p < 100:
        return f"{p:.1f}%"
    return f"{round(p)}%"


def format_seconds(s: float | None) -> str:
    if s is None or not math.isfinite(s):
        return DASH
    if s < 0.01:
        return f"{s * 1000:.{2 if s < 0.001 else 1}f} ms"
    if s < 10:
        return f"{s:.2f} s"
    if s < 60:
        return f"{s:.1f} s"
    m = int(s // 60)
    if m < 60:
        return f"{m} min {int(s - 60 * m):02d} s"
    return f"{m // 60} h {m % 60:02d} min"


def _count(n: float | None) -> str:
    return DASH if n is None else f"{round(n):,}"


def _plain(v: Any) -> str:
    """An evidence value of a finding."""
    if hasattr(v, "item"):
        v = v.item()
    if v is None:
        return DASH
    if isinstance(v, bool):
        return "yes" if v else "no"
    if isinstance(v, int):
        return f"{v:,}"
    if isinstance(v, float):
        return format_value(v, 4)
    if isinstance(v, list | tuple):
        return ", ".join(_plain(x) for x in v[:12]) + (" …" if len(v) > 12 else "")
    return str(v)


def _h(v: Any) -> str:
    return escape(str(v), quote=True)


def _num(v: Any) -> float | None:
    if v is None:
        return None
    try:
        v = float(v)
    except (TypeError, ValueError):
        return None
    return v if math.isfinite(v) else None


# ------------------------------------------------------------------ small pictures
def _status_icon(code: int, size: int = 14) -> str:
    style = STATUS_STYLE[code]
    r = size * 0.32
    d = shape_path(style.shape, size / 2, size / 2, max(r, 2.4))
    return (f'<svg class="icon" width="{size}" height="{size}" viewBox="0 0 {size} {size}" '
            f'aria-hidden="true"><path d="{d}" fill="{style.colour}" fill-rule="evenodd"/></svg>')


def _ring_icon() -> str:
    return ('<svg class="icon" width="14" height="14" viewBox="0 0 14 14" aria-hidden="true">'
            f'<circle cx="7" cy="7" r="5" fill="none" stroke="{INCUMBENT_COLOUR}" '
            'stroke-width="2"/></svg>')


def _note_icon() -> str:
    return ('<svg class="icon" width="16" height="14" viewBox="0 0 16 14" aria-hidden="true">'
            f'<rect x="1" y="1" width="14" height="12" rx="3" fill="{NOTE_COLOUR}"/>'
            '<text x="8" y="10.5" font-size="9" text-anchor="middle" fill="#ffffff">1</text>'
            "</svg>")


# ------------------------------------------------------------------ one run
class _RunView:
    """Everything the page shows about one run, computed once."""

    def __init__(self, run: ReportRun, index: int) -> None:
        t = run.table
        self.run = run
        self.index = index
        self.anchor = f"run-{index}"
        self.header = t.header
        self.model = t.header.get("model") or {}
        self.settings = t.header.get("settings") or {}
        self.end = t.end
        self.sense = t.sense
        self.counts = t.count_by_status()
        self.measures = measures(t)
        self.findings: list[Finding] = diagnose(t, run.problem)
        self.forecast = forecast(t)
        try:
            self.backtest = backtest(t)
        except ValueError:
            self.backtest = None  # unfinished: the true size is unknown
        self.series = bound_series(t, axis="nodes", points=SERIES_POINTS)
        self.layout = run.layout if run.layout is not None else table_layout(t)
        end = self.end or {}
        self.nodes = int(end["nodes"]) if "nodes" in end else self.measures.nodes
        self.objective = _num(end.get("objective")) if self.end else self.measures.primal
        self.dual = _num(end.get("dual_bound")) if self.end else self.measures.dual
        self.gap = _num(end.get("gap")) if self.end else self.measures.gap
        self.status = str(end.get("status")) if self.end else "unfinished"

    @property
    def name(self) -> str:
        return str(self.model.get("name") or self.run.label)

    @property
    def heading(self) -> str:
        rule, order = self.settings.get("branching") or DASH, self.settings.get("select") or DASH
        return f"{self.name} \u00b7 {rule} \u00b7 {order}"

    # -------------------------------------------------------------- sections
    def html(self) -> str:
        i = self.index
        parts = [f'<section class="run" id="{self.anchor}" aria-labelledby="{self.anchor}-h">',
                 f'<h2 id="{self.anchor}-h"><span class="run-no">{i}</span> {_h(self.heading)}'
                 "</h2>",
                 f'<p class="file">Run log <code>{_h(self.run.label)}</code></p>',
                 self._summary(), self._bounds(), self._tree(), self._findings(),
                 self._forecast(), self._notes(), "</section>"]
        return "\n".join(parts)

    def _summary(self) -> str:
        t = self.run.table
        end = self.end or {}
        fig = [("Result", self.status + (f" \u2014 {end['message']}" if end.get("message")
                                         else ""), "status"),
               ("Nodes processed", _count(self.nodes), "nodes"),
               ("Nodes in the tree", _count(len(t)), "tree-nodes"),
               (f"Best solution ({self.sense})", format_value(self.objective), "objective"),
               ("Best bound", format_value(self.dual), "dual"),
               ("Gap", format_gap(self.gap), "gap")]
        total = _num(end.get("time"))
        if total is None and len(t):
            total = float(np.nanmax(t.columns["time"])) if np.isfinite(
                t.columns["time"]).any() else None
        lp = _num(end.get("lp_seconds"))
        fig.append(("Time", format_seconds(total), "time"))
        if lp is not None and total:
            # the rest (the end event's other_seconds) is branching, bookkeeping, the log
            fig.append(("Of it in relaxations", f"{format_seconds(lp)} "
                                                f"({100 * lp / total:.0f}%)", "time-lp"))
        iters = end.get("lp_iterations")
        if iters is None:
            iters = int(np.clip(t.columns["iterations"], 0, None).sum()) if len(t) else 0
        fig += [("LP iterations", _count(iters), "lp-iterations"),
                ("Incumbents found", _count(len(t.incumbents)), "incumbents"),
                ("Deepest node", _count(int(t.columns["depth"].max()) if len(t) else 0),
                 "max-depth")]
        root = self.measures.root
        if root is not None:
            fig.append(("Root bound", f"{format_value(root.root_bound)} (root gap "
                                      f"{format_gap(root.gap)})", "root"))
        dl = "".join(f'<div><dt>{_h(k)}</dt><dd data-field="{f}">{_h(v)}</dd></div>'
                     for k, v, f in fig)
        m = self.model
        model_line = (f"<strong>{_h(m.get('name', DASH))}</strong>: "
                      f"{_count(m.get('rows'))} rows, {_count(m.get('columns'))} columns "
                      f"({_count(m.get('integers'))} integer, {_count(m.get('binaries'))} "
                      f"binary), {_count(m.get('nonzeros'))} nonzeros, "
                      f"{'minimise' if self.sense == 'min' else 'maximise'}"
                      f"{', quadratic objective' if m.get('quadratic') else ''}")
        settings = ", ".join(f"{_h(k.replace('_', ' '))} <code>{_h(_setting(v))}</code>"
                             for k, v in self.settings.items())
        started = self.header.get("started")
        producer = self.header.get("producer")
        rows = [("Model", model_line), ("Settings", settings or DASH)]
        if started or producer:
            rows.append(("Recorded", _h(" by ".join(str(x) for x in (started, producer) if x))))
        meta = "".join(f"<tr><th scope=\"row\">{k}</th><td>{v}</td></tr>" for k, v in rows)
        status_rows = "".join(
            f'<tr data-status="{s}"><td>{_status_icon(code)} {s}</td>'
            f'<td class="num">{self.counts[s]:,}</td>'
            f'<td class="num">{_share(self.counts[s], len(t))}</td>'
            f'<td class="muted">{_h(STATUS_STYLE[code].hint)}</td></tr>'
            for code, s in enumerate(STATUSES) if self.counts[s])
        warn = ""
        if t.warnings:
            items = "".join(f"<li>{_h(w)}</li>" for w in t.warnings[:10])
            warn = (f'<div class="warning" role="note"><strong>Read with warnings</strong>'
                    f"<ul>{items}</ul></div>")
        return (f'<h3 id="{self.anchor}-summary">Summary</h3>{warn}'
                f'<dl class="figures">{dl}</dl>'
                f'<table class="meta">{meta}</table>'
                f'<table class="statuses" aria-label="Nodes by status">'
                "<thead><tr><th scope=\"col\">Status</th><th scope=\"col\" class=\"num\">Nodes"
                "</th><th scope=\"col\" class=\"num\">Share</th><th scope=\"col\">Meaning</th>"
                f"</tr></thead><tbody>{status_rows}</tbody></table>")

    def _bounds(self) -> str:
        svg = bounds_svg(self.series, sense=self.sense, value=format_value,
                         id_prefix=f"{self.anchor}-bounds", width=CHART_WIDTH)
        return (f'<h3 id="{self.anchor}-bounds-h">Bounds over the search</h3>'
                f'<figure class="chart">{svg}<figcaption>The best solution found so far '
                "(primal bound) and the best bound any open node could still reach (dual "
                "bound) against the number of nodes processed; the lower panel is their "
                f"relative gap. {len(self.series.incumbents.objective):,} incumbents; lines "
                f"drawn from {self.series.raw_points:,} points reduced to at most "
                f"{SERIES_POINTS:,} per line, keeping every extreme.</figcaption></figure>")

    def _tree(self) -> str:
        t = self.run.table
        pic = tree_picture(t, self.layout, notes=self.run.notes,
                           id_prefix=f"{self.anchor}-tree", value=format_value,
                           title=f"Search tree of {self.name}: {len(t):,} nodes")
        legend = "".join(f'<li>{_status_icon(code)} {s}</li>'
                         for code, s in enumerate(STATUSES) if self.counts[s])
        legend += f"<li>{_ring_icon()} found an incumbent</li>"
        if self.run.notes:
            legend += f"<li>{_note_icon()} reviewer's note (numbered as below)</li>"
        if pic.bars:
            legend += ('<li><svg class="icon" width="14" height="14" viewBox="0 0 14 14" '
                       'aria-hidden="true"><rect x="6.25" y="1" width="1.5" height="12" '
                       f'fill="{STATUS_STYLE[STATUSES.index(pic.bar_status)].colour}"/></svg> '
                       "subtree narrower than "
                       f"{COLLAPSE_PX} px, coloured by the status that closed most of its "
                       "nodes</li>")
        hidden = (f"; {pic.hidden:,} more nodes sit inside {pic.bars:,} subtrees drawn as one "
                  "bar each." if pic.bars else ": every node is drawn.")
        return (f'<h3 id="{self.anchor}-tree-h">The tree</h3>'
                f'<ul class="legend" aria-label="Tree legend">{legend}</ul>'
                f'<figure class="tree">{pic.svg}<figcaption>Each row is a depth; down '
                f"children are left of up children. {pic.marks:,} nodes drawn one by one"
                f"{hidden} Hover a mark group, ring or note for its details.</figcaption>"
                "</figure>")

    def _findings(self) -> str:
        head = f'<h3 id="{self.anchor}-findings-h">Findings</h3>'
        note = (f'<p class="muted">{_h(self.run.model_note)}</p>' if self.run.model_note
                else "")
        if not self.findings:
            return (head + note + '<p class="none">No findings: nothing in this run'
                    + (" or its model" if self.run.problem is not None else "")
                    + " looks like a known cause of slowness.</p>")
        items = []
        for f in self.findings:
            evidence = "".join(f"<div><dt>{_h(k.replace('_', ' '))}</dt><dd>{_h(_plain(v))}"
                               "</dd></div>" for k, v in f.evidence.items() if v is not None)
            refs = [f"{len(v):,} {k if len(v) != 1 else k[:-1]}" for k, v in f.refs.items() if v]
            refs_text = (f'<p class="refs">Points at {", ".join(refs)}'
                         + (f": {_h(_refs_preview(f.refs))}" if refs else "") + "</p>"
                         if refs else "")
            items.append(
                f'<article class="finding sev-{f.severity}" data-code="{_h(f.code)}">'
                f'<h4><span class="sev">{_h(f.severity)}</span> {_h(f.title)} '
                f'<code class="code">{_h(f.code)}</code></h4>'
                f'<dl class="evidence">{evidence}</dl>'
                f"<p>{_h(f.explanation)}</p>"
                f'<p class="advice"><strong>What to try:</strong> {_h(f.advice)}</p>'
                f"{refs_text}{_details(f.details)}</article>")
        return head + note + "".join(items)

    def _forecast(self) -> str:
        fc = self.forecast
        what = "how the forecast would have done" if fc.finished else "forecast"
        head = f'<h3 id="{self.anchor}-forecast-h">Tree size: {what}</h3>'
        if fc.upto == 0:
            return head + '<p class="none">Nothing was processed, so there is nothing to ' \
                          "forecast.</p>"
        if fc.finished:
            text = (f"<p>The tree is complete: <strong>{_count(fc.done)}</strong> nodes in all. "
                    "How well would the forecast have done? Below, the forecasts made after "
                    "part of the run, against the true size (a ratio of 1 is exact).</p>")
        else:
            low_high = (f" (range {_count(fc.low)} to {_count(fc.high)})"
                        if fc.high is not None else "")
            lead = "at least " if fc.high is None else "about "
            text = (f"<p>After {fc.upto:,} processed nodes: {lead}<strong>"
                    f"{_count(fc.total_nodes)}</strong> nodes in all{low_high}; "
                    f"{_count(fc.remaining_nodes)} still to go, {fc.open:,} waiting now.")
            if fc.remaining_seconds is not None:
                text += (f" About {format_seconds(fc.remaining_seconds)} more at the recent "
                         f"{format_seconds(fc.seconds_per_node)} per node.")
            text += "</p>"
            methods = "".join(f"<tr><td>{_h(m.method)}</td><td class=\"num\">"
                              f"{_count(m.total)}</td><td class=\"muted\">{_h(m.note)}</td>"
                              "</tr>" for m in fc.methods)
            text += ('<table class="plain"><thead><tr><th scope="col">Method</th>'
                     '<th scope="col" class="num">Nodes in all</th><th scope="col">Basis'
                     f"</th></tr></thead><tbody>{methods}</tbody></table>")
        if self.backtest:
            method_names = [m.method for m in fc.methods] or sorted(
                {k for p in self.backtest for k in p.methods})
            heads = "".join(f'<th scope="col" class="num">{_h(m)}</th>' for m in method_names)
            body = ""
            for p in self.backtest:
                cells = "".join(f'<td class="num">{_ratio(p.methods.get(m))}</td>'
                                for m in method_names)
                rng = (f"{_count(p.low)} to {_count(p.high)}" if p.low is not None
                       and p.high is not None else DASH)
                body += (f'<tr><td>{100 * p.fraction:.0f}% ({p.upto:,} nodes)</td>'
                         f'<td class="num">{_count(p.forecast)}</td><td class="num">{rng}</td>'
                         f'<td class="num">{_ratio(p.ratio)}</td>{cells}</tr>')
            text += ('<table class="plain backtest" aria-label="Forecast back-test"><thead><tr>'
                     '<th scope="col">Forecast made after</th><th scope="col" class="num">'
                     'Forecast</th><th scope="col" class="num">Range</th><th scope="col" '
                     f'class="num">Forecast / true</th>{heads}</tr></thead><tbody>{body}'
                     "</tbody></table>")
            text += ('<p class="muted small">The method columns give each estimate divided '
                     "by the true size.</p>")
        return head + text

    def _notes(self) -> str:
        head = f'<h3 id="{self.anchor}-notes-h">Notes</h3>'
        notes = self.run.notes
        if not notes:
            return head + '<p class="none">No notes on this run.</p>'
        rows = []
        for k, note in enumerate(notes, start=1):
            node = note.get("node")
            order = note.get("order")
            where = [f"node {_h(node)}"] if node is not None else []
            if isinstance(order, int):
                where.append(f"step {int(order) + 1:,}")
            rows.append(f'<li class="note" id="{self.anchor}-note-{k}"><span class="note-no">'
                        f"{k}</span><div><p class=\"note-meta\">"
                        + (", ".join(where) or "the whole run")
                        + f" \u00b7 {_h(note.get('author') or 'anonymous')}"
                        + (f" \u00b7 {_h(note.get('created'))}" if note.get("created") else "")
                        + f'</p><p class="note-text">{_h(note.get("text") or "")}</p></div></li>')
        return head + f'<ol class="notes">{"".join(rows)}</ol>'


def _setting(v: Any) -> str:
    if v is None:
        return "none"
    if isinstance(v, bool):
        return "yes" if v else "no"
    return str(v)


def _share(part: int, whole: int) -> str:
    if not whole:
        return DASH
    p = 100 * part / whole
    return "<1%" if 0 < p < 1 else f"{round(p)}%"


def _ratio(r: float | None) -> str:
    return DASH if r is None else f"{r:.2f}"


def _refs_preview(refs: dict[str, list[Any]]) -> str:
    bits = []
    for kind, items in refs.items():
        if items:
            shown = ", ".join(str(x) for x in items[:8])
            bits.append(f"{kind} {shown}" + (" …" if len(items) > 8 else ""))
    return "; ".join(bits)


def _details(details: list[dict[str, Any]]) -> str:
    if not details:
        return ""
    keys: list[str] = []
    for d in details[:MAX_DETAIL_ROWS]:
        keys += [k for k in d if k not in keys]
    head = "".join(f'<th scope="col">{_h(k.replace("_", " "))}</th>' for k in keys)
    body = "".join("<tr>" + "".join(f"<td>{_h(_plain(d.get(k)))}</td>" for k in keys) + "</tr>"
                   for d in details[:MAX_DETAIL_ROWS])
    more = (f'<p class="muted small">First {MAX_DETAIL_ROWS} of {len(details):,}.</p>'
            if len(details) > MAX_DETAIL_ROWS else "")
    return (f'<div class="table-scroll"><table class="plain details"><thead><tr>{head}</tr>'
            f"</thead><tbody>{body}</tbody></table></div>{more}")


# ------------------------------------------------------------------ comparison
_COMPARE_COLUMNS = (("nodes", "Nodes"), ("lp_iterations", "LP iterations"),
                    ("seconds", "Time"), ("first_incumbent_seconds", "First incumbent"),
                    ("gap", "Gap"), ("primal_integral", "Primal integral"),
                    ("max_depth", "Deepest node"))


def _compare_cell(key: str, v: Any) -> str:
    if v is None:
        return DASH
    if key in ("seconds", "first_incumbent_seconds"):
        return format_seconds(v)
    if key == "gap":
        return format_gap(v)
    if key == "primal_integral":
        return format_value(v, 4)
    return _count(v)


def _comparison(views: list[_RunView]) -> str:
    tables = [v.run.table for v in views]
    rows = rows_for_tables(tables, run_logs=[v.run.label for v in views])
    marks = best_marks(rows)
    # A model (and seed) with a single run has nothing to be best against: no marks.
    runs_of: dict[tuple[str, object], int] = {}
    for row in rows:
        key = (str(row["model"]), row.get("seed"))
        runs_of[key] = runs_of.get(key, 0) + 1
    marks = [m if runs_of[(str(r["model"]), r.get("seed"))] > 1 else dict.fromkeys(m, False)
             for r, m in zip(rows, marks, strict=True)]
    heads = ("<th scope=\"col\">Run</th><th scope=\"col\">Model</th><th scope=\"col\">"
             "Branching rule</th><th scope=\"col\">Node order</th><th scope=\"col\" "
             "class=\"num\">Seed</th><th scope=\"col\">Result</th>"
             + "".join(f'<th scope="col" class="num">{h}</th>' for _, h in _COMPARE_COLUMNS)
             + '<th scope="col" class="num">Best solution</th>'
               '<th scope="col" class="num">Best bound</th>')
    body = []
    for view, row, mark in zip(views, rows, marks, strict=True):
        cells = [f'<th scope="row"><a href="#{view.anchor}">{view.index}</a></th>',
                 f"<td>{_h(row['model'])}</td>", f"<td>{_h(row['branching'] or DASH)}</td>",
                 f"<td>{_h(row['select'] or DASH)}</td>",
                 f'<td class="num">{_h(_setting(row["seed"]))}</td>',
                 f"<td>{_h(row['status'])}</td>"]
        for key, _ in _COMPARE_COLUMNS:
            text = _h(_compare_cell(key, row[key]))
            if mark.get(key):
                cells.append(f'<td class="num best" data-col="{key}"><strong>{text}</strong>'
                             '<span class="best-tag"> (best)</span></td>')
            else:
                cells.append(f'<td class="num" data-col="{key}">{text}</td>')
        cells.append(f'<td class="num">{_h(format_value(view.objective))}</td>'
                     f'<td class="num">{_h(format_value(view.dual))}</td>')
        body.append(f'<tr data-run="{_h(view.run.label)}">{"".join(cells)}</tr>')
    return ('<section class="comparison" id="comparison" aria-labelledby="comparison-h">'
            '<h2 id="comparison-h">Comparison</h2>'
            '<p class="muted">One row per run. In each column the best value among runs of '
            "the same model and seed is in bold and marked (best) where the model has two or "
            "more runs; lower is better in every "
            "ranked column, and effort columns (nodes, LP iterations, time, depth) rank only "
            "finished runs when any finished. The primal integral (Berthold 2013) is in "
            "seconds, measured against the best solution any run of the model found.</p>"
            f'<div class="table-scroll"><table class="compare"><thead><tr>{heads}</tr></thead>'
            f"<tbody>{''.join(body)}</tbody></table></div></section>")


# ------------------------------------------------------------------ the page
def build_report(runs: Sequence[ReportRun], *, title: str | None = None,
                 generated: datetime | None = None) -> str:
    """The whole report page (HTML) for ``runs``, in the order given."""
    if not runs:
        raise ValueError("runs: a report needs at least one run")
    views = [_RunView(run, i) for i, run in enumerate(runs, start=1)]
    names = list(dict.fromkeys(v.name for v in views))
    title = title or ("Search review: " + ", ".join(names))
    when = (generated or datetime.now(UTC)).strftime("%Y-%m-%d %H:%M UTC")
    toc = "".join(f'<li><a href="#{v.anchor}">{_h(v.heading)}</a> <span class="muted">'
                  f"{_h(v.status)}, {_count(v.nodes)} nodes</span></li>" for v in views)
    toc = f'<ol class="toc">{toc}</ol>'
    if len(views) > 1:
        toc = ('<p class="toc-lead"><a href="#comparison">Comparison of the runs</a>, then '
               "each run:</p>" + toc)
    body = [f'<header class="top"><h1>{_h(title)}</h1>'
            f'<p class="muted">Written by Undergrowth {_h(__version__)} on {when} from '
            f"{len(views)} run{'s' if len(views) != 1 else ''}. This page is complete in "
            "itself: it needs no server and no network.</p>"
            f'<nav aria-label="Contents">{toc}</nav></header>',
            "<main>"]
    if len(views) > 1:
        body.append(_comparison(views))
    body += [v.html() for v in views]
    body.append("</main>")
    body.append('<footer class="muted small"><p>Node statuses, findings and the forecast '
                "methods are described in the Undergrowth documentation (docs/report.md, "
                "docs/findings.md). Colours are the Okabe\u2013Ito palette, and every status "
                "also has a shape of its own.</p></footer>")
    return ("<!doctype html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n"
            '<meta name="viewport" content="width=device-width, initial-scale=1">\n'
            '<meta name="generator" content="Undergrowth report">\n'
            f"<title>{_h(title)}</title>\n<style>\n{CSS}\n</style>\n</head>\n<body>\n"
            + "\n".join(body) + "\n</body>\n</html>\n")


CSS = """
:root { color-scheme: light; --ink: #1b1f24; --muted: #5b6169; --line: #dcdbd3;
  --paper: #ffffff; --wash: #f4f3ee; --accent: #0b5c8a; --best: #fff1c7; }
* { box-sizing: border-box; }
html { font-family: system-ui, -apple-system, "Segoe UI", Roboto, sans-serif; font-size: 15px;
  color: var(--ink); background: var(--wash); line-height: 1.45; }
body { margin: 0 auto; max-width: 1240px; padding: 20px 24px 40px; background: var(--paper); }
h1 { font-size: 1.6rem; margin: 0 0 4px; }
h2 { font-size: 1.3rem; margin: 0 0 4px; border-bottom: 2px solid var(--ink); padding-bottom: 4px; }
h3 { font-size: 1.05rem; margin: 22px 0 8px; }
h4 { font-size: 1rem; margin: 0 0 6px; }
a { color: var(--accent); }
code { font-family: ui-monospace, "DejaVu Sans Mono", Menlo, monospace; font-size: 0.9em; }
.muted { color: var(--muted); }
.small { font-size: 0.85rem; }
.top { border-bottom: 1px solid var(--line); padding-bottom: 10px; margin-bottom: 18px; }
.toc { margin: 6px 0 0; padding-left: 26px; }
.toc li { margin: 2px 0; }
.toc-lead { margin: 8px 0 0; }
section.run, section.comparison { margin: 0 0 40px; }
.run-no { display: inline-block; min-width: 1.6em; padding: 0 6px; margin-right: 4px;
  border-radius: 4px; background: var(--ink); color: #fff; text-align: center; }
.file { margin: 4px 0 12px; color: var(--muted); word-break: break-all; }
dl.figures { display: grid; grid-template-columns: repeat(auto-fill, minmax(190px, 1fr));
  gap: 8px; margin: 0 0 12px; }
dl.figures > div { background: var(--wash); border-radius: 6px; padding: 6px 10px; }
dl.figures dt { font-size: 0.8rem; color: var(--muted); }
dl.figures dd { margin: 0; font-weight: 600; font-variant-numeric: tabular-nums; }
table { border-collapse: collapse; font-variant-numeric: tabular-nums; }
th, td { text-align: left; padding: 4px 10px 4px 0; vertical-align: top; }
thead th { border-bottom: 1px solid var(--ink); font-size: 0.85rem; }
tbody tr + tr td, tbody tr + tr th { border-top: 1px solid var(--line); }
.num { text-align: right; }
table.meta { margin: 0 0 12px; }
table.meta th { color: var(--muted); font-weight: normal; width: 7em; }
table.statuses td:first-child { white-space: nowrap; }
.icon { vertical-align: -2px; }
figure { margin: 0; }
figure svg { display: block; max-width: 100%; height: auto; border: 1px solid var(--line); }
figcaption { font-size: 0.85rem; color: var(--muted); margin-top: 6px; max-width: 70em; }
ul.legend { list-style: none; display: flex; flex-wrap: wrap; gap: 4px 18px; padding: 0;
  margin: 0 0 8px; font-size: 0.9rem; }
article.finding { border-left: 4px solid var(--line); padding: 6px 0 6px 12px; margin: 0 0 14px; }
article.finding p { margin: 4px 0; max-width: 70em; }
.sev { display: inline-block; font-size: 0.75rem; text-transform: uppercase; letter-spacing: 0.04em;
  padding: 1px 6px; border-radius: 3px; border: 1px solid currentColor; margin-right: 4px; }
.sev-high { border-left-color: #b3261e; } .sev-high .sev { color: #b3261e; }
.sev-medium { border-left-color: #a15c00; } .sev-medium .sev { color: #8a4f00; }
.sev-low { border-left-color: #3d6b99; } .sev-low .sev { color: #2f5b85; }
.sev-info { border-left-color: #8a8f96; } .sev-info .sev { color: var(--muted); }
code.code { color: var(--muted); font-weight: normal; }
dl.evidence { display: flex; flex-wrap: wrap; gap: 2px 18px; margin: 4px 0; font-size: 0.9rem; }
dl.evidence div { display: flex; gap: 6px; }
dl.evidence dt { color: var(--muted); }
dl.evidence dd { margin: 0; font-variant-numeric: tabular-nums; }
.refs { font-size: 0.85rem; color: var(--muted); }
.table-scroll { overflow-x: auto; }
table.plain, table.details { font-size: 0.9rem; margin: 6px 0; }
table.compare { font-size: 0.9rem; width: 100%; }
table.compare td.best { background: var(--best); }
table.compare td.num { white-space: nowrap; }
.best-tag { font-size: 0.75rem; color: var(--muted); }
ol.notes { list-style: none; padding: 0; margin: 0; }
li.note { display: flex; gap: 10px; margin: 0 0 10px; }
.note-no { flex: none; min-width: 1.8em; height: 1.5em; border-radius: 4px; color: #fff;
  background: #5a2d82; text-align: center; font-size: 0.85rem; line-height: 1.5em; }
.note-meta { margin: 0; font-size: 0.85rem; color: var(--muted); }
.note-text { margin: 2px 0 0; white-space: pre-wrap; max-width: 70em; }
.none { color: var(--muted); font-style: italic; }
.warning { border: 1px solid #a15c00; background: #fff7e6; padding: 6px 12px; border-radius: 6px;
  margin: 0 0 12px; }
.warning ul { margin: 4px 0 0; padding-left: 20px; }
footer { border-top: 1px solid var(--line); margin-top: 30px; padding-top: 8px; }
@media print {
  html { background: #fff; font-size: 11pt; }
  body { max-width: none; padding: 0; }
  @page { margin: 14mm 12mm; }
  a { color: inherit; text-decoration: none; }
  section.run { break-before: page; }
  section.comparison + section.run, header + main > section.run:first-child { break-before: auto; }
  figure, article.finding, table.statuses, dl.figures, li.note { break-inside: avoid; }
  h2, h3, h4 { break-after: avoid; }
  dl.figures > div { background: none; border: 1px solid var(--line); }
  table.compare td.best { background: none; }
  .table-scroll { overflow: visible; }
}
"""
