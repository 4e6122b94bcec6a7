// The walkthrough: the inspector replays the search one step (one solved
// relaxation) at a time. The tree shows only the nodes solved so far (from the
// tree arrays' processing orders, so the tree never waits for the network), the
// current step's node is selected, the bounds chart carries a cursor, and the
// side pane shows the server's narration of the step (fetched a page at a time
// and cached: playing at 50 steps per second asks for one page every 4 s) and
// the reviewers' notes.

import { api } from './api.js';
import { $, $all, el } from './dom.js';
import { formatCount, formatGap, formatValue } from './format.js';
import { statusIcon } from './legend.js';
import { NotesPanel } from './notespanel.js';
import { countByStatus } from './stats.js';
import { STATUS_COUNT, STATUS_NAMES } from './statuses.js';
import { parentsFirst } from './tidy.js';
import {
  clampSpeed, clampStep, counterText, findFlagged, nextAfter, notesByStep, playedTo, prevBefore,
  SPEEDS, solvedRanks, StepPages, stepOfOrder, stepToX, subtreeLastStep, visibleCount, xToStep,
} from './walkplan.js';

const HASH_DELAY_MS = 300; // the URL follows a playing walkthrough at most this often
const NO_NOTES = { byStep: new Map(), steps: [], nodeIds: new Set() };

export class Walkthrough {
  /** ins: the Inspector (its tree, bounds chart, scheduler, store and onState). */
  constructor(ins) {
    this.ins = ins;
    this.on = false;
    this.step = 0;
    this.playing = false;
    this.speed = clampSpeed(Number($('walkSpeed').value));
    this.runId = null;
    this.store = null;
    this.ranks = null; // {rank, rows} of the store's version `_ranksVersion`
    this.span = null;
    this._ranksVersion = -1;
    this.pages = null;
    this.noteInfo = NO_NOTES;
    this._raf = 0;
    this._hashTimer = 0;
    this._jumpToken = 0;
    this.notesPanel = new NotesPanel($('notesPanel'), $('notesCount'), {
      onJump: (note) => {
        const k = this._stepOfNote(note);
        if (k >= 0) this.go(k);
      },
      onChange: (notes) => this._notesChanged(notes),
      stepOf: (note) => this._stepOfNote(note),
    });
    this._bind();
  }

  // ------------------------------------------------------------ state for tests
  get total() {
    return this.ranks ? this.ranks.rows.length : 0;
  }

  /** Nodes the tree shows now: those solved by the current step (all of them when off). */
  get visibleCount() {
    if (!this.store) return 0;
    if (!this.on || !this.ranks) return this.store.n;
    return visibleCount(this.ranks.rank, this.store.n, this.step);
  }

  /** Node ids that carry a note and are drawn with a tag now. */
  get noteNodes() {
    const rows = this.ins.tree.noteRows;
    if (!rows || !this.store || !this.ranks) return [];
    const out = [];
    for (const r of rows) if (this.ranks.rank[r] >= 0 && this.ranks.rank[r] <= this.step) out.push(this.store.id[r]);
    return out.sort((a, b) => a - b);
  }

  state() {
    return { on: this.on, step: this.step, total: this.total, visible: this.visibleCount,
      playing: this.playing, speed: this.speed, requests: this.pages?.requests ?? 0,
      node: this.on && this.ranks ? this.store.id[this.ranks.rows[this.step]] : null,
      noteNodes: this.noteNodes, noteSteps: this.noteInfo.steps.slice() };
  }

  // ------------------------------------------------------------ run and store
  setRun(runId) {
    this.close();
    this.runId = runId;
    this.pages = new StepPages((start, count) => api.steps(runId, start, count));
    this.notesLoadedFor = null;
  }

  setStore(store) {
    this.store = store;
    this.ranks = null;
    this._ranksVersion = -1;
    this.syncAvailability();
  }

  /** A run still being solved has no fixed steps yet: the button waits for its end. */
  available() {
    const feed = this.ins.feed;
    return Boolean(this.store && this.store.n > 0 && !(feed && !feed.ended));
  }

  syncAvailability() {
    const ok = this.available();
    const b = $('walkToggle');
    b.disabled = !ok;
    b.title = ok ? 'Step through the search one solved node at a time, with the narration and the reviewers\u2019 notes (W)'
      : 'The walkthrough opens once the run\u2019s tree is loaded and its search has ended';
  }

  close() {
    this.pause({ write: false }); // the page is going elsewhere: leave the URL alone
    if (this.on) this._setMode(false);
    this.on = false;
    this.notesPanel.close();
    clearTimeout(this._hashTimer);
    this.runId = null;
    this.store = null;
    this.ranks = null;
    this.pages = null;
    this.noteInfo = NO_NOTES;
  }

  _prepare() {
    const s = this.store;
    if (this.ranks && this._ranksVersion === s.version) return;
    this.ranks = solvedRanks(s.order, s.n);
    const scene = this.ins.tree.scene;
    scene?.update(this.ins.tree.layout);
    const topDown = parentsFirst(s.parent, s.n) ? null : scene?.topDown ?? null;
    this.span = subtreeLastStep(s.parent, this.ranks.rank, s.n, topDown);
    this._ranksVersion = s.version;
    this._counts = null; // the legend's counts follow the new ranks
  }

  /**
   * The legend counts the nodes the tree shows at step k. Moved step by step from the
   * last count (playing costs one row a step), or counted afresh when that is shorter.
   */
  _legendAt(k) {
    const rows = this.ranks.rows;
    const status = this.store.status;
    if (!this._counts || Math.abs(k - this._countsStep) > k + 1) {
      this._counts = new Uint32Array(STATUS_COUNT);
      this._countsStep = -1;
    }
    const c = this._counts;
    let at = this._countsStep;
    while (at < k) c[status[rows[++at]]]++;
    while (at > k) c[status[rows[at--]]]--;
    this._countsStep = at;
    this.ins.legend.setCounts(c);
  }

  // ------------------------------------------------------------ on / off
  /** Turn the walkthrough on at step k (the current one when undefined). */
  start(k) {
    if (!this.available()) return false;
    this._prepare();
    if (!this.total) {
      this._say('This run has no solved node to step through.');
      return false;
    }
    const first = !this.on;
    if (first) this._setMode(true);
    if (this.notesLoadedFor !== this.runId) {
      this.notesLoadedFor = this.runId;
      this.notesPanel.open(this.runId);
    }
    if (this.pages.total === null) this.pages.get(0).then(() => this._renderTicks()).catch((err) => {
      this._say(`The narration could not be loaded: ${err.message}`);
    });
    this._show(k === undefined ? this.step : k, { hash: first });
    return true;
  }

  stop() {
    if (!this.on) return;
    this.pause();
    const row = this.ranks?.rows[this.step] ?? -1;
    this.on = false;
    this._setMode(false);
    clearTimeout(this._hashTimer);
    this.ins.onState({ step: null });
    if (row >= 0) this.ins.selectRow(row, { centre: true }); // the node panel takes over there
  }

  toggle() {
    if (this.on) this.stop();
    else this.start();
  }

  _setMode(on) {
    this.on = on;
    const t = this.ins.tree;
    $('walkBar').hidden = !on;
    $('walkSide').hidden = !on;
    $('nodeSection').hidden = on;
    $('walkToggle').setAttribute('aria-pressed', String(on));
    $('inspectorPage').classList.toggle('walking', on);
    if (!on) {
      t.setReveal(null);
      t.setNoteRows(null);
      if (this.store) this.ins.legend.setCounts(countByStatus(this.store.status, this.store.n));
      this.ins.bounds.setCursor(null);
      this.ins.scheduler.mark('cursor');
    }
    if (t.follow) t.view = null; // the pane changed size: fit again at the next frame
    t.mark();
  }

  // ------------------------------------------------------------ moving
  /** Go to step k (pauses a playing walkthrough). */
  go(k) {
    if (!this.on) return this.start(k);
    this.pause();
    this._show(k);
    return true;
  }

  /** Go to the step that solved a row; a never-solved row is explained instead. */
  goToRow(row) {
    if (!this.on || row < 0) return;
    const k = this.ranks.rank[row];
    if (k >= 0) this.go(k);
    else this._say(`Node ${this.store.id[row]} was never solved, so no step shows it.`);
  }

  _show(k, { hash = true } = {}) {
    const total = this.total;
    k = clampStep(k, total);
    this.step = k;
    const store = this.store;
    const row = this.ranks.rows[k];
    const cached = this.pages.peek(k);
    const t = this.ins.tree;
    t.setReveal({ rank: this.ranks.rank, limit: k, span: this.span,
      incumbent: cached ? cached.incumbent : this._storeIncumbent(row) });
    t.select(row, { centre: true });
    $('walkCounter').textContent = counterText(k, total);
    const tl = $('walkTimeline');
    tl.setAttribute('aria-valuemax', String(total));
    tl.setAttribute('aria-valuenow', String(k + 1));
    tl.setAttribute('aria-valuetext', counterText(k, total));
    $('walkCursor').style.left = `${(100 * stepToX(k, total, 1)).toFixed(4)}%`;
    $('walkDone').style.width = `${((100 * (k + 1)) / total).toFixed(4)}%`;
    $('walkPrev').disabled = k === 0;
    $('walkFirst').disabled = k === 0;
    $('walkNext').disabled = k === total - 1;
    $('walkLast').disabled = k === total - 1;
    this.notesPanel.setTarget({ node: store.id[row], order: store.order[row], step: k });
    this._legendAt(k);
    this.ins.scheduler.mark('cursor');
    if (cached) this._narrate(k, cached);
    else {
      this._narrate(k, null);
      this.pages.get(k).then((st) => {
        if (!this.on || this.step !== k || !st) return;
        this._narrate(k, st);
        t.setReveal({ ...t.reveal, incumbent: st.incumbent });
      }).catch((err) => {
        if (this.on && this.step === k) this._narrateError(err);
      });
    }
    this.pages.prefetch(k);
    if (hash) {
      clearTimeout(this._hashTimer);
      this._hashTimer = setTimeout(() => {
        if (this.on) this.ins.onState({ step: this.step, node: null });
      }, this.playing ? HASH_DELAY_MS : 0);
    }
  }

  /** The incumbent known when a row was written (until the step's page says it exactly). */
  _storeIncumbent(row) {
    const v = this.store.incumbent[row];
    return Number.isFinite(v) ? v : null;
  }

  /** x of the bounds chart's cursor on `axis`: nodes processed after the step, or its time. */
  cursorX(axis) {
    if (!this.on || !this.ranks) return null;
    if (axis === 'nodes') return this.step + 1;
    const t = this.store.time[this.ranks.rows[this.step]];
    return Number.isFinite(t) ? t : null;
  }

  // ------------------------------------------------------------ playing
  play() {
    if (!this.on && !this.start()) return;
    if (this.playing) return;
    if (this.step >= this.total - 1) this._show(0);
    this.playing = true;
    this._from = this.step;
    this._t0 = performance.now();
    this._syncPlay();
    this._raf = requestAnimationFrame((now) => this._tick(now));
  }

  pause({ write = true } = {}) {
    if (!this.playing) return;
    this.playing = false;
    cancelAnimationFrame(this._raf);
    this._raf = 0;
    this._syncPlay();
    clearTimeout(this._hashTimer);
    if (this.on && write) this.ins.onState({ step: this.step, node: null });
  }

  togglePlay() {
    if (this.playing) this.pause();
    else this.play();
  }

  _tick(now) {
    if (!this.playing || !this.on) return;
    const total = this.total;
    const k = playedTo(this._from, now - this._t0, this.speed, total);
    if (k !== this.step) this._show(k);
    if (this.step >= total - 1) {
      this.pause(); // the end: play stops by itself
      return;
    }
    this._raf = requestAnimationFrame((t) => this._tick(t));
  }

  setSpeed(v) {
    this.speed = clampSpeed(v);
    const sel = $('walkSpeed');
    if (Number(sel.value) !== this.speed) sel.value = String(this.speed);
    if (this.playing) { // carry on from here at the new pace
      this._from = this.step;
      this._t0 = performance.now();
    }
  }

  faster(dir) {
    const i = SPEEDS.findIndex((s) => s >= this.speed);
    const at = i < 0 ? SPEEDS.length - 1 : i;
    this.setSpeed(SPEEDS[Math.max(0, Math.min(SPEEDS.length - 1, at + dir))]);
    this._say(`Playing speed: ${this.speed} step${this.speed === 1 ? '' : 's'} per second.`);
  }

  _syncPlay() {
    const b = $('walkPlay');
    b.setAttribute('aria-pressed', String(this.playing));
    b.setAttribute('aria-label', this.playing ? 'Pause' : 'Play');
    b.classList.toggle('playing', this.playing);
    // a narration read out 50 times a second helps nobody: quiet while playing
    $('walkNarration').setAttribute('aria-live', this.playing ? 'off' : 'polite');
  }

  // ------------------------------------------------------------ jumps
  /** Jump to the next (dir 1) or previous (dir -1) new incumbent, prune or finding. */
  async jump(kind, dir = 1) {
    if (!this.on && !this.start()) return;
    this.pause();
    const token = ++this._jumpToken;
    const from = this.step;
    let k = -1;
    try {
      if (kind === 'prune') k = await findFlagged(this.pages, from, 'prune', dir);
      else {
        if (this.pages.total === null) await this.pages.get(0);
        const list = kind === 'incumbent' ? this.pages.lists.incumbent : this.pages.lists.finding;
        k = dir > 0 ? nextAfter(list, from) : prevBefore(list, from);
      }
    } catch (err) {
      this._say(`The steps could not be loaded: ${err.message}`);
      return;
    }
    if (token !== this._jumpToken || !this.on) return;
    const what = { incumbent: 'new incumbent', prune: 'pruned node', finding: 'step a finding points at' }[kind];
    if (k < 0) {
      this._say(`No ${dir > 0 ? 'later' : 'earlier'} ${what}.`);
      return;
    }
    this._say('');
    this._show(k);
  }

  // ------------------------------------------------------------ narration
  _narrate(k, st) {
    const root = $('walkNarration');
    const store = this.store;
    const row = this.ranks.rows[k];
    const code = store.status[row];
    const head = el('p', { class: 'walk-node' }, statusIcon(code),
      el('strong', {}, `Node ${store.id[row]}`),
      el('span', { class: 'muted' }, ` \u00b7 ${STATUS_NAMES[code]} \u00b7 depth ${store.depth[row]}`));
    if (!st) {
      root.dataset.step = '';
      root.replaceChildren(head, el('p', { class: 'muted small' }, 'Loading the narration\u2026'));
      return;
    }
    if (st.node !== store.id[row]) {
      // the tree arrays and the server number steps the same way; say so if they ever differ
      this._say(`The server's step ${k + 1} is node ${st.node}, the tree's is node ${store.id[row]}.`);
    }
    const sentences = el('ol', { class: 'walk-sentences', id: 'walk-sentences' },
      (st.sentences ?? []).map((s) => el('li', {}, s)));
    const fig = (label, value, field) => el('div', {}, el('dt', {}, label), el('dd', { 'data-field': field }, value));
    const figures = el('dl', { class: 'walk-figures', 'aria-label': 'After this step' },
      fig('Incumbent', st.incumbent === null ? 'none yet' : formatValue(st.incumbent), 'incumbent'),
      fig('Dual bound', formatValue(st.dual_bound), 'dual'),
      fig('Gap', formatGap(st.gap), 'gap'),
      fig('Open nodes', formatCount(st.open), 'open'));
    const extra = [];
    if (st.new_incumbent) extra.push(el('p', { class: 'walk-flag incumbent' }, 'A new incumbent was found at this step.'));
    if (st.finding) {
      const b = el('button', { type: 'button', class: 'small' }, 'Show the findings');
      b.addEventListener('click', () => this.ins.setTab('findings'));
      extra.push(el('p', { class: 'walk-flag finding' }, 'A finding points at this node. ', b));
    }
    root.dataset.step = String(k);
    root.replaceChildren(head, el('p', { class: 'walk-after muted small' }, 'After this step'), figures,
      this._stepNotes(k), sentences, ...extra);
  }

  _narrateError(err) {
    const root = $('walkNarration');
    root.dataset.step = '';
    root.replaceChildren(el('p', { class: 'error' }, `The narration could not be loaded: ${err.message}`));
  }

  _stepNotes(k) {
    const notes = this.noteInfo.byStep.get(k) ?? [];
    const box = el('div', { class: 'walk-step-notes', id: 'walk-step-notes' });
    if (!notes.length) return box;
    box.append(el('h3', {}, notes.length === 1 ? 'Note at this step' : `${notes.length} notes at this step`),
      el('ul', {}, notes.map((n) => el('li', { dataset: { note: n.id } },
        el('span', { class: 'note-author' }, n.author), ': ', n.text))));
    return box;
  }

  // ------------------------------------------------------------ notes on the tree and timeline
  _stepOfNote(note) {
    if (!this.ranks) return -1;
    if (note.node !== null && note.node !== undefined) {
      const row = this.store.rowOf(note.node);
      if (row >= 0 && this.ranks.rank[row] >= 0) return this.ranks.rank[row];
    }
    if (note.order !== null && note.order !== undefined) return stepOfOrder(this.store.order, this.ranks.rows, note.order);
    return -1;
  }

  _notesChanged(notes) {
    if (!this.ranks) return;
    this.noteInfo = notesByStep(notes, (id) => {
      const row = this.store.rowOf(id);
      return row >= 0 ? this.ranks.rank[row] : -1;
    }, (o) => stepOfOrder(this.store.order, this.ranks.rows, o));
    const rows = [];
    for (const id of this.noteInfo.nodeIds) {
      const row = this.store.rowOf(id);
      if (row >= 0) rows.push(row);
    }
    if (this.on) this.ins.tree.setNoteRows(Int32Array.from(rows));
    this._renderTicks();
    if (this.on) {
      const box = document.getElementById('walk-step-notes');
      if (box) box.replaceWith(this._stepNotes(this.step));
    }
  }

  _renderTicks() {
    const total = this.total;
    if (!total || !this.pages) return;
    const tick = (k, kind, label) => el('span', { class: `walk-tick tick-${kind}`, title: label,
      style: `left:${(100 * stepToX(k, total, 1)).toFixed(4)}%` });
    const ticks = [];
    for (const k of this.pages.lists.finding) ticks.push(tick(k, 'finding', `step ${k + 1}: a finding points here`));
    for (const k of this.pages.lists.incumbent) ticks.push(tick(k, 'incumbent', `step ${k + 1}: new incumbent`));
    for (const k of this.noteInfo.steps) {
      const n = this.noteInfo.byStep.get(k).length;
      ticks.push(tick(k, 'note', `step ${k + 1}: ${n} note${n === 1 ? '' : 's'}`));
    }
    $('walkTicks').replaceChildren(...ticks);
  }

  _say(text) {
    $('walkMessage').textContent = text;
  }

  // ------------------------------------------------------------ controls
  _bind() {
    $('walkToggle').addEventListener('click', () => this.toggle());
    $('walkFirst').addEventListener('click', () => this.go(0));
    $('walkPrev').addEventListener('click', () => this.go(this.step - 1));
    $('walkNext').addEventListener('click', () => this.go(this.step + 1));
    $('walkLast').addEventListener('click', () => this.go(this.total - 1));
    $('walkPlay').addEventListener('click', () => this.togglePlay());
    $('walkSpeed').addEventListener('change', () => this.setSpeed(Number($('walkSpeed').value)));
    for (const b of $all('walkJumps')) {
      b.addEventListener('click', () => this.jump(b.dataset.jump, Number(b.dataset.dir)));
    }
    const tl = $('walkTimeline');
    tl.addEventListener('click', (e) => {
      const r = tl.getBoundingClientRect();
      this.go(xToStep(e.clientX - r.left, this.total, r.width));
    });
    tl.addEventListener('keydown', (e) => {
      const move = { ArrowLeft: -1, ArrowDown: -1, ArrowRight: 1, ArrowUp: 1, PageDown: -10, PageUp: 10 }[e.key];
      if (move === undefined) return;
      e.preventDefault();
      e.stopPropagation(); // the document's arrow keys pan the tree
      this.go(this.step + move);
    });
  }
}
