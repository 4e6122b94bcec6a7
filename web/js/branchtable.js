// "Branching variables": per variable, how often the search branched on it and
// the mean bound gain of its down and up children, as a sortable table.
// Computed from the tree arrays (stats.js). Clicking a row selects the
// shallowest node that branched on that variable.

import { el } from './dom.js';
import { formatCount, formatDelta, formatShare } from './format.js';
import { branchingStats, sortRows } from './stats.js';

const COLUMNS = [
  { key: 'name', label: 'Variable', numeric: false },
  { key: 'branched', label: 'Times branched', numeric: true },
  { key: 'downMean', label: 'Mean gain down', numeric: true },
  { key: 'upMean', label: 'Mean gain up', numeric: true },
  { key: 'infeasible', label: 'Infeasible children', numeric: true },
  { key: 'score', label: 'Product score', numeric: true },
];

export class BranchTable {
  /** table: the <table>; note: a <p> above it; hooks: {onSelectRow(row)} */
  constructor(table, note, hooks = {}) {
    this.table = table;
    this.note = note;
    this.hooks = hooks;
    this.sortKey = 'branched';
    this.descending = true;
    this.rows = [];
    this.limit = 400;
    this.markedVar = -1; // a variable picked from a finding: its row is marked and scrolled to
  }

  /** Mark the row of variable `v` (-1: none). */
  markVar(v) {
    if (v === this.markedVar) return;
    this.markedVar = v;
    if (this.rows.length) this.render();
  }

  compute(store) {
    const names = store.varNames ?? {};
    this.rows = branchingStats(store).map((r) => ({
      ...r, name: names[r.var] ?? `x${r.var}`, infeasible: r.downInfeasible + r.upInfeasible,
    }));
    this.total = this.rows.reduce((s, r) => s + r.branched, 0);
  }

  render() {
    const sorted = sortRows(this.rows, this.sortKey, this.descending);
    const shown = sorted.slice(0, this.limit);
    const marked = sorted.find((r) => r.var === this.markedVar);
    if (marked && !shown.includes(marked)) shown.push(marked); // always listed, even past the limit
    const maxGain = Math.max(1e-12, ...shown.map((r) => Math.max(r.downMean || 0, r.upMean || 0)));
    const head = el('tr', {}, COLUMNS.map((c) => {
      const sorted = c.key === this.sortKey;
      return el('th', {
        scope: 'col', class: c.numeric ? 'num' : null,
        'aria-sort': sorted ? (this.descending ? 'descending' : 'ascending') : 'none',
      }, el('button', { type: 'button', onclick: () => this._sortBy(c.key),
        'aria-label': `Sort by ${c.label.toLowerCase()}` }, c.label));
    }));
    const body = shown.map((r) => {
      const bar = (v, cls) => (Number.isFinite(v) && v > 0
        ? el('span', { class: `gainbar ${cls}`, style: `width:${Math.round(40 * v / maxGain)}px`,
          'aria-hidden': 'true' }) : null);
      const tr = el('tr', { tabindex: '0', title: 'Select the shallowest node that branched on it',
        class: r === marked ? 'marked' : null, 'aria-current': r === marked ? 'true' : null },
        el('td', {}, r.name),
        el('td', { class: 'num' }, formatCount(r.branched), ' ',
          el('span', { class: 'muted small' }, formatShare(r.branched, this.total))),
        el('td', { class: 'num' }, formatDelta(r.downMean), bar(r.downMean, 'down')),
        el('td', { class: 'num' }, formatDelta(r.upMean), bar(r.upMean, 'up')),
        el('td', { class: 'num' }, r.infeasible ? `${r.downInfeasible} / ${r.upInfeasible}` : '\u2014'),
        el('td', { class: 'num' }, Number.isFinite(r.score) ? r.score.toPrecision(3) : '\u2014'));
      const pick = () => this.hooks.onSelectRow?.(r.firstRow);
      tr.addEventListener('click', pick);
      tr.addEventListener('keydown', (e) => { if (e.key === 'Enter') pick(); });
      return tr;
    });
    this.table.replaceChildren(el('thead', {}, head), el('tbody', {}, body));
    const mark = this.table.querySelector('tr.marked');
    if (mark && this.table.offsetParent) mark.scrollIntoView({ block: 'nearest' });
    const more = sorted.length > shown.length ? ` (the first ${shown.length} shown)` : '';
    this.note.textContent = this.rows.length
      ? `${formatCount(this.rows.length)} variables branched on${more}. Gain: how much a child's ` +
        'bound moved from its parent\u2019s, towards worse (larger is a stronger branching); ' +
        'infeasible children (down / up) are counted apart. Click a header to sort, a row to ' +
        'select the shallowest node that branched on the variable.'
      : 'No branching happened in this run.';
  }

  _sortBy(key) {
    if (key === this.sortKey) this.descending = !this.descending;
    else {
      this.sortKey = key;
      this.descending = key !== 'name';
    }
    this.render();
  }
}
