// The "Findings" tab: what the server's analysis says about the run
// (GET /api/runs/{id}/findings, codes in docs/findings.md) and the tree-size
// forecast with, for a finished run, its back-test. Each finding shows its
// severity (word and shape), title, evidence in numbers, explanation, what to
// try and its refs: a node ref selects the node, a variable ref highlights the
// nodes branched on it, a row ref shows the row's figures (for a loose big-M
// row, its tightest valid coefficient). A live run is asked again every few
// seconds (forecastfeed.js), and once more when it ends.
//
// The exported helpers above the class are pure (tested under Node).

import { api } from './api.js';
import { el, shapeIcon } from './dom.js';
import { forecastLine, rangeText, RefreshLoop, roughCount, roughSeconds } from './forecastfeed.js';
import { formatCount, formatGap, formatSeconds, formatValue } from './format.js';

// Severity: a word and a shape of its own, so colour is never the only cue.
export const SEVERITY = Object.freeze({
  high: { label: 'High', colour: '#D55E00', // triangle with an exclamation mark cut out
    path: 'M7 0.8L13.6 12.8H0.4ZM6.2 4.6h1.6v4.3h-1.6zM6.2 9.9h1.6v1.6h-1.6z' },
  medium: { label: 'Medium', colour: '#B36B00', path: 'M7 0.6L13.4 7L7 13.4L0.6 7Z' },
  low: { label: 'Low', colour: '#0072B2',
    path: 'M7 1.2a5.8 5.8 0 1 1 0 11.6a5.8 5.8 0 1 1 0-11.6zM7 4a3 3 0 1 0 0 6a3 3 0 1 0 0-6z' },
  info: { label: 'Info', colour: '#5b6169', // a circle with an "i" cut out
    path: 'M7 0.8a6.2 6.2 0 1 1 0 12.4a6.2 6.2 0 1 1 0-12.4zM6.2 6h1.6v5h-1.6zM6.2 3.1h1.6v1.6h-1.6z' },
});

// What the analysis checks, in its own order (analysis/findings.py CODES), for the empty state.
export const CHECKS = Object.freeze([
  ['nonconvex-objective', 'a quadratic objective whose relaxation gives no valid bound', true],
  ['failed-nodes', 'relaxations that gave no usable answer', false],
  ['no-incumbent', 'a search that never found a solution', false],
  ['weak-root', 'a large root gap that the tree closed slowly', false],
  ['loose-big-m', 'big-M coefficients larger than the tightest valid value', true],
  ['dual-stall', 'a dual bound flat over a long stretch while open nodes grew', false],
  ['branching-hotspot', 'a few variables taking most branchings with small gains', false],
  ['infeasible-heavy', 'a large share of infeasible leaves', false],
  ['late-incumbent', 'a first incumbent after half the nodes', false],
  ['bad-scaling', 'coefficient ranges wider than the solver handles well', true],
]);

// Evidence keys -> [label, kind]; other keys get their own name in words.
const EVIDENCE = {
  root_gap: ['Root gap', 'share'],
  root_bound: ['Root bound', 'value'],
  reference: ['Best known value', 'value'],
  reference_kind: ['Best known value is', 'text'],
  processed: ['Nodes solved', 'count'],
  tree_nodes: ['Nodes in the tree', 'count'],
  nodes_to_close_half: ['Nodes to close half the gap', 'count'],
  closed_after_10pct: ['Gap closed after 10% of the nodes', 'share'],
  closed_after_half: ['Gap closed after half the nodes', 'share'],
  final_gap: ['Gap at the end', 'share'],
  rows: ['Rows', 'count'],
  links: ['Row and binary pairs', 'count'],
  largest_ratio: ['Largest excess', 'ratio'],
  median_ratio: ['Median excess', 'ratio'],
  example_row: ['Worst row', 'text'],
  example_coefficient: ['Its coefficient', 'value'],
  example_tightest: ['Tightest valid value', 'value'],
  failed: ['Failed nodes', 'count'],
  share: ['Share', 'share'],
  first_order: ['First failure at solve', 'order'],
  open: ['Nodes waiting', 'count'],
  seconds: ['Seconds', 'seconds'],
  end_status: ['End status', 'text'],
  first_at: ['First incumbent at solve', 'order'],
  time_share: ['Share of the time before it', 'share'],
  primal_integral: ['Primal integral', 'value'],
  primal_integral_average: ['Primal integral per second', 'value'],
  node_order: ['Node order', 'text'],
  from_node: ['Flat from solve', 'order'],
  to_node: ['Flat up to solve', 'order'],
  nodes: ['Nodes in the flat stretch', 'count'],
  open_peak_at: ['Open list longest at solve', 'order'],
  dual_bound: ['Dual bound held at', 'value'],
  moved: ['Dual bound moved by', 'value'],
  moved_share_of_root_gap: ['Moved, share of the root gap', 'share'],
  open_at_start: ['Waiting at the start', 'count'],
  open_peak: ['Waiting at the peak', 'count'],
  open_at_end: ['Waiting at the end', 'count'],
  branchings: ['Branchings', 'count'],
  hot_variables: ['Hot variables', 'count'],
  integer_columns: ['Integer columns', 'count'],
  hot_share: ['Their share of the branchings', 'share'],
  median_gain_share: ['Median gain, share of the root gap', 'share'],
  zero_gain_share: ['Children with no gain', 'share'],
  interchangeable: ['Interchangeable (identical columns)', 'count'],
  infeasible: ['Infeasible nodes', 'count'],
  solved_leaves: ['Solved leaves', 'count'],
  parity_rows: ['Rows with no integer solution', 'count'],
  bad_rows: ['Badly scaled rows', 'count'],
  bad_columns: ['Badly scaled columns', 'count'],
  worst_ratio: ['Worst ratio', 'ratio'],
  worst_row: ['Worst row', 'text'],
  matrix_ratio: ['Matrix range', 'ratio'],
  objective_ratio: ['Objective range', 'ratio'],
  bounds_ratio: ['Bounds range', 'ratio'],
  threshold: ['Threshold', 'ratio'],
  smallest_eigenvalue: ['Smallest eigenvalue', 'value'],
  tolerance: ['Tolerance', 'value'],
  quadratic_columns: ['Quadratic columns', 'count'],
  method: ['Method', 'text'],
  binary_only: ['Only binaries in the quadratic part', 'bool'],
};

const METHOD_LABEL = {
  backtrack: 'weighted backtrack', 'leaf-frequency': 'leaf frequency',
  'tree-weight': 'tree weight', gap: 'gap closing',
};

/** One evidence value in words. */
export function formatEvidence(kind, v) {
  if (v === null || v === undefined) return '\u2014';
  if (typeof v === 'boolean') return v ? 'yes' : 'no';
  if (typeof v === 'string') return v;
  switch (kind) {
    case 'share': return formatGap(v);
    case 'count': return formatCount(v);
    case 'order': return `#${formatCount(v)}`;
    case 'ratio': return `${formatValue(v, 3)}\u00d7`;
    case 'seconds': return formatSeconds(v);
    default: return formatValue(v);
  }
}

/** The evidence as [{key, label, text}], in the server's order. */
export function evidenceItems(evidence) {
  return Object.entries(evidence ?? {}).map(([key, v]) => {
    const [label, kind] = EVIDENCE[key] ?? [key.replace(/_/g, ' ').replace(/^./, (c) => c.toUpperCase()), 'value'];
    return { key, label, text: formatEvidence(kind, v) };
  });
}

/** What a row ref says: the finding's figures for that row, in a sentence (null: none). */
export function rowDetailText(finding, row) {
  const d = (finding.details ?? []).find((x) => x.row === row);
  if (!d) return null;
  if (finding.code === 'loose-big-m') {
    const rhs = d.new_rhs !== d.rhs
      ? `, and the right-hand side ${formatValue(d.rhs)} becomes ${formatValue(d.new_rhs)}`
      : ` (right-hand side ${formatValue(d.rhs)} unchanged)`;
    const side = { '<=': '\u2264', '>=': '\u2265' }[d.side] ?? d.side;
    return `${row} (${side} row): ${d.variable} has the coefficient ${formatValue(d.coefficient)}; ` +
      `the tightest valid value is ${formatValue(d.tightest)}, so write ${formatValue(d.new_coefficient)}` +
      `${rhs}. The other terms reach at most ${formatValue(d.max_activity)} above the right-hand ` +
      `side; the coefficient is ${formatValue(d.ratio, 3)}\u00d7 that.`;
  }
  if (finding.code === 'bad-scaling') {
    return `${row}: |coefficients| from ${formatValue(d.min)} to ${formatValue(d.max)}, ` +
      `a ratio of ${formatValue(d.ratio, 3)}.`;
  }
  const rest = Object.entries(d).filter(([k]) => k !== 'row')
    .map(([k, v]) => `${k.replace(/_/g, ' ')} ${typeof v === 'number' ? formatValue(v) : v}`);
  return `${row}: ${rest.join(', ')}.`;
}

/** The variable index of a name in the tree (the store's names), or -1. */
export function varIndexOf(store, name) {
  for (const [k, v] of Object.entries(store?.varNames ?? {})) if (v === name) return Number(k);
  return -1;
}

/** Rows of the nodes the search branched on variable `v` (their children's bound change), by row. */
export function branchedOn(store, v) {
  const { n, parent } = store;
  const hit = new Uint8Array(n);
  let count = 0;
  for (let r = 0; r < n; r++) {
    const p = parent[r];
    if (p >= 0 && store.var[r] === v && !hit[p]) { hit[p] = 1; count++; }
  }
  const rows = new Int32Array(count);
  for (let r = 0, k = 0; r < n; r++) if (hit[r]) rows[k++] = r;
  return rows;
}

/** The back-test as table rows of text. */
export function backtestRows(points) {
  return (points ?? []).map((p) => ({
    at: `${Math.round(p.fraction * 100)}%`,
    upto: formatCount(p.upto),
    forecast: roughCount(p.forecast),
    range: p.low === null ? '\u2014' : p.high === null ? `\u2265 ${roughCount(p.low)}`
      : `${roughCount(p.low)} \u2013 ${roughCount(p.high)}`,
    truth: formatCount(p.true_total),
    ratio: p.ratio === null ? '\u2014' : `${formatValue(p.ratio, 3)}\u00d7`,
    holds: p.low === null ? '\u2014'
      : p.low <= p.true_total && (p.high === null || p.true_total <= p.high) ? 'yes' : 'no',
  }));
}

const REFS_SHOWN = 12; // chips per kind before "more"
const REF_KINDS = [['nodes', 'Nodes'], ['variables', 'Variables'], ['rows', 'Rows']];

export class FindingsPanel {
  /**
   * root: the panel's element; countEl: the badge in the tab; stripEl: the forecast in
   * the live bar. hooks: {onNode(id) -> bool, onNodes(ids) -> count,
   * onVariable(name) -> count | -1, onVariableTable(name), onClear()}
   */
  constructor(root, countEl, stripEl, hooks = {}) {
    this.root = root;
    this.countEl = countEl;
    this.stripEl = stripEl;
    this.hooks = hooks;
    this.loop = null;
    this.runId = null;
    this._token = 0;
    this.updates = 0;
  }

  // ------------------------------------------------------------ loading
  /** Nothing to ask yet (the tree is loading), or nothing to ask at all (`text` says why). */
  wait(text = 'The findings follow once the tree is loaded.') {
    this.close();
    this.body = null;
    this.countEl.textContent = '';
    this.stripEl.hidden = true;
    this.root.dataset.state = 'waiting';
    this.root.replaceChildren(el('p', { class: 'muted' }, text));
  }

  /** A run opened: ask once (finished or stopped runs), or follow it (live). */
  open(runId, { live = false } = {}) {
    this.stop();
    this.runId = runId;
    this._token++;
    this.body = null;
    this._listKey = null;
    this._open = new Set();
    this._more = new Set();
    this._rowShown = new Map();
    this._openTouched = false;
    this.updates = 0;
    this.countEl.textContent = '';
    this.countEl.removeAttribute('title');
    this.stripEl.hidden = true;
    this.stripEl.textContent = '';
    this.root.dataset.state = 'loading';
    this.root.replaceChildren(el('p', { class: 'muted' }, 'Reading what the run says\u2026'));
    if (live) this.follow();
    else this._once();
  }

  /** Ask every few seconds until stop(); the live bar shows the forecast. */
  follow() {
    this.stop();
    const token = this._token;
    this.live = true;
    this.stripEl.hidden = false;
    this.stripEl.textContent = 'Forecast: waiting for the first nodes';
    this.loop = new RefreshLoop(() => api.findings(this.runId), {
      onResult: (body) => { if (token === this._token) this._show(body); },
      onError: (err) => { if (token === this._token) this._failed(err); },
    });
    this.loop.start();
  }

  /** The run ended: stop asking, and ask once more for the final findings. */
  finish() {
    this.stop();
    this.live = false;
    this._once();
  }

  stop() {
    this.loop?.stop();
    this.loop = null;
  }

  close() {
    this.stop();
    this._token++;
    this.runId = null;
  }

  _once() {
    const token = this._token;
    api.findings(this.runId).then((body) => {
      if (token === this._token) this._show(body);
    }).catch((err) => {
      if (token === this._token) this._failed(err);
    });
  }

  _failed(err) {
    if (this.body) return; // keep what we have; a live run is asked again
    this.root.dataset.state = 'error';
    this.root.replaceChildren(el('p', { class: 'error' }, `The findings could not be computed: ${err.message}`));
  }

  // ------------------------------------------------------------ drawing
  _show(body) {
    this.body = body;
    this.updates++;
    const found = body.findings ?? [];
    this.countEl.textContent = found.length ? `(${found.length})` : '';
    if (found.length) this.countEl.title = `${found.length} finding(s), most severe: ${found[0].severity}`;
    const fc = body.forecast;
    const line = forecastLine(fc);
    if (this.live || !this.stripEl.hidden) {
      this.stripEl.hidden = false;
      this.stripEl.textContent = line.text;
      Object.assign(this.stripEl.dataset, {
        state: line.state, done: String(fc?.done ?? ''), low: String(fc?.low ?? ''),
        high: String(fc?.high ?? ''), updates: String(this.updates),
      });
    }
    // The list is rebuilt only when the findings changed, so a live refresh does not
    // take away the user's place (open cards, focus, scroll).
    const key = JSON.stringify(found);
    if (key !== this._listKey || !this.root.querySelector('.findings-main')) {
      this._listKey = key;
      const side = el('aside', { class: 'findings-side', 'aria-label': 'Forecast of the work left' });
      this.mainEl = el('div', { class: 'findings-main' }, this._head(body), this._markBar(),
        found.length ? this._list(found) : this._empty(body));
      this.sideEl = side;
      this.root.replaceChildren(this.mainEl, side);
    } else {
      this.mainEl.querySelector('.findings-head').replaceWith(this._head(body));
    }
    this.sideEl.replaceChildren(...this._forecast(fc, body.backtest));
    this.root.dataset.state = this.live ? 'live' : 'final';
    this.root.dataset.updates = String(this.updates);
  }

  _head(body) {
    const found = body.findings ?? [];
    const n = found.length;
    const what = n ? `${n} finding${n === 1 ? '' : 's'}, most severe first.` : 'Nothing found.';
    const model = body.model ? `Model checks included (model ${body.model}).`
      : 'Model checks skipped: no model of this name and size in the model library.';
    const live = this.live ? ` Live: asked again every few seconds (as of ${formatCount(body.forecast?.upto ?? 0)} nodes solved).` : '';
    return el('p', { class: 'findings-head muted small' }, `${what} ${model}${live}`);
  }

  _markBar() {
    this.markEl = el('div', { class: 'findings-mark', role: 'status', 'aria-live': 'polite', hidden: true });
    return this.markEl;
  }

  /** Say what a ref click highlighted (null clears the bar). */
  _mark(text, buttons = []) {
    const bar = this.markEl;
    if (!bar) return;
    if (!text) {
      bar.hidden = true;
      bar.replaceChildren();
      return;
    }
    bar.hidden = false;
    bar.replaceChildren(el('span', {}, text), ...buttons,
      el('button', { type: 'button', class: 'small', onclick: () => { this.hooks.onClear?.(); this._mark(null); } },
        'Clear highlight'));
  }

  /** The inspector cleared the highlight itself (Escape, another run). */
  highlightCleared() {
    this._mark(null);
  }

  _list(found) {
    return el('ul', { class: 'findings-list' }, found.map((f, i) => {
      if (i < 2 && !this._openTouched) this._open.add(f.code);
      return this._card(f);
    }));
  }

  _card(f) {
    const sev = SEVERITY[f.severity] ?? SEVERITY.info;
    const details = el('details', { open: this._open.has(f.code) },
      el('summary', {},
        el('span', { class: 'severity', dataset: { severity: f.severity } },
          shapeIcon(sev.path, sev.colour, 14), sev.label),
        el('span', { class: 'finding-title' }, f.title),
        el('code', { class: 'finding-code' }, f.code)),
      el('dl', { class: 'evidence', 'aria-label': `Evidence for ${f.code}` },
        evidenceItems(f.evidence).map((it) => el('div', {},
          el('dt', {}, it.label), el('dd', { dataset: { key: it.key } }, it.text)))),
      el('p', { class: 'explain' }, f.explanation),
      el('p', { class: 'advice' }, el('strong', {}, 'What to try: '), f.advice),
      this._refs(f));
    details.addEventListener('toggle', () => {
      this._openTouched = true;
      if (details.open) this._open.add(f.code);
      else this._open.delete(f.code);
    });
    return el('li', { class: 'finding', dataset: { code: f.code, severity: f.severity } }, details);
  }

  _refs(f) {
    const box = el('div', { class: 'refs' });
    const rowOut = el('p', { class: 'row-detail', role: 'status', hidden: true });
    for (const [kind, label] of REF_KINDS) {
      const items = f.refs?.[kind] ?? [];
      if (!items.length) continue;
      const all = this._more.has(`${f.code}:${kind}`);
      const shown = all ? items : items.slice(0, REFS_SHOWN);
      const chips = shown.map((item) => this._chip(f, kind, item, rowOut));
      const extra = [];
      if (items.length > shown.length) {
        extra.push(el('button', { type: 'button', class: 'small ghost', onclick: () => {
          this._more.add(`${f.code}:${kind}`);
          box.replaceWith(this._refs(f));
        } }, `+${formatCount(items.length - shown.length)} more`));
      }
      if (kind === 'nodes' && items.length > 1) {
        extra.push(el('button', { type: 'button', class: 'small', onclick: () => {
          const k = this.hooks.onNodes?.(items) ?? 0;
          this._mark(`${formatCount(k)} node${k === 1 ? '' : 's'} of ${f.code} highlighted in the tree.`);
        } }, `Highlight all ${formatCount(items.length)}`));
      }
      box.append(el('div', { class: 'ref-line', dataset: { kind } },
        el('span', { class: 'ref-label' }, label), chips, extra));
    }
    const shownRow = this._rowShown.get(f.code);
    if (shownRow) this._showRow(f, shownRow, rowOut);
    box.append(rowOut);
    return box;
  }

  _chip(f, kind, item, rowOut) {
    const text = kind === 'nodes' ? `node ${item}` : String(item);
    const title = kind === 'nodes' ? 'Select this node in the tree'
      : kind === 'variables' ? 'Highlight the nodes branched on this variable'
        : 'Show this row\u2019s figures';
    return el('button', { type: 'button', class: `ref-chip ${kind}`, title, dataset: { ref: String(item) },
      onclick: () => this._ref(f, kind, item, rowOut) }, text);
  }

  _ref(f, kind, item, rowOut) {
    if (kind === 'nodes') {
      const ok = this.hooks.onNode?.(item);
      this._mark(ok ? `Node ${item} selected in the tree.` : `Node ${item} is not in the tree (yet).`);
    } else if (kind === 'variables') {
      const k = this.hooks.onVariable?.(item) ?? -1;
      if (k < 0) this._mark(`The search never branched on ${item}.`);
      else {
        this._mark(`${formatCount(k)} node${k === 1 ? '' : 's'} branched on ${item} highlighted; ` +
          'the shallowest is selected.', [el('button', { type: 'button', class: 'small',
          onclick: () => this.hooks.onVariableTable?.(item) }, 'Show in the branching table')]);
      }
    } else {
      this._rowShown.set(f.code, item);
      this._showRow(f, item, rowOut);
    }
  }

  _showRow(f, row, out) {
    out.hidden = false;
    out.dataset.row = row;
    out.textContent = rowDetailText(f, row) ?? `${row}: this finding names the row but lists no figures for it.`;
  }

  _empty(body) {
    const withModel = Boolean(body.model);
    return el('div', { class: 'findings-empty' },
      el('p', {}, el('strong', {}, 'Nothing found. '),
        'None of the checks fired on this run. What was checked:'),
      el('ul', { class: 'checked' }, CHECKS.map(([code, what, needsModel]) => el('li', {},
        el('code', {}, code), ` ${what}`,
        needsModel && !withModel ? el('span', { class: 'muted' }, ' (skipped: needs the model)') : null))),
      el('p', { class: 'muted small' }, 'Thresholds and their reasons: docs/findings.md.'));
  }

  _forecast(fc, backtest) {
    const out = [el('h3', {}, 'Work left')];
    if (!fc) {
      out.push(el('p', { class: 'muted' }, 'No forecast: the run has no nodes yet.'));
      return out;
    }
    const line = forecastLine(fc);
    out.push(el('p', { class: 'forecast-line', dataset: { state: line.state } }, line.text));
    if (!fc.finished && fc.total_nodes !== null) {
      const highLeft = fc.high === null ? null : Math.max(0, fc.high - fc.done);
      const rows = [
        ['Nodes so far', `${formatCount(fc.done)} (${formatCount(fc.open)} waiting)`],
        ['Expected in all', `~${roughCount(fc.total_nodes)}`],
        ['Range', rangeText(fc.low, fc.high, roughCount)],
        ['Still to come', `~${roughCount(fc.remaining_nodes)} (${rangeText(Math.max(0, fc.low - fc.done), highLeft, roughCount)})`],
        fc.remaining_seconds !== null ? ['Time left', `~${roughSeconds(fc.remaining_seconds)} (${rangeText(
          fc.remaining_seconds_low, fc.remaining_seconds_high, roughSeconds)})`] : null,
        fc.seconds_per_node !== null ? ['Per node, lately', formatSeconds(fc.seconds_per_node)] : null,
      ].filter(Boolean);
      out.push(el('dl', { class: 'forecast-facts' }, rows.map(([k, v]) => el('div', {}, el('dt', {}, k), el('dd', {}, v)))));
      out.push(el('table', { class: 'forecast-methods', 'aria-label': 'Each method\u2019s estimate of the total' },
        el('thead', {}, el('tr', {}, el('th', { scope: 'col' }, 'Method'), el('th', { scope: 'col', class: 'num' }, 'Total nodes'))),
        el('tbody', {}, (fc.methods ?? []).map((m) => el('tr', {},
          el('td', {}, METHOD_LABEL[m.method] ?? m.method),
          el('td', { class: 'num', title: m.note ?? '' }, m.total === null ? `\u2014 ${m.note ? `(${m.note})` : ''}` : roughCount(m.total)))))));
      out.push(el('p', { class: 'muted small' }, 'The point is the median of the methods; the range spans ' +
        'them, at least a factor 2 either side. Time: the nodes left at the recent pace.'));
    }
    if (backtest?.length) {
      const head = el('tr', {}, [['After', 'share of the nodes solved when the forecast was made'],
        ['Forecast', 'forecast of the total tree size'], ['Range', 'the forecast\u2019s range'],
        ['True size', 'the finished tree\u2019s size'], ['Ratio', 'forecast \u00f7 true size'],
        ['Held', 'whether the true size lies in the range']]
        .map(([h, t], i) => el('th', { scope: 'col', class: i ? 'num' : null, title: t }, h)));
      const body = backtestRows(backtest).map((r) => el('tr', {},
        el('td', { title: `${r.upto} nodes solved` }, r.at), el('td', { class: 'num' }, r.forecast),
        el('td', { class: 'num' }, r.range), el('td', { class: 'num' }, r.truth),
        el('td', { class: 'num' }, r.ratio), el('td', { class: 'num' }, r.holds)));
      out.push(el('h3', {}, 'How the forecast did here'),
        el('p', { class: 'muted small' }, 'What the forecast said after part of this run\u2019s nodes, ' +
          'against the tree\u2019s true size.'),
        el('table', { class: 'backtest', 'aria-label': 'Forecast back-test' },
          el('thead', {}, head), el('tbody', {}, body)));
    } else if (fc.finished === false && !this.live) {
      out.push(el('p', { class: 'muted small' }, 'No back-test: the run stopped with nodes still open, so its true size is unknown.'));
    }
    return out;
  }
}
