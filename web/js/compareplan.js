// The comparison view's pure helpers: run letters and colours, one drawing scale
// shared by several tree panes, the overlaid bound traces, the metrics table's
// cells and the branching-variable overlap. No DOM.

import { formatCount, formatGap, formatSeconds, formatValue } from './format.js';

export const MAX_PANES = 4; // trees drawn side by side
export const MAX_PICK = 8; // runs one comparison may hold (the server's limit too)

// Run colours: Paul Tol's "muted" qualitative scheme (colour-blind safe), kept
// apart from the node-status palette, which is Okabe–Ito.
export const RUN_COLOURS = Object.freeze([
  '#332288', '#CC6677', '#117733', '#AA4499', '#88CCEE', '#999933', '#882255', '#44AA99',
]);

export function runColour(i) {
  return RUN_COLOURS[((i % RUN_COLOURS.length) + RUN_COLOURS.length) % RUN_COLOURS.length];
}

/** A, B, C, ... (the run's short name on panes, chart and table). */
export function runLetter(i) {
  return String.fromCharCode(65 + (i % 26));
}

/** "rule · order" (and the seed when it is not 0) of a table row or run item. */
export function runLabel(row) {
  const parts = [row.branching ?? '?', row.select ?? '?'];
  const seed = row.seed;
  return parts.join(' \u00b7 ') + (seed !== null && seed !== undefined && seed !== 0 ? ` \u00b7 seed ${seed}` : '');
}

/**
 * One drawing scale for several trees: the same pixels per leaf and per depth in
 * every pane, chosen so the widest and the deepest tree fit. `panes` are
 * {xLo, xHi, yLo, yHi, width, height} (layout extents and CSS pixel size).
 * Each tree is centred in its pane and hangs from the same top line.
 * Returns {kx, ky, views: [{x0, x1, y0, y1}]}.
 */
export function sharedScale(panes, { pad = 26, padLeft = 60 } = {}) {
  if (!panes.length) return { kx: 1, ky: 1, views: [] };
  const spanX = Math.max(2, ...panes.map((p) => p.xHi - p.xLo));
  const spanY = Math.max(1, ...panes.map((p) => p.yHi - p.yLo));
  const kx = Math.min(...panes.map((p) => Math.max(1, p.width - pad - padLeft) / spanX));
  const ky = Math.min(...panes.map((p) => Math.max(1, p.height - 2 * pad) / spanY));
  const y0 = Math.min(...panes.map((p) => p.yLo)) - pad / ky;
  const views = panes.map((p) => {
    // centre the tree in the part of the pane right of the axis labels
    const mid = 0.5 * (p.xLo + p.xHi);
    const inner = (p.width - padLeft) / kx;
    const x0 = mid - inner / 2 - padLeft / kx;
    return { x0, x1: x0 + p.width / kx, y0, y1: y0 + p.height / ky };
  });
  return { kx, ky, views };
}

/**
 * The view of pane `to` that keeps the scale and the relative position of pane
 * `from`'s view (both trees stay centred on their own midlines). Panes as above.
 */
export function followView(view, from, to) {
  const kx = from.width / (view.x1 - view.x0);
  const ky = from.height / (view.y1 - view.y0);
  const dx = view.x0 - 0.5 * (from.xLo + from.xHi);
  const x0 = 0.5 * (to.xLo + to.xHi) + dx;
  return { x0, x1: x0 + to.width / kx, y0: view.y0, y1: view.y0 + to.height / ky };
}

/**
 * The overlaid bound chart's traces: exactly one primal and one dual line per run,
 * in the run's colour (primal solid, dual dashed). `runs`: [{id, index, label,
 * series}] with `series` the server's answer to GET /api/runs/{id}/series.
 */
export function boundTraces(runs) {
  const traces = [];
  for (const r of runs) {
    const colour = runColour(r.index);
    const name = `${runLetter(r.index)} ${r.label}`;
    const s = r.series ?? { primal: { x: [], y: [] }, dual: { x: [], y: [] } };
    traces.push({
      type: 'scatter', mode: 'lines', name: `${name}: primal`, legendgroup: r.id,
      x: s.primal.x, y: s.primal.y, meta: { run: r.id, side: 'primal' },
      line: { color: colour, width: 2, shape: 'hv' },
      hovertemplate: `${runLetter(r.index)} primal %{y:.6g}<extra></extra>`,
    });
    traces.push({
      type: 'scatter', mode: 'lines', name: `${name}: dual`, legendgroup: r.id,
      x: s.dual.x, y: s.dual.y, meta: { run: r.id, side: 'dual' },
      line: { color: colour, width: 2, dash: 'dash', shape: 'hv' },
      hovertemplate: `${runLetter(r.index)} dual %{y:.6g}<extra></extra>`,
    });
  }
  return traces;
}

// The metrics table's columns: [row key, heading, formatter]; lower is better in each.
export const METRIC_COLUMNS = Object.freeze([
  ['nodes', 'Nodes', formatCount],
  ['lp_iterations', 'LP iterations', formatCount],
  ['seconds', 'Seconds', formatSeconds],
  ['first_incumbent_seconds', 'First solution at', formatSeconds],
  ['gap', 'Final gap', formatGap],
  ['primal_integral', 'Primal integral', (v) => formatValue(v, 4)],
  ['max_depth', 'Deepest node', formatCount],
]);

/**
 * The table's cells: per row {runId, status, cells: [{key, text, best}]}, with
 * `best` from the server's marks (best of its model and seed in that column).
 */
export function metricCells(table) {
  const rows = table?.rows ?? [];
  const marks = table?.marks ?? [];
  return rows.map((row, i) => ({
    runId: row.run_id,
    status: row.status,
    cells: METRIC_COLUMNS.map(([key, , fmt]) => ({
      key, text: fmt(row[key]), best: Boolean(marks[i]?.[key]),
    })),
  }));
}

/**
 * The most-branched variables of each run with what they share: per run
 * {runId, top: [{name, count, share, inRuns, inAll}]}, where `inRuns` counts the
 * runs whose top list holds the name. `overlap` is the server's (null: runs of
 * different models, nothing is shared).
 */
export function branchingLists(branched, overlap) {
  const inRuns = overlap?.in_runs ?? {};
  const n = branched?.length ?? 0;
  return (branched ?? []).map((b) => ({
    runId: b.run_id,
    branchings: b.branchings,
    variables: b.variables,
    top: b.top.map((v) => {
      const k = overlap ? (inRuns[v.name] ?? 1) : 1;
      return { name: v.name, count: v.count, share: v.share, inRuns: k, inAll: overlap !== null && n > 1 && k === n };
    }),
  }));
}

/**
 * Sentences about the overlap: the variables every run favours, then each pair's
 * shared count and Jaccard index in one line. `keepPair(idA, idB)` picks the pairs
 * told (default: all).
 */
export function overlapSentences(branched, overlap, letterOf, keepPair = () => true) {
  if (!overlap) return ['The runs are of different models, so their variables are not compared.'];
  const out = [];
  const common = overlap.common ?? [];
  const top = Math.max(0, ...branched.map((b) => b.top.length));
  out.push(common.length
    ? `${common.length} variable${common.length === 1 ? ' is' : 's are'} in every run\u2019s top ${top}: ${common.join(', ')}.`
    : `No variable is in every run\u2019s top ${top}.`);
  const pairs = (overlap.pairs ?? []).filter((p) => keepPair(branched[p.a].run_id, branched[p.b].run_id));
  if (pairs.length) {
    out.push(`Shared by two runs (Jaccard index of their lists): ${pairs.map((p) =>
      `${letterOf(branched[p.a].run_id)} and ${letterOf(branched[p.b].run_id)} ${p.shared.length} (${p.jaccard.toFixed(2)})`).join(' \u00b7 ')}.`);
  }
  return out;
}

/** The runs drawn as trees: `wanted` (in order) if given, else the first MAX_PANES. */
export function shownRuns(ids, wanted = null) {
  const pool = Array.from(new Set(ids));
  const pick = wanted ? wanted.filter((id) => pool.includes(id)) : pool;
  return pick.slice(0, MAX_PANES);
}

/** A line about a group's progress: "3 of 6 runs ended · 1 running · 2 queued". */
export function groupProgress(group) {
  const members = group?.members ?? [];
  const count = (state) => members.filter((m) => m.state === state).length;
  const parts = [`${group?.ended ?? 0} of ${group?.total ?? members.length} runs ended`];
  if (count('running')) parts.push(`${count('running')} running`);
  if (count('queued')) parts.push(`${count('queued')} queued`);
  return parts.join(' \u00b7 ');
}
