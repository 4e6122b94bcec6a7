// The bounds chart: primal and dual bound (step lines) and the gap (second
// axis) against nodes processed or seconds, with a mark per new incumbent.
// Plotly draws SVG scatter traces fed with at most a few points per pixel:
// each curve is reduced to min/max per pixel bucket over the visible x range,
// again whenever the user zooms. Clicking the chart picks the moment under the
// pointer; the inspector selects the node processed then. The walkthrough
// adds a vertical cursor at its step (moved with a cheap relayout of one shape).

import { curvesRange, reduceRange } from './series.js';
import { INCUMBENT_COLOUR } from './statuses.js';
import { followSize } from './chartsize.js';

const DUAL_COLOUR = '#0072B2';
const GAP_COLOUR = '#7a7f87';
const CURSOR_COLOUR = '#1b1f24';

export class BoundsChart {
  /** div: the chart element; hooks: {onPick(x, axis)} */
  constructor(div, hooks = {}) {
    this.div = div;
    this.hooks = hooks;
    this.Plotly = null;
    this.series = null;
    this.axis = 'nodes';
    this.range = null; // visible x range, null = everything
    this.sense = 'min';
    this.drawn = false;
    this.lastPoints = 0;
    this._busy = false;
    this._again = false;
    this.cursor = null; // x of the walkthrough's step, null for none
    this._cursorBusy = false;
    this._cursorAgain = false;
  }

  /** The walkthrough's cursor at x (on the current axis); null removes it. */
  setCursor(x) {
    this.cursor = Number.isFinite(x) ? x : null;
  }

  _shapes() {
    if (this.cursor === null) return [];
    return [{ type: 'line', xref: 'x', yref: 'paper', x0: this.cursor, x1: this.cursor, y0: 0, y1: 1,
      line: { color: CURSOR_COLOUR, width: 1.5, dash: 'solid' }, opacity: 0.7, layer: 'above' }];
  }

  /** Move the cursor on a drawn chart without redrawing the traces. */
  async moveCursor() {
    if (!this.Plotly || !this.drawn) return;
    if (this._busy) { this._again = true; return; } // the redraw under way takes the cursor along
    if (this._cursorBusy) { this._cursorAgain = true; return; }
    this._cursorBusy = true;
    try {
      await this.Plotly.relayout(this.div, { shapes: this._shapes() });
    } finally {
      this._cursorBusy = false;
    }
    if (this._cursorAgain) {
      this._cursorAgain = false;
      await this.moveCursor();
    }
  }

  attach(Plotly) {
    this.Plotly = Plotly;
  }

  setSeries(series, axis, sense) {
    if (axis !== this.axis) this.range = null;
    this.series = series;
    this.axis = axis;
    this.sense = sense ?? 'min';
  }

  /** The traces for the current visible range (pure apart from reading this). */
  traces() {
    const a = this.series.axes[this.axis];
    const width = Math.max(200, this.div.clientWidth || 800);
    const buckets = Math.ceil(width); // a few points per pixel column at most
    const full = curvesRange([a.primal, a.dual, a.gap]) ?? [0, 1];
    const [from, to] = this.range ?? full;
    const p = reduceRange(a.primal, from, to, buckets);
    const d = reduceRange(a.dual, from, to, buckets);
    const g = reduceRange(a.gap, from, to, buckets);
    const marks = this.series.incumbents.filter((m) => {
      const x = this.axis === 'nodes' ? m.nodes : m.time;
      return x >= from && x <= to;
    });
    this.lastPoints = p.x.length + d.x.length + g.x.length;
    const hoverValue = (name) => `${name}: %{y:.6g}<extra></extra>`;
    return [
      { type: 'scatter', mode: 'lines', name: 'dual bound', x: d.x, y: d.y,
        line: { color: DUAL_COLOUR, width: 2, shape: 'hv' }, hovertemplate: hoverValue('dual bound') },
      { type: 'scatter', mode: 'lines', name: 'primal bound (incumbent)', x: p.x, y: p.y,
        line: { color: INCUMBENT_COLOUR, width: 2, shape: 'hv' },
        hovertemplate: hoverValue('primal bound') },
      { type: 'scatter', mode: 'lines', name: 'gap', x: g.x, y: g.y, yaxis: 'y2',
        line: { color: GAP_COLOUR, width: 1.25, dash: 'dot', shape: 'hv' },
        hovertemplate: 'gap: %{y:.2%}<extra></extra>' },
      { type: 'scatter', mode: 'markers', name: 'new incumbent',
        x: marks.map((m) => (this.axis === 'nodes' ? m.nodes : m.time)),
        y: marks.map((m) => m.objective),
        customdata: marks.map((m) => m.node),
        marker: { symbol: 'star', size: 11, color: INCUMBENT_COLOUR, line: { color: '#ffffff', width: 1 } },
        hovertemplate: 'new incumbent %{y:.6g}<br>found at node %{customdata}<extra></extra>' },
    ];
  }

  layout() {
    const xTitle = this.axis === 'nodes' ? 'nodes processed' : 'seconds since the start';
    const better = this.sense === 'max' ? 'higher is better' : 'lower is better';
    return {
      uirevision: this.axis, // keep the user's zoom across updates
      margin: { l: 64, r: 56, t: 8, b: 36 },
      paper_bgcolor: '#ffffff',
      plot_bgcolor: '#fbfbf8',
      font: { family: 'system-ui, -apple-system, "Segoe UI", sans-serif', size: 12, color: '#1b1f24' },
      showlegend: true,
      legend: { orientation: 'h', x: 0, y: 1.02, yanchor: 'bottom', bgcolor: 'rgba(0,0,0,0)' },
      hovermode: 'x',
      hoverdistance: -1, // a click anywhere picks the nearest moment
      xaxis: { title: { text: xTitle, standoff: 4 }, zeroline: false, gridcolor: '#ecebe4',
        range: this.range ?? undefined, autorange: this.range ? false : true },
      yaxis: { title: { text: `objective (${better})`, standoff: 6 }, zeroline: false,
        gridcolor: '#ecebe4', tickformat: '~g' },
      yaxis2: { title: { text: 'gap', standoff: 4 }, overlaying: 'y', side: 'right',
        rangemode: 'tozero', tickformat: '.0%', showgrid: false, zeroline: false },
      shapes: this._shapes(),
    };
  }

  /** Draw (or redraw) now; resolves when plotly has drawn. */
  async render() {
    if (!this.Plotly || !this.series) return;
    if (this._busy) { this._again = true; return; }
    this._busy = true;
    try {
      await this.Plotly.react(this.div, this.traces(), this.layout(), {
        displaylogo: false, responsive: true, scrollZoom: false,
        modeBarButtonsToRemove: ['select2d', 'lasso2d', 'toImage', 'autoScale2d'],
      });
      if (!this.drawn) {
        this._bind();
        followSize(this.div);
      }
      this.drawn = true;
    } finally {
      this._busy = false;
    }
    if (this._again) {
      this._again = false;
      await this.render();
    }
  }

  _bind() {
    this.div.on('plotly_relayout', (ev) => {
      if (ev['xaxis.autorange']) {
        this.range = null;
        this.hooks.onZoom?.();
        return;
      }
      const lo = ev['xaxis.range[0]'] ?? ev['xaxis.range']?.[0];
      const hi = ev['xaxis.range[1]'] ?? ev['xaxis.range']?.[1];
      if (lo === undefined || hi === undefined) return;
      this.range = [Number(lo), Number(hi)];
      this.hooks.onZoom?.(); // recompute the reduction for the new range
    });
    this.div.on('plotly_click', (ev) => {
      const pt = ev.points?.[0];
      if (!pt) return;
      if (pt.data.name === 'new incumbent' && pt.customdata !== null && pt.customdata !== undefined) {
        this.hooks.onPickNode?.(pt.customdata);
      } else this.hooks.onPick?.(Number(pt.x), this.axis);
    });
  }

  /** A line of text under the chart about what is shown. */
  note() {
    const a = this.series?.axes[this.axis];
    if (!a) return '';
    const raw = a.primal.n + a.dual.n + a.gap.n;
    if (!raw) return 'No bounds recorded yet.';
    return 'Click the chart to select the node processed at that moment \u00b7 drag to zoom, ' +
      `double-click to zoom out \u00b7 ${raw.toLocaleString('en')} points, ` +
      `${this.lastPoints.toLocaleString('en')} drawn (lowest and highest per pixel column)`;
  }
}
