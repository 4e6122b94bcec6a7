// The comparison page: two to four searches side by side. Trees drawn at one
// shared scale (one TreeView per pane, moved together), the bound curves of all
// runs in one plotly chart, the metrics table with the best value per column
// marked, and the variables each run branched on most with what they share.
// Opened with #compare=id1,id2,... (runs picked in the library) or #group=<id>
// (a comparison started on the server, followed live while it runs).

import { api } from './api.js';
import { decodeTree } from './bintree.js';
import { followSize } from './chartsize.js';
import {
  boundTraces, branchingLists, followView, groupProgress, MAX_PANES, METRIC_COLUMNS,
  metricCells, overlapSentences, runColour, runLabel, runLetter, sharedScale, shownRuns,
} from './compareplan.js';
import { $, el } from './dom.js';
import { formatCount, formatShare } from './format.js';
import { FrameScheduler } from './frame.js';
import { loadPlotly } from './plotlyload.js';
import { statusName } from './statuses.js';
import { TreeStore } from './treestore.js';
import { TreeView } from './treeview.js';

const SERIES_POINTS = 2000; // per line: the server keeps each bucket's extremes
const POLL_MS = 1000; // a running group is asked for its state this often
const REFRESH_MS = 2000; // a running member's tree, curves and the table at most this often

export class ComparePage {
  /** onState(partial): URL state changed; openRun(id): inspect one run */
  constructor({ onState, openRun }) {
    this.onState = onState;
    this.openRun = openRun;
    this.ids = [];
    this.group = null; // the group record while showing one
    this.groupId = null;
    this.table = null;
    this.panes = [];
    this.shown = [];
    this.axis = 'nodes';
    this.series = new Map(); // run id -> {nodes, time} series bodies
    this.meta = new Map(); // run id -> {branching, select, seed, state, nodes}
    this.userMoved = false;
    this.Plotly = null;
    this.chartDrawn = false;
    this._token = 0;
    this._timer = 0;
    this._lastRefresh = new Map();
    this._bound = false;
  }

  // ------------------------------------------------------------ open / close
  async open(state) {
    const key = state.group ? `group:${state.group}` : `runs:${(state.compare ?? []).join(',')}`;
    if (key === this._key) {
      this._setAxis(state.axis ?? 'nodes');
      return;
    }
    this.close();
    this._key = key;
    if (!this._bound) this._bind();
    const token = ++this._token;
    this.axis = state.axis ?? 'nodes';
    this._syncAxisButtons();
    this.userMoved = false;
    this.series = new Map();
    this.meta = new Map();
    this.table = null;
    this.group = null;
    this.groupId = state.group ?? null;
    $('compareTable').replaceChildren();
    $('compareVars').replaceChildren();
    $('compareOverlap').replaceChildren();
    $('compareCancel').hidden = true;
    $('compareProgress').textContent = '';
    $('comparePage').scrollTop = 0;
    this._plotly();
    if (this.groupId) {
      let group;
      try {
        group = await api.group(this.groupId);
      } catch (err) {
        if (token === this._token) this._fail(`This comparison cannot be opened: ${err.message}`);
        return;
      }
      if (token !== this._token) return;
      this._takeGroup(group);
      this.ids = group.members.map((m) => m.run_id);
    } else {
      this.ids = Array.from(new Set(state.compare ?? []));
      if (this.ids.length < 2) {
        this._fail('Pick at least two runs in the library to compare them.');
        return;
      }
      this._title(null);
      $('compareProgress').textContent = `${this.ids.length} runs picked in the library`;
    }
    this.shown = shownRuns(this.ids);
    this._buildPanes();
    await Promise.all([this._loadTable(token), ...this.shown.map((id) => this._loadRun(token, id))]);
    if (token !== this._token) return;
    if (this.group && this.group.state === 'running') this._poll(token);
  }

  close() {
    this._token++;
    this._key = null;
    clearTimeout(this._timer);
    this._timer = 0;
    for (const p of this.panes) p.scheduler.dirty.clear();
    this.panes = [];
    $('comparePanes').replaceChildren();
  }

  _fail(text) {
    $('compareNote').textContent = text;
    $('compareNote').hidden = false;
  }

  _title(group) {
    const model = group?.model ?? this.table?.rows?.[0]?.model ?? '';
    const title = $('runTitle');
    title.replaceChildren(el('span', {}, `Comparison${model ? ` \u00b7 ${model}` : ''}`),
      el('span', { class: 'sub' }, group ? group.name : `${this.ids.length} runs`));
    document.title = `Undergrowth \u2014 comparison${model ? ` of ${model}` : ''}`;
  }

  // ------------------------------------------------------------ group state
  _takeGroup(group) {
    this.group = group;
    for (const m of group.members) this.meta.set(m.run_id, { ...m });
    this._title(group);
    const running = group.state === 'running';
    $('compareProgress').textContent = `${groupProgress(group)} \u00b7 ${group.state}`;
    $('compareProgress').dataset.state = group.state;
    $('compareCancel').hidden = !running;
  }

  _poll(token) {
    this._timer = setTimeout(async () => {
      if (token !== this._token) return;
      let group;
      try {
        group = await api.group(this.groupId);
      } catch (err) {
        $('compareProgress').textContent = `Lost touch with the server: ${err.message}`;
        this._poll(token);
        return;
      }
      if (token !== this._token) return;
      const before = new Map(Array.from(this.meta, ([id, m]) => [id, `${m.state}:${m.nodes}:${m.log}`]));
      this._takeGroup(group);
      const ended = group.state !== 'running';
      const changed = group.members.filter((m) => before.get(m.run_id) !== `${m.state}:${m.nodes}:${m.log}`);
      const now = performance.now();
      for (const m of changed) {
        const due = ended || m.state !== 'running' || now - (this._lastRefresh.get(m.run_id) ?? 0) >= REFRESH_MS;
        if (due && this.shown.includes(m.run_id)) this._loadRun(token, m.run_id);
      }
      if (changed.length && (ended || now - (this._lastRefresh.get('table') ?? 0) >= REFRESH_MS)) {
        this._loadTable(token);
      }
      if (!ended) this._poll(token);
    }, POLL_MS);
  }

  async _cancel() {
    if (!this.groupId) return;
    $('compareCancel').disabled = true;
    try {
      this._takeGroup(await api.cancelGroup(this.groupId));
    } catch (err) {
      $('compareProgress').textContent = `The comparison could not be cancelled: ${err.message}`;
    } finally {
      $('compareCancel').disabled = false;
    }
  }

  // ------------------------------------------------------------ panes
  _indexOf(id) {
    return this.ids.indexOf(id);
  }

  _label(id) {
    const row = this.table?.rows?.find((r) => r.run_id === id);
    const m = this.meta.get(id);
    if (row) return runLabel(row);
    if (m?.branching) return runLabel(m);
    return id;
  }

  _buildPanes() {
    const wrap = $('comparePanes');
    wrap.style.setProperty('--panes', String(Math.max(1, this.shown.length)));
    this.panes = this.shown.map((id) => {
      const index = this._indexOf(id);
      const letter = runLetter(index);
      const canvas = el('canvas', { tabindex: '0', role: 'img', hidden: true,
        'aria-label': `Search tree of run ${letter} (${id}): drag to pan, wheel to zoom; every pane moves together at one scale` });
      const status = el('p', { class: 'tree-status', role: 'status', 'aria-live': 'polite' }, 'Loading the tree\u2026');
      const pick = el('p', { class: 'cmp-pick muted small', 'aria-live': 'polite' });
      const title = el('a', { href: `#run=${encodeURIComponent(id)}`, class: 'cmp-run-link',
        title: `Inspect ${id} on its own` }, this._label(id));
      const figures = el('span', { class: 'cmp-figures muted small' });
      const head = el('header', { class: 'cmp-pane-head', style: `--run:${runColour(index)}` },
        el('span', { class: 'cmp-letter', 'aria-hidden': 'true' }, letter),
        el('span', { class: 'visually-hidden' }, `Run ${letter}: `), title, figures);
      const section = el('section', { class: 'cmp-pane', 'aria-label': `Run ${letter}`, dataset: { run: id } },
        head, el('div', { class: 'cmp-tree-wrap' }, canvas, status), pick);
      wrap.append(section);
      const scheduler = new FrameScheduler();
      const pane = { id, index, letter, canvas, status, pick, title, figures, scheduler, store: null, tree: null };
      pane.tree = new TreeView(canvas, scheduler, {
        onSelect: (row) => this._select(pane, row),
        onView: (v) => this._moved(pane, v),
      });
      return pane;
    });
    this._paneFigures();
  }

  _paneFigures() {
    for (const p of this.panes) {
      const row = this.table?.rows?.find((r) => r.run_id === p.id);
      const m = this.meta.get(p.id);
      p.title.textContent = this._label(p.id);
      const state = m && (m.state === 'running' || m.state === 'queued') ? m.state : null;
      const nodes = row?.nodes ?? m?.nodes;
      const status = state ?? row?.status ?? m?.end_status ?? m?.state;
      p.figures.textContent = nodes === undefined ? '' : `${formatCount(nodes)} nodes \u00b7 ${status ?? ''}`;
    }
  }

  async _loadRun(token, id) {
    this._lastRefresh.set(id, performance.now());
    const pane = this.panes.find((p) => p.id === id);
    const m = this.meta.get(id);
    if (this.groupId && m && !m.log) { // nothing to fetch yet: queued, starting, or never began
      if (pane) pane.status.textContent = memberNote(m);
      return;
    }
    const tree = pane ? api.treeBinary(id).catch((err) => ({ error: err })) : null;
    const series = api.series(id, this.axis, SERIES_POINTS).catch(() => null);
    const other = this.axis === 'nodes' ? 'time' : 'nodes';
    const [buf, body] = await Promise.all([tree, series]);
    if (token !== this._token) return;
    if (body) this.series.set(id, { ...(this.series.get(id) ?? {}), [this.axis]: body, [other]: null });
    this._drawChart();
    if (!pane) return;
    if (!buf || buf.error) {
      const why = buf?.error?.message ?? 'no tree';
      pane.status.textContent = this.groupId && m && m.state !== 'running' && m.state !== 'finished'
        ? memberNote(m) : `The tree cannot be shown: ${why}`;
      return;
    }
    pane.canvas.hidden = false;
    const store = TreeStore.fromDecoded(decodeTree(buf));
    const old = pane.tree.view;
    pane.store = store;
    pane.tree.setStore(store);
    pane.status.textContent = store.n ? '' : 'No nodes yet.';
    if (this.userMoved && old) pane.tree.view = old;
    else this._shareScale();
    pane.tree.mark();
  }

  /** Views of every pane with a tree: one scale, each tree centred, one top line. */
  _shareScale() {
    const ready = this.panes.filter((p) => p.store && p.store.n);
    if (!ready.length) return;
    const geoms = ready.map((p) => this._geom(p));
    const { views } = sharedScale(geoms);
    ready.forEach((p, i) => {
      p.tree.view = views[i];
      p.tree.follow = false;
      p.tree.mark();
    });
  }

  _geom(p) {
    p.tree.scene.update('depth');
    const rect = p.canvas.getBoundingClientRect();
    const [xLo, xHi] = p.tree.scene.xRange;
    const [yLo, yHi] = p.tree.scene.yRange;
    return { xLo, xHi, yLo, yHi, width: Math.max(1, rect.width), height: Math.max(1, rect.height) };
  }

  /** One pane moved (pan, zoom): the others follow at the same scale. */
  _moved(source, view) {
    if (this._following) return;
    this.userMoved = true;
    this._following = true;
    try {
      const from = this._geom(source);
      for (const p of this.panes) {
        if (p === source || !p.store || !p.store.n) continue;
        p.tree.view = followView(view, from, this._geom(p));
        p.tree.follow = false;
        p.tree.mark();
      }
    } finally {
      this._following = false;
    }
  }

  _fitAll() {
    this.userMoved = false;
    this._shareScale();
  }

  _select(pane, row) {
    pane.tree.select(row);
    if (row < 0) {
      pane.pick.textContent = '';
      return;
    }
    const s = pane.store;
    pane.pick.replaceChildren(`Node ${s.id[row]} \u00b7 depth ${s.depth[row]} \u00b7 ${statusName(s.status[row])} `,
      el('a', { href: `#run=${encodeURIComponent(pane.id)}&node=${s.id[row]}` }, 'inspect'));
  }

  // ------------------------------------------------------------ chart
  _plotly() {
    if (this.Plotly) return;
    loadPlotly().then((P) => {
      this.Plotly = P;
      this._drawChart();
    }).catch((err) => {
      $('compareChartNote').textContent = `The chart is unavailable: ${err.message}`;
    });
  }

  _setAxis(axis) {
    if (axis === this.axis) return;
    this.axis = axis;
    this._syncAxisButtons();
    this.onState?.({ axis });
    const token = this._token;
    const missing = this.shown.filter((id) => !this.series.get(id)?.[axis]);
    Promise.all(missing.map(async (id) => {
      const body = await api.series(id, axis, SERIES_POINTS).catch(() => null);
      if (token === this._token && body) this.series.set(id, { ...(this.series.get(id) ?? {}), [axis]: body });
    })).then(() => { if (token === this._token) this._drawChart(); });
    // Redraw at once only when every series is at hand: an empty chart in between flickers.
    if (!missing.length) this._drawChart();
  }

  _syncAxisButtons() {
    for (const b of document.querySelectorAll('[data-compare-axis]')) {
      b.setAttribute('aria-checked', String(b.dataset.compareAxis === this.axis));
    }
  }

  _drawChart() {
    const div = $('compareChart');
    if (!this.Plotly) return;
    const runs = this.shown.filter((id) => this.series.get(id)?.[this.axis]).map((id) => ({
      id, index: this._indexOf(id), label: this._label(id), series: this.series.get(id)[this.axis],
    }));
    const sense = runs[0]?.series?.sense ?? 'min';
    const layout = {
      uirevision: this.axis,
      margin: { l: 64, r: 16, t: 8, b: 46 },
      paper_bgcolor: '#ffffff', plot_bgcolor: '#fbfbf8',
      font: { family: 'system-ui, -apple-system, "Segoe UI", sans-serif', size: 12, color: '#1b1f24' },
      showlegend: true,
      legend: { orientation: 'h', x: 0, y: 1.02, yanchor: 'bottom', bgcolor: 'rgba(0,0,0,0)' },
      hovermode: 'x',
      xaxis: { title: { text: this.axis === 'nodes' ? 'nodes processed' : 'seconds since the start', standoff: 4 },
        zeroline: false, gridcolor: '#ecebe4' },
      yaxis: { title: { text: `objective (${sense === 'max' ? 'higher' : 'lower'} is better)`, standoff: 6 },
        zeroline: false, gridcolor: '#ecebe4', tickformat: '~g' },
    };
    const first = !this.chartDrawn;
    this.chartDrawn = true;
    this.Plotly.react(div, boundTraces(runs), layout, {
      displaylogo: false, responsive: true, scrollZoom: false,
      modeBarButtonsToRemove: ['select2d', 'lasso2d', 'toImage', 'autoScale2d'],
    }).then(() => { if (first) followSize(div); });
    $('compareChartNote').textContent = runs.length
      ? 'Solid: primal bound (best solution so far) \u00b7 dashed: dual bound \u00b7 one colour per run, as in the tree headers. Drag to zoom, double-click to zoom out.'
      : 'Loading the bounds\u2026';
  }

  // ------------------------------------------------------------ table and variables
  async _loadTable(token) {
    this._lastRefresh.set('table', performance.now());
    let table;
    try {
      table = this.groupId ? await api.groupTable(this.groupId) : await api.compareTable(this.ids);
    } catch (err) {
      if (token === this._token) this._fail(`The comparison table cannot be made: ${err.message}`);
      return;
    }
    if (token !== this._token) return;
    this.table = table;
    $('compareNote').hidden = true;
    if (!this.groupId) this._title(null);
    this._renderTable();
    this._renderVars();
    this._paneFigures();
    this._drawChart();
  }

  _renderTable() {
    const cells = metricCells(this.table);
    const head = el('tr', {},
      el('th', { scope: 'col' }, 'Tree'),
      el('th', { scope: 'col' }, 'Run'),
      el('th', { scope: 'col' }, 'Result'),
      METRIC_COLUMNS.map(([, label]) => el('th', { scope: 'col', class: 'num' }, label)));
    const full = this.shown.length >= MAX_PANES;
    const body = cells.map((row) => {
      const index = this._indexOf(row.runId);
      const shown = this.shown.includes(row.runId);
      const letter = runLetter(index);
      const box = el('input', { type: 'checkbox', checked: shown, disabled: (!shown && full) || (shown && this.shown.length <= 1),
        'aria-label': `Draw run ${letter} as a tree and in the chart` });
      box.addEventListener('change', () => this._toggleShown(row.runId, box.checked));
      return el('tr', { dataset: { run: row.runId } },
        el('td', {}, box),
        el('td', {}, el('span', { class: 'cmp-chip', style: `--run:${runColour(index)}`, 'aria-hidden': 'true' }, letter),
          ' ', el('a', { href: `#run=${encodeURIComponent(row.runId)}` }, this._label(row.runId))),
        el('td', {}, row.status ?? '\u2014'),
        row.cells.map((c) => el('td', { class: `num${c.best ? ' best' : ''}`, dataset: { key: c.key } },
          c.text, c.best ? el('span', { class: 'visually-hidden' }, ' (best)') : null)));
    });
    const pending = (this.table.pending ?? []).map((id) => {
      const index = this._indexOf(id);
      return el('tr', { class: 'muted', dataset: { run: id } }, el('td', {}),
        el('td', {}, el('span', { class: 'cmp-chip', style: `--run:${runColour(index)}`, 'aria-hidden': 'true' }, runLetter(index)),
          ' ', this._label(id)),
        el('td', { colspan: String(1 + METRIC_COLUMNS.length) }, memberNote(this.meta.get(id))));
    });
    $('compareTable').replaceChildren(el('thead', {}, head), el('tbody', {}, body, pending));
  }

  _toggleShown(id, on) {
    const next = on ? [...this.shown, id] : this.shown.filter((x) => x !== id);
    this.shown = shownRuns(this.ids, this.ids.filter((x) => next.includes(x)));
    const token = this._token;
    for (const p of this.panes) p.scheduler.dirty.clear();
    $('comparePanes').replaceChildren();
    this._buildPanes();
    this.userMoved = false;
    Promise.all(this.shown.map((x) => this._loadRun(token, x))).then(() => this._renderVars());
    this._renderTable();
  }

  _renderVars() {
    if (!this.table) return;
    const lists = branchingLists(this.table.branched, this.table.overlap);
    const letterOf = (id) => runLetter(this._indexOf(id));
    const cols = this.shown.map((id) => lists.find((l) => l.runId === id)).filter(Boolean);
    const n = lists.length;
    $('compareVars').style.setProperty('--panes', String(Math.max(1, this.shown.length)));
    $('compareVars').replaceChildren(...cols.map((l) => {
      const index = this._indexOf(l.runId);
      const most = Math.max(1, ...l.top.map((v) => v.count));
      return el('section', { class: 'cmp-vars', 'aria-label': `Variables run ${letterOf(l.runId)} branched on most`,
        style: `--run:${runColour(index)}` },
      el('h3', {}, el('span', { class: 'cmp-chip', 'aria-hidden': 'true' }, letterOf(l.runId)), ' ',
        `${formatCount(l.branchings)} branchings on ${formatCount(l.variables)} variables`),
      el('ol', {}, l.top.map((v, k) => el('li', { class: v.inAll ? 'in-all' : v.inRuns > 1 ? 'in-some' : null },
        el('span', { class: 'cmp-rank muted', 'aria-hidden': 'true' }, `${k + 1}.`),
        el('span', { class: 'cmp-var-name', title: v.name }, v.name),
        el('span', { class: 'cmp-bar', style: `width:${Math.max(2, Math.round(40 * v.count / most))}px`, 'aria-hidden': 'true' }),
        el('span', { class: 'num small' }, `${formatCount(v.count)} (${formatShare(v.count, l.branchings)})`),
        n > 1 && this.table.overlap ? el('span', { class: 'cmp-in muted small',
          title: 'In how many runs\u2019 top lists this variable is' },
        v.inAll ? 'in all' : `${v.inRuns} of ${n}`) : null))));
    }));
    const shownSet = new Set(this.shown);
    const keep = overlapSentences(this.table.branched, this.table.overlap, letterOf,
      (a, b) => shownSet.has(a) && shownSet.has(b));
    $('compareOverlap').replaceChildren(...keep.map((s) => el('li', {}, s)));
  }

  // ------------------------------------------------------------ controls
  _bind() {
    this._bound = true;
    for (const b of document.querySelectorAll('[data-compare-axis]')) {
      b.addEventListener('click', () => this._setAxis(b.dataset.compareAxis));
    }
    $('compareFit').addEventListener('click', () => this._fitAll());
    $('compareCancel').addEventListener('click', () => this._cancel());
    window.addEventListener('resize', () => { if (!this.userMoved) this._shareScale(); });
  }
}

/** Why a group member has no tree or row yet, for people. */
function memberNote(m) {
  switch (m?.state) {
    case 'queued': return 'Queued: it starts when a worker is free.';
    case 'running': return 'Starting\u2026';
    case 'cancelled': return 'Cancelled before it began: no run log.';
    case 'failed': return `Failed: ${m.reason ?? 'the solve could not start'}`;
    case 'interrupted': return `Interrupted: ${m.reason ?? 'the server stopped first'}`;
    case 'missing': return 'Its run is no longer in the library.';
    default: return 'No run log yet.';
  }
}
