// The inspector page: loads one run (tree arrays, series, summary) or follows
// a live solve, and wires the tree view, node panel, charts and tables to the
// URL state and the keyboard. Handlers only change state and mark parts dirty;
// the frame scheduler draws.

import { api } from './api.js';
import { decodeTree } from './bintree.js';
import { BoundsChart } from './boundschart.js';
import { BranchTable } from './branchtable.js';
import { ClosedCharts } from './closedcharts.js';
import { $, $all } from './dom.js';
import { ReportExport } from './exportreport.js';
import { FrameScheduler } from './frame.js';
import { closeHelp, isHelpOpen, toggleHelp } from './help.js';
import { branchedOn, FindingsPanel, varIndexOf } from './findingspanel.js';
import { fillHoverCard } from './hovercard.js';
import { actionFor } from './keys.js';
import { buildLegend } from './legend.js';
import { LiveFeed } from './live.js';
import { NodePanel } from './nodepanel.js';
import { loadPlotly, preloadPlotly } from './plotlyload.js';
import { figuresFromDetail, showFigures, showTitle } from './runstrip.js';
import { BoundSeries, relativeGap } from './series.js';
import { countByStatus } from './stats.js';
import { ALL_STATUSES } from './statuses.js';
import { TreeStore } from './treestore.js';
import { TreeView } from './treeview.js';
import { viewFromText, viewToText } from './view.js';
import { Walkthrough } from './walkthrough.js';
import { formatCount } from './format.js';

const SERIES_POINTS = 100000; // the most the server sends; the chart reduces per pixel itself
const LIVE_CHART_MS = 500; // charts and tables follow a live run at most this often

export class Inspector {
  /** onState(partialState): the page's URL state changed (main.js writes the hash) */
  constructor({ onState }) {
    this.onState = onState;
    this.scheduler = new FrameScheduler();
    this.timings = {};
    this.runId = null;
    this.store = null;
    this.series = new BoundSeries();
    this.axis = 'nodes';
    this.tab = 'bounds';
    this.feed = null;
    this._token = 0;
    this._nodeToken = 0;
    this._lastCharts = 0;
    this._pendingNode = null;
    this.panel = new NodePanel($('nodePanel'), {
      onSelectId: (id) => this.selectId(id, { centre: true }),
      onAction: (name) => this.act(name),
    });
    this.tree = new TreeView($('treeCanvas'), this.scheduler, {
      onSelect: (row) => this.selectRow(row),
      onView: (v) => this._viewChanged(v),
      onHover: (hit, x, y) => this._hover(hit, x, y),
      onDrawn: () => this._drawn(),
    });
    this.bounds = new BoundsChart($('boundsChart'), {
      onZoom: () => this.scheduler.mark('bounds'),
      onPick: (x, axis) => this._pickMoment(x, axis),
      onPickNode: (id) => this.selectId(id, { centre: true }),
    });
    this.closed = new ClosedCharts($('statusChart'), $('depthChart'));
    this.branching = new BranchTable($('branchTable'), $('branchNote'), {
      onSelectRow: (row) => { if (row >= 0) this.selectRow(row, { centre: true }); },
    });
    this.findings = new FindingsPanel($('findingsPanel'), $('findingsCount'), $('liveForecast'),
      this._findingHooks());
    this.exporter = new ReportExport($('exportReport'), $('exportStatus'));
    this.legend = buildLegend($('legend'), (code, shown) => {
      const bit = 1 << code;
      this.tree.setStatusMask(shown ? this.tree.statusMask | bit : this.tree.statusMask & ~bit);
    });
    // Painters, in order: apply live events first, then draw what they changed.
    this.scheduler.on('live', () => this._applyLive());
    this.scheduler.on('bounds', () => this._paintBounds());
    this.scheduler.on('cursor', () => this._paintCursor());
    this.scheduler.on('charts', () => this._paintCharts());
    this.plotly = null; // loaded once the first tree is drawn (see _needPlotly)
    this.walk = new Walkthrough(this);
    this._bind();
  }

  // ------------------------------------------------------------ opening a run
  async open(runId, state = {}, { live = false } = {}) {
    if (runId === this.runId) {
      this.apply(state);
      return;
    }
    this.close();
    const token = ++this._token;
    this.runId = runId;
    this.exporter.setRun(runId);
    this.walk.setRun(runId);
    this._pendingStep = state.step ?? null;
    this.series = new BoundSeries();
    this.axis = state.axis ?? 'nodes';
    this.tab = state.tab ?? 'bounds';
    this._pendingNode = state.node ?? null;
    this.tree.layout = state.layout ?? 'depth';
    this.tree.pendingView = viewFromText(state.view);
    this.tree.statusMask = ALL_STATUSES;
    this.legend.reset();
    this._syncControls();
    this.panel.clear();
    this.findings.wait();
    this._clearHighlight();
    showTitle(runId, null);
    $('treeStatus').textContent = 'Loading the tree\u2026';
    $('liveBar').hidden = true;
    this.timings = { open: performance.now() };

    if (live) { // a solve just started: its file may not exist yet, the stream has it all
      preloadPlotly();
      this._needPlotly();
      this._startLive(token, await api.run(runId).catch((err) => ({ error: err })), null, -1);
      return;
    }
    // The tree first: it is what the page is for. Then the run's figures, and plotly's
    // download in parallel (run once the tree is on screen).
    this.timings.treeRequest = performance.now();
    const tree = api.treeBinary(runId).then((buf) => {
      this.timings.treeArrived = performance.now();
      this.timings.treeBytes = buf.byteLength;
      return buf;
    });
    tree.catch(() => null); // handled below
    preloadPlotly();
    // The figures after the arrays have arrived, so the server answers the tree first.
    const detail = tree.catch(() => null).then(() => api.run(runId)).catch((err) => ({ error: err }));
    detail.then((d) => {
      if (token === this._token && !d.error) this._showDetail(d);
    });
    let buffer;
    try {
      buffer = await tree;
    } catch (err) {
      if (token !== this._token) return;
      const d = await detail;
      if (!d.error && (d.status === 'queued' || d.status === 'running')) {
        this._needPlotly();
        this._startLive(token, d, null, -1); // no file yet: follow the stream from its start
        return;
      }
      const why = d.error ? d.error.message : err.message;
      $('treeStatus').textContent = `This run cannot be opened: ${why}`;
      this.findings.wait(`No findings: this run cannot be opened (${why}).`);
      this._needPlotly();
      return;
    }
    if (token !== this._token) return;
    const store = TreeStore.fromDecoded(decodeTree(buffer));
    this.timings.treeDecoded = performance.now();
    this._setStore(store);
    this.timings.storeSet = performance.now();
    this._loadSeries(token, this.axis);
    if (store.live) this._startLive(token, null, store, store.events - 1);
    else this.findings.open(runId);
    if (this._pendingStep !== null && !store.live) this.walk.start(this._pendingStep); // #run=…&step=k
    this._pendingStep = null;
  }

  /** Run plotly's script now (after the first tree draw, or at once without a tree). */
  _needPlotly() {
    if (this.plotly) return this.plotly;
    this.plotly = loadPlotly().then((P) => {
      this.bounds.attach(P);
      this.closed.attach(P);
      this.timings.plotlyLoaded = performance.now();
      this.scheduler.mark('bounds', 'charts');
      return P;
    }).catch((err) => {
      $('boundsNote').textContent = `Charts are unavailable: ${err.message}`;
    });
    return this.plotly;
  }

  close() {
    this.walk.close();
    this.feed?.stop();
    this.feed = null;
    this.findings.close();
    this.exporter.setRun(null);
    this.runId = null;
    this.store = null;
    this._token++;
  }

  _showDetail(d) {
    this.detail = d;
    this.figures = figuresFromDetail(d);
    if (this.feed && !this.feed.ended) this.liveFigures = { ...this.figures, ...this.liveFigures };
    showFigures(this.figures);
    showTitle(this.runId, this.figures);
  }

  _setStore(store) {
    this.store = store;
    this.tree.setStore(store);
    $('treeStatus').textContent = store.n ? '' : 'No nodes yet.';
    this._awaitFirstDraw = true;
    if (this.series.incumbents.length) store.setIncumbents(this.series.incumbents);
    if (this._pendingNode !== null) {
      const row = store.rowOf(this._pendingNode);
      this._pendingNode = null;
      if (row >= 0) this.selectRow(row, { centre: !this.tree.pendingView, push: false });
    }
    this.branchingVersion = -1; // computed when the table is first shown
    this.walk.setStore(store);
    this.scheduler.mark('charts', 'bounds');
  }

  async _loadSeries(token, axis) {
    try {
      const body = await api.series(this.runId, axis, SERIES_POINTS);
      if (token !== this._token) return;
      this.series.setFromServer(axis, body);
      if (this.store) {
        this.store.setIncumbents(this.series.incumbents);
        this.tree.scene?.update(this.tree.layout);
        this.tree.mark();
      }
      this.scheduler.mark('bounds');
    } catch (err) {
      $('boundsNote').textContent = `The bounds could not be loaded: ${err.message}`;
    }
  }

  // ------------------------------------------------------------ live
  /**
   * Follow a live run: `store` already holds the events up to `lastId` (from the
   * tree arrays), or is null to build the tree from the stream's first event.
   */
  _startLive(token, d, store, lastId) {
    if (token !== this._token) return;
    this._needPlotly();
    if (d && !d.error) this._showDetail(d);
    if (!store) {
      store = new TreeStore(1024);
      store.sense = d?.summary?.sense ?? d?.header?.model?.sense ?? 'min';
      this._senseKnown = Boolean(d?.header);
      this._setStore(store);
      $('treeStatus').textContent = 'Waiting for the first nodes\u2026';
    } else this._senseKnown = true;
    this.liveFigures = { ...(this.figures ?? {}), status: 'running', nodes: store.maxOrder + 1 };
    this.liveEnd = null;
    delete $('liveBar').dataset.state;
    $('liveBar').hidden = false;
    $('liveBar').classList.remove('done');
    $('liveCancel').hidden = false;
    $('liveText').textContent = 'Live: connecting\u2026';
    this.feed = new LiveFeed(this.runId, {
      onEvents: () => this.scheduler.mark('live'),
      onState: (s) => { this.liveState = s; this.scheduler.mark('live'); },
      onEnd: (info) => this._liveEnded(token, info),
    });
    this.feed.start(lastId);
    this.walk.syncAvailability(); // no walkthrough until the search ends
    // The run log may not exist before the first node: ask for findings only then.
    this._findingsLive = false;
    if (store.n > 0) this._followFindings();
    else this.findings.wait('The findings and the forecast follow once the first nodes arrive.');
  }

  _followFindings() {
    this._findingsLive = true;
    this.findings.open(this.runId, { live: true }); // the forecast follows the run
  }

  _applyLive() {
    const feed = this.feed;
    const store = this.store;
    if (!store) return;
    if (feed && feed.queue.length) {
      // Big trees are re-laid out less often: events wait in the queue meanwhile.
      const wait = store.n < 20000 ? 0 : store.n < 200000 ? 200 : 600;
      const now = performance.now();
      if (now - (this._lastApply ?? 0) < wait) {
        setTimeout(() => this.scheduler.mark('live'), wait);
      } else {
        this._lastApply = now;
        const events = feed.drain();
        const added = store.appendEvents(events);
        this.series.appendEvents(events);
        for (const ev of events) this._trackFigures(ev);
        if (added) {
          $('treeStatus').textContent = '';
          this.tree.grew();
          if (!this._findingsLive) this._followFindings();
          if (!this._senseKnown) this._learnSense();
          if (this._pendingNode !== null && store.rowOf(this._pendingNode) >= 0) {
            const id = this._pendingNode;
            this._pendingNode = null;
            this.selectId(id);
          }
        }
        this._chartsDue = true;
        showFigures(this.liveFigures);
      }
    }
    if (this._chartsDue) this._refreshLiveCharts(feed, store);
    this._showLiveState();
  }

  /**
   * Legend counts and charts follow a live run at most every LIVE_CHART_MS. A refresh
   * put off stays due until it is done, even when no further batch comes (the last
   * batch of a run often lands just after a refresh).
   */
  _refreshLiveCharts(feed, store) {
    const now = performance.now();
    if (now - this._lastCharts > LIVE_CHART_MS || !feed || feed.ended) {
      this._chartsDue = false;
      this._lastCharts = now;
      this.legend.setCounts(countByStatus(store.status, store.n));
      this.scheduler.mark('bounds', 'charts');
    } else if (!this._chartsTimer) {
      this._chartsTimer = setTimeout(() => {
        this._chartsTimer = null;
        this.scheduler.mark('live');
      }, LIVE_CHART_MS);
    }
  }

  /** A live run's sense comes from its header, which the stream does not carry. */
  async _learnSense() {
    this._senseKnown = true;
    const token = this._token;
    try {
      const d = await api.run(this.runId);
      if (token !== this._token || !d.header) {
        this._senseKnown = false;
        return;
      }
      this.store.sense = d.header.model?.sense ?? this.store.sense;
      this.liveFigures = { ...figuresFromDetail(d), ...this.liveFigures, sense: this.store.sense,
        model: d.header.model?.name, branching: d.header.settings?.branching,
        select: d.header.settings?.select };
      showTitle(this.runId, this.liveFigures);
      this.store.version++;
      this.tree.mark();
      this.scheduler.mark('bounds');
    } catch {
      this._senseKnown = false;
    }
  }

  _trackFigures(ev) {
    const f = this.liveFigures;
    if (ev.kind === 'node' && ev.order !== null && ev.order !== undefined) f.nodes = Math.max(f.nodes ?? 0, ev.order + 1);
    if (ev.kind === 'incumbent') f.objective = ev.objective;
    if (ev.kind === 'progress') {
      f.dual = ev.dual_bound ?? f.dual;
      f.nodes = Math.max(f.nodes ?? 0, ev.nodes ?? 0);
      f.seconds = ev.time;
      f.gap = ev.gap ?? relativeGap(f.objective, f.dual);
    }
    if (ev.kind === 'end') {
      Object.assign(f, { status: ev.status, objective: ev.objective, dual: ev.dual_bound,
        gap: ev.gap, nodes: ev.nodes, seconds: ev.time });
    }
  }

  async _liveEnded(token, info) {
    this.liveEnd = info;
    this.walk.syncAvailability();
    this.scheduler.mark('live'); // the last events are applied, then the bar says finished
    try {
      const d = await api.run(this.runId);
      if (token !== this._token) return;
      this._showDetail(d);
      if (this.store && d.summary?.sense) this.store.sense = d.summary.sense;
      this.liveEnd = { ...info, status: d.status ?? info.status };
      this.scheduler.mark('live');
    } catch {
      // the figures from the stream stay
    }
    if (token !== this._token) return;
    if (this._findingsLive) this.findings.finish(); // final findings and the back-test
    else if (this.store?.n > 0) this.findings.open(this.runId);
    else this.findings.wait('No findings: the search ended before its first node.');
  }

  _showLiveState() {
    const feed = this.feed;
    const f = this.liveFigures ?? {};
    const text = $('liveText');
    if (feed?.ended && !feed.queue.length) {
      const status = this.liveEnd?.status ?? f.status ?? 'finished';
      $('liveCancel').hidden = true;
      $('liveBar').classList.add('done');
      $('liveBar').dataset.state = 'ended';
      text.textContent = `Finished (${status}): ${formatCount(this.store?.n ?? 0)} nodes in the tree`;
      return;
    }
    const state = this.liveState === 'retrying' ? 'reconnecting' : 'running';
    text.textContent = `Live (${state}): ${formatCount(f.nodes ?? 0)} nodes solved so far`;
  }

  // ------------------------------------------------------------ selection
  selectId(id, opts = {}) {
    if (!this.store) return false;
    const row = this.store.rowOf(id);
    if (row < 0) return false;
    this.selectRow(row, opts);
    return true;
  }

  selectRow(row, { centre = false, push = true } = {}) {
    const store = this.store;
    if (!store) return;
    if (this.walk.on) { // the walkthrough: a node is reached through its step
      if (row >= 0) this.walk.goToRow(row);
      return;
    }
    this.tree.select(row, { centre });
    if (row < 0) {
      this.panel.clear();
      if (push) this.onState({ node: null });
      return;
    }
    const id = store.id[row];
    this.panel.showQuick(store, row);
    if (push) this.onState({ node: id });
    const token = ++this._nodeToken;
    api.node(this.runId, id).then((detail) => {
      if (token === this._nodeToken && this.store === store) this.panel.showDetail(store, row, detail);
    }).catch((err) => {
      if (token === this._nodeToken && this.store === store) this.panel.showError(store, row, err);
    });
  }

  _pickMoment(x, axis) {
    if (!this.store) return;
    const row = axis === 'nodes' ? this.store.rowAtOrder(Math.max(0, Math.round(x) - 1))
      : this.store.rowAtTime(x);
    if (row >= 0) this.selectRow(row, { centre: true });
  }

  // ------------------------------------------------------------ findings' refs
  _findingHooks() {
    return {
      onNode: (id) => {
        const ok = this.selectId(id);
        if (ok) this.tree.centreOnRow(this.tree.selected); // centred, even when on screen
        return ok;
      },
      onNodes: (ids) => {
        const rows = ids.map((id) => this.store?.rowOf(id) ?? -1).filter((r) => r >= 0);
        this.tree.setHighlight(Int32Array.from(rows));
        return rows.length;
      },
      onVariable: (name) => {
        const v = varIndexOf(this.store, name);
        if (v < 0) return -1;
        const rows = branchedOn(this.store, v);
        this.tree.setHighlight(rows);
        this.branching.markVar(v);
        let best = -1; // the shallowest, first solved on ties
        for (const r of rows) {
          if (best < 0 || this.store.depth[r] < this.store.depth[best] ||
            (this.store.depth[r] === this.store.depth[best] && this.store.order[r] < this.store.order[best])) best = r;
        }
        if (best >= 0) {
          this.selectRow(best);
          this.tree.centreOnRow(best);
        }
        return rows.length;
      },
      onVariableTable: (name) => {
        this.branching.markVar(varIndexOf(this.store, name));
        this.setTab('branching');
      },
      onClear: () => this._clearHighlight(),
    };
  }

  _clearHighlight() {
    this.tree.setHighlight(null);
    this.branching.markVar(-1);
    this.findings.highlightCleared();
  }

  // ------------------------------------------------------------ actions
  act(action) {
    const t = this.tree;
    const store = this.store;
    const sel = t.selected;
    const kids = () => (sel >= 0 ? t.scene.childrenOf(sel) : []);
    switch (action) {
      case 'fit': t.fit(); break;
      case 'zoom-in': t.zoom(1.6, 1); break;
      case 'zoom-out': t.zoom(1 / 1.6, 1); break;
      case 'toggle-layout': this.setLayout(t.layout === 'depth' ? 'bound' : 'depth'); break;
      case 'parent': if (sel >= 0 && store.parent[sel] >= 0) this.selectRow(store.parent[sel], { centre: true }); break;
      case 'down-child': { const k = kids(); if (k.length) this.selectRow(k[0], { centre: true }); break; }
      case 'up-child': { const k = kids(); if (k.length) this.selectRow(k[k.length - 1], { centre: true }); break; }
      case 'root': if (store?.n) this.selectRow(t.scene.children.roots[0], { centre: true }); break;
      case 'incumbent': {
        const rows = store?.incumbentRows ?? [];
        if (rows.length) this.selectRow(rows[rows.length - 1], { centre: true });
        break;
      }
      case 'zoom-subtree': if (sel >= 0) t.zoomToSubtree(sel); break;
      case 'fold': if (sel >= 0) { t.toggleFold(sel); $('unfoldAll').hidden = !t.scene.foldedCount; } break;
      case 'find': $('findInput').focus(); $('findInput').select(); break;
      case 'tab-bounds': this.setTab('bounds'); break;
      case 'tab-closed': this.setTab('closed'); break;
      case 'tab-branching': this.setTab('branching'); break;
      case 'tab-findings': this.setTab('findings'); break;
      case 'toggle-axis': this.setAxis(this.axis === 'nodes' ? 'time' : 'nodes'); break;
      case 'clear':
        if (isHelpOpen()) closeHelp();
        else {
          this.selectRow(-1);
          this._clearHighlight();
        }
        break;
      case 'help': toggleHelp(); break;
      case 'walk-toggle': this.walk.toggle(); break;
      case 'walk-next': this.walk.go(this.walk.step + 1); break;
      case 'walk-prev': this.walk.go(this.walk.step - 1); break;
      case 'walk-first': this.walk.go(0); break;
      case 'walk-last': this.walk.go(this.walk.total - 1); break;
      case 'walk-play': this.walk.togglePlay(); break;
      case 'walk-faster': this.walk.faster(1); break;
      case 'walk-slower': this.walk.faster(-1); break;
      case 'walk-incumbent': this.walk.jump('incumbent', 1); break;
      case 'walk-incumbent-back': this.walk.jump('incumbent', -1); break;
      case 'walk-prune': this.walk.jump('prune', 1); break;
      case 'walk-prune-back': this.walk.jump('prune', -1); break;
      case 'walk-finding': this.walk.jump('finding', 1); break;
      case 'walk-finding-back': this.walk.jump('finding', -1); break;
      default: break;
    }
  }

  setLayout(layout) {
    this.tree.setLayout(layout);
    this._syncControls();
    this.onState({ layout, view: null });
  }

  setTab(tab) {
    this.tab = tab;
    this._syncControls();
    this.scheduler.mark('bounds', 'charts');
    this.onState({ tab });
  }

  setAxis(axis) {
    if (axis === this.axis) return;
    this.axis = axis;
    this._syncControls();
    if (!this.series.axes[axis].loaded && !this.feed) this._loadSeries(this._token, axis);
    this.scheduler.mark('bounds');
    this.onState({ axis });
  }

  /** Apply URL state for the run already open (back/forward, edited links). */
  apply(state) {
    if (state.layout && state.layout !== this.tree.layout) this.tree.setLayout(state.layout);
    if (state.tab && state.tab !== this.tab) {
      this.tab = state.tab;
      this.scheduler.mark('bounds', 'charts');
    }
    if (state.axis && state.axis !== this.axis) this.setAxis(state.axis);
    const v = viewFromText(state.view);
    if (v) this.tree._setView(v);
    if (state.step !== null && state.step !== undefined && this.store) {
      if (!this.walk.on || this.walk.step !== state.step) this.walk.go(state.step);
    } else if (this.walk.on && state.step === null) this.walk.stop();
    if (state.node !== null && state.node !== undefined && this.store && !this.walk.on &&
        this.store.id[this.tree.selected] !== state.node) this.selectId(state.node, { centre: !v, push: false });
    this._syncControls();
  }

  _syncControls() {
    for (const b of $all('layoutButtons')) b.setAttribute('aria-checked', String(b.dataset.layout === this.tree.layout));
    for (const b of $all('axisButtons')) b.setAttribute('aria-checked', String(b.dataset.axis === this.axis));
    for (const tab of $all('tabs')) {
      const on = tab.dataset.tab === this.tab;
      tab.setAttribute('aria-selected', String(on));
      tab.tabIndex = on ? 0 : -1;
    }
    for (const p of $all('tabPanels')) p.hidden = p.id !== `panel-${this.tab}`;
    $('axisTools').hidden = this.tab !== 'bounds';
  }

  // ------------------------------------------------------------ painters
  _paintBounds() {
    if (this.tab !== 'bounds' || !this.bounds.Plotly) return;
    this.bounds.setSeries(this.series, this.axis, this.store?.sense ?? this.figures?.sense);
    this.bounds.setCursor(this.walk.cursorX(this.axis));
    const t0 = performance.now();
    this.bounds.render().then(() => {
      this.timings.boundsDrawn = performance.now();
      this.timings.boundsMs = this.timings.boundsDrawn - t0;
      $('boundsNote').textContent = this.bounds.note();
    });
  }

  /** The walkthrough's cursor on the bounds chart (one shape moved, the traces stay). */
  _paintCursor() {
    this.bounds.setCursor(this.walk.cursorX(this.axis));
    if (this.tab === 'bounds') this.bounds.moveCursor();
  }

  _paintCharts() {
    if (!this.store) return;
    if (this.tab === 'closed' && this.closed.Plotly) this.closed.render(this.store);
    if (this.tab === 'branching') {
      if (this.branchingVersion !== this.store.version) {
        this.branching.compute(this.store);
        this.branchingVersion = this.store.version;
      }
      this.branching.render();
    }
  }

  _drawn() {
    if (this._awaitFirstDraw && this.store?.n) {
      this._awaitFirstDraw = false;
      this.timings.firstDraw = performance.now();
      this.legend.setCounts(this.tree.scene.totals);
      this.timings.firstPaintStart = this.tree.paintStarted;
      this.timings.firstDrawMs = this.tree.lastDraw.ms;
      this.timings.firstSceneMs = this.tree.lastDraw.sceneMs;
      setTimeout(() => this._needPlotly(), 0); // after this frame is on screen
    }
  }

  _hover(hit, x, y) {
    const card = $('hoverCard');
    if (!hit || !this.store) {
      card.hidden = true;
      return;
    }
    fillHoverCard(card, hit, this.store, this.tree.scene, x, y, $('treeWrap').getBoundingClientRect());
  }

  _viewChanged(v) {
    clearTimeout(this._viewTimer);
    this._viewTimer = setTimeout(() => this.onState({ view: viewToText(v) }), 400);
  }

  // ------------------------------------------------------------ controls
  _bind() {
    for (const b of $all('layoutButtons')) b.addEventListener('click', () => this.setLayout(b.dataset.layout));
    for (const b of $all('axisButtons')) b.addEventListener('click', () => this.setAxis(b.dataset.axis));
    for (const tab of $all('tabs')) tab.addEventListener('click', () => this.setTab(tab.dataset.tab));
    $('fitButton').addEventListener('click', () => this.act('fit'));
    $('zoomIn').addEventListener('click', () => this.act('zoom-in'));
    $('zoomOut').addEventListener('click', () => this.act('zoom-out'));
    $('unfoldAll').addEventListener('click', () => {
      this.tree.unfoldAll();
      $('unfoldAll').hidden = true;
    });
    $('findForm').addEventListener('submit', (e) => {
      e.preventDefault();
      const text = $('findInput').value.trim();
      const msg = $('findMessage');
      if (!/^\d+$/.test(text)) {
        msg.textContent = 'Type a node id (a whole number).';
        return;
      }
      const ok = this.selectId(Number(text), { centre: true });
      msg.textContent = ok ? '' : `No node ${text} in this run.`;
      if (ok) $('treeCanvas').focus();
    });
    const depth = () => {
      const lo = $('depthMin').value === '' ? NaN : Number($('depthMin').value);
      const hi = $('depthMax').value === '' ? NaN : Number($('depthMax').value);
      this.tree.setDepthRange(lo, hi);
    };
    $('depthMin').addEventListener('input', depth);
    $('depthMax').addEventListener('input', depth);
    $('liveCancel').addEventListener('click', async () => {
      $('liveCancel').disabled = true;
      try {
        await api.cancel(this.runId);
        $('liveText').textContent = 'Cancelling: the search stops after its current node\u2026';
      } catch (err) {
        $('liveText').textContent = `Could not cancel: ${err.message}`;
      } finally {
        $('liveCancel').disabled = false;
      }
    });
    document.addEventListener('keydown', (e) => this._key(e));
  }

  _key(e) {
    if ($('inspectorPage').hidden) return;
    if (e.ctrlKey || e.metaKey || e.altKey) return;
    const target = e.target;
    const typing = target && (target.tagName === 'INPUT' || target.tagName === 'SELECT' ||
      target.tagName === 'TEXTAREA' || target.isContentEditable);
    if (typing) {
      if (e.key === 'Escape') target.blur();
      return;
    }
    if (isHelpOpen() && e.key !== 'Escape' && e.key !== '?') return;
    const action = actionFor(e.key);
    if (!action) return;
    if (action.startsWith('walk-') && action !== 'walk-toggle' && !this.walk.on) return;
    if (action === 'pan') {
      const step = 80;
      const d = { ArrowLeft: [step, 0], ArrowRight: [-step, 0], ArrowUp: [0, step], ArrowDown: [0, -step] }[e.key];
      if (target && target.closest && target.closest('.js-plotly-plot, table')) return;
      this.tree.pan(d[0], d[1]);
    } else this.act(action);
    e.preventDefault();
  }
}
