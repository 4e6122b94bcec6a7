// "Why nodes closed": node counts by status, and by depth stacked by status.
// Plotly bar charts fed with counts computed from the tree arrays.

import { STATUS_NAMES, STATUS_STYLE } from './statuses.js';
import { countByDepth, countByStatus } from './stats.js';
import { formatShare } from './format.js';
import { followSize } from './chartsize.js';

const FONT = { family: 'system-ui, -apple-system, "Segoe UI", sans-serif', size: 12, color: '#1b1f24' };
const CONFIG = { displaylogo: false, responsive: true,
  modeBarButtonsToRemove: ['select2d', 'lasso2d', 'toImage', 'autoScale2d'] };

export class ClosedCharts {
  constructor(statusDiv, depthDiv) {
    this.statusDiv = statusDiv;
    this.depthDiv = depthDiv;
    this.Plotly = null;
  }

  attach(Plotly) {
    this.Plotly = Plotly;
  }

  async render(store) {
    if (!this.Plotly || !store) return;
    const n = store.n;
    const counts = countByStatus(store.status, n);
    const codes = STATUS_NAMES.map((_, c) => c).filter((c) => counts[c] > 0).reverse();
    const byStatus = [{
      type: 'bar', orientation: 'h',
      y: codes.map((c) => STATUS_NAMES[c]),
      x: codes.map((c) => counts[c]),
      text: codes.map((c) => `${counts[c].toLocaleString('en')} (${formatShare(counts[c], n)})`),
      textposition: 'auto', cliponaxis: false,
      marker: { color: codes.map((c) => STATUS_STYLE[c].colour) },
      hovertemplate: '%{y}: %{x} nodes<extra></extra>',
    }];
    const statusLayout = {
      title: { text: 'Nodes by status', font: { size: 13 }, x: 0, xanchor: 'left' },
      margin: { l: 78, r: 16, t: 28, b: 30 }, font: FONT, paper_bgcolor: '#ffffff',
      plot_bgcolor: '#fbfbf8', xaxis: { title: { text: 'nodes' }, gridcolor: '#ecebe4' },
      yaxis: { automargin: true }, showlegend: false,
    };
    const { depths, counts: grid } = countByDepth(store.status, store.depth, n);
    const depthAxis = Array.from({ length: depths }, (_, d) => d);
    const byDepth = STATUS_NAMES.map((name, c) => ({
      type: 'bar', name, x: depthAxis,
      y: depthAxis.map((d) => grid[d * STATUS_NAMES.length + c]),
      marker: { color: STATUS_STYLE[c].colour },
      hovertemplate: `depth %{x}: %{y} ${name}<extra></extra>`,
    })).filter((t, c) => counts[c] > 0);
    const depthLayout = {
      title: { text: 'Nodes by depth', font: { size: 13 }, x: 0, xanchor: 'left' },
      barmode: 'stack', bargap: 0.1, margin: { l: 56, r: 12, t: 28, b: 34 }, font: FONT,
      paper_bgcolor: '#ffffff', plot_bgcolor: '#fbfbf8',
      xaxis: { title: { text: 'depth', standoff: 4 }, gridcolor: '#ecebe4', dtick: depths > 40 ? undefined : 1 },
      yaxis: { title: { text: 'nodes' }, gridcolor: '#ecebe4' },
      legend: { orientation: 'v', x: 1, xanchor: 'right', y: 1, bgcolor: 'rgba(255,255,255,0.8)' },
    };
    followSize(this.statusDiv);
    followSize(this.depthDiv);
    await Promise.all([
      this.Plotly.react(this.statusDiv, byStatus, statusLayout, CONFIG),
      this.Plotly.react(this.depthDiv, byDepth, depthLayout, CONFIG),
    ]);
  }
}
