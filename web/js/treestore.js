// The tree as columns: one typed array per field, grown by doubling.
// Pure (no DOM). Filled either from the binary tree format at once, or one
// node event at a time from the live stream.

import { STATUS_CODE, STATUS_NAMES } from './statuses.js';

// Store field -> [array type, value meaning "unknown"].
export const FIELD_SPEC = Object.freeze({
  id: [Int32Array, -1],
  parent: [Int32Array, -1], // row of the parent, -1 at a root
  depth: [Int32Array, 0],
  order: [Int32Array, -1], // processing order, -1 if never solved
  status: [Uint8Array, 0],
  bound: [Float64Array, NaN],
  var: [Int32Array, -1], // variable of the bound change that created the node
  dir: [Uint8Array, 0], // 0 none, 1 down, 2 up
  value: [Float64Array, NaN], // value of that bound change
  time: [Float64Array, NaN],
  x: [Float64Array, 0],
  xMin: [Float64Array, 0],
  xMax: [Float64Array, 0],
  size: [Int32Array, 1], // nodes in the subtree, the node included
  incumbent: [Float64Array, NaN], // best incumbent known when the node was written
});

// Names the server may use for a store field.
const ALIASES = {
  id: ['id'],
  parent: ['parent', 'parent_row'],
  depth: ['depth'],
  order: ['order'],
  status: ['status'],
  bound: ['bound'],
  var: ['var', 'branch_var'],
  dir: ['dir', 'branch_dir'],
  value: ['value', 'branch_value'],
  time: ['time'],
  x: ['x'],
  xMin: ['x_min', 'xMin'],
  xMax: ['x_max', 'xMax'],
  size: ['subtree_size', 'size'],
  incumbent: ['incumbent'],
};

const DIR_CODE = { down: 1, up: 2 };

export class TreeStore {
  constructor(capacity = 1024) {
    this.n = 0;
    this.capacity = 0;
    this.sense = 'min';
    this.version = 0; // bumped on every change, so views know to recompute
    this.hasLayout = false; // x, xMin, xMax, size filled for every row
    this.incumbentRows = []; // rows of nodes that produced an incumbent
    this.incumbentValue = NaN; // best incumbent objective so far
    this.maxOrder = -1;
    this._rowById = new Int32Array(0);
    this._rowMap = null; // Map id -> row when ids are too sparse for an array
    this.varNames = {}; // variable index (as a string) -> name
    this.events = -1; // events of the run the arrays cover (for resuming a live stream)
    this.live = false;
    for (const [name, [Kind]] of Object.entries(FIELD_SPEC)) this[name] = new Kind(0);
    this.grow(capacity);
  }

  /** A store holding the columns of a decoded binary tree (no copy where types match). */
  static fromColumns(columns, n, { sense = 'min' } = {}) {
    const store = new TreeStore(0);
    store.sense = sense;
    store.capacity = n;
    store.n = n;
    let layout = true;
    for (const [name, [Kind, fill]] of Object.entries(FIELD_SPEC)) {
      const src = ALIASES[name].map((a) => columns[a]).find((a) => a !== undefined);
      if (src === undefined) {
        const a = new Kind(n);
        if (fill !== 0) a.fill(fill);
        store[name] = a;
        if (name === 'x' || name === 'xMin' || name === 'xMax' || name === 'size') layout = false;
      } else if (ArrayBuffer.isView(src) && src.length === n &&
          (src instanceof Kind || src instanceof Float32Array || src instanceof Float64Array)) {
        store[name] = src; // the server's own array, no copy (float32 positions and times too)
      } else {
        const a = new Kind(n);
        for (let i = 0; i < n; i++) a[i] = src[i];
        store[name] = a;
      }
    }
    store.hasLayout = layout;
    store.maxOrder = -1;
    const order = store.order;
    for (let i = 0; i < n; i++) if (order[i] > store.maxOrder) store.maxOrder = order[i];
    store._indexIds(0);
    store.version++;
    return store;
  }

  /**
   * A store from `decodeTree`'s result: the meta gives the sense, the status and
   * direction names (codes are mapped to ours if the server's order differs)
   * and variable names.
   */
  static fromDecoded({ nodes, meta, columns }) {
    const n = Number(nodes ?? meta?.count ?? 0);
    const store = TreeStore.fromColumns(columns, n, { sense: meta?.sense ?? 'min' });
    remapCodes(store.status, n, meta?.statuses, STATUS_NAMES);
    remapCodes(store.dir, n, meta?.directions, ['none', 'down', 'up']);
    store.varNames = meta?.var_names ?? {};
    store.events = Number(meta?.events ?? -1);
    store.live = Boolean(meta?.live);
    return store;
  }

  /** Make room for at least `needed` rows, doubling the capacity. */
  grow(needed) {
    if (needed <= this.capacity) return;
    let cap = Math.max(1024, this.capacity);
    while (cap < needed) cap *= 2;
    for (const [name, [Kind, fill]] of Object.entries(FIELD_SPEC)) {
      const old = this[name];
      const a = new Kind(cap);
      if (fill !== 0) a.fill(fill, this.n);
      a.set(old.subarray(0, this.n));
      this[name] = a;
    }
    this.capacity = cap;
  }

  /** Row of a node id, or -1. */
  rowOf(id) {
    if (this._rowMap) return this._rowMap.get(id) ?? -1;
    if (id >= 0 && id < this._rowById.length) return this._rowById[id];
    return -1;
  }

  _indexIds(from) {
    const ids = this.id;
    let maxId = -1;
    for (let r = from; r < this.n; r++) if (ids[r] > maxId) maxId = ids[r];
    if (!this._rowMap && maxId > 4 * this.n + 4096) {
      this._rowMap = new Map();
      for (let r = 0; r < from; r++) this._rowMap.set(ids[r], r);
    }
    if (this._rowMap) {
      for (let r = from; r < this.n; r++) this._rowMap.set(ids[r], r);
      return;
    }
    if (maxId >= this._rowById.length) {
      let len = Math.max(1024, this._rowById.length);
      while (len <= maxId) len *= 2;
      const a = new Int32Array(len).fill(-1);
      a.set(this._rowById);
      this._rowById = a;
    }
    for (let r = from; r < this.n; r++) if (ids[r] >= 0) this._rowById[ids[r]] = r;
  }

  /**
   * Append live events (node, incumbent; others ignored here). Returns the
   * number of nodes added. Layout fields are left for `tidy.js` to fill.
   */
  appendEvents(events) {
    let added = 0;
    for (const ev of events) {
      if (ev.kind === 'node') {
        this._appendNode(ev);
        added++;
      } else if (ev.kind === 'incumbent') {
        this.incumbentValue = ev.objective;
        if (ev.node !== null && ev.node !== undefined) {
          const row = this.rowOf(ev.node);
          if (row >= 0) this.incumbentRows.push(row);
          else this._pendingIncumbent = ev.node;
        }
      }
    }
    if (added) {
      this.hasLayout = false;
      this.version++;
    }
    return added;
  }

  _appendNode(ev) {
    if (this.n >= this.capacity) this.grow(this.n + 1);
    const r = this.n++;
    this.id[r] = ev.id;
    this.parent[r] = ev.parent === null || ev.parent === undefined ? -1 : this.rowOf(ev.parent);
    this.depth[r] = ev.depth ?? 0;
    this.order[r] = ev.order ?? -1;
    if (this.order[r] > this.maxOrder) this.maxOrder = this.order[r];
    this.status[r] = STATUS_CODE[ev.status] ?? 0;
    this.bound[r] = ev.bound ?? NaN;
    this.var[r] = ev.branch ? ev.branch.var : -1;
    this.dir[r] = ev.branch ? (DIR_CODE[ev.branch.dir] ?? 0) : 0;
    this.value[r] = ev.branch ? (ev.branch.value ?? NaN) : NaN;
    if (ev.branch && ev.branch.name) this.varNames[ev.branch.var] = ev.branch.name;
    this.time[r] = ev.time ?? NaN;
    this.incumbent[r] = this.incumbentValue;
    this._indexIds(r);
    if (this._pendingIncumbent === ev.id) {
      this.incumbentRows.push(r);
      this._pendingIncumbent = undefined;
    }
  }

  /** Rows of nodes that found incumbents, from the run's incumbent list [{node}, ...]. */
  setIncumbents(list) {
    this.incumbentRows = [];
    for (const inc of list ?? []) {
      if (inc.node === null || inc.node === undefined || inc.node < 0) continue;
      const row = this.rowOf(inc.node);
      if (row >= 0) this.incumbentRows.push(row);
    }
    if (list?.length) this.incumbentValue = list[list.length - 1].objective;
    this.version++;
  }

  /** Row processed at processing order k (or the nearest earlier one), -1 if none. */
  rowAtOrder(k) {
    if (!this._byOrder || this._byOrderVersion !== this.version) {
      const a = new Int32Array(this.maxOrder + 1).fill(-1);
      for (let r = 0; r < this.n; r++) if (this.order[r] >= 0) a[this.order[r]] = r;
      this._byOrder = a;
      this._byOrderVersion = this.version;
    }
    const a = this._byOrder;
    for (let i = Math.min(k, a.length - 1); i >= 0; i--) if (a[i] >= 0) return a[i];
    return -1;
  }

  /** Row processed last at or before time t (binary search over processing order). */
  rowAtTime(t) {
    this.rowAtOrder(0);
    const a = this._byOrder;
    let lo = 0;
    let hi = a.length - 1;
    let best = -1;
    while (lo <= hi) {
      const mid = (lo + hi) >> 1;
      const r = a[mid];
      if (r < 0) { hi = mid - 1; continue; }
      if (this.time[r] <= t) { best = r; lo = mid + 1; } else hi = mid - 1;
    }
    return best;
  }

  /** Rows from the root down to `row`. */
  pathTo(row) {
    const out = [];
    for (let r = row; r >= 0 && out.length <= this.n; r = this.parent[r]) out.push(r);
    return out.reverse();
  }
}

/** Rewrite codes in a[0..n) from the server's name list to ours, if they differ. */
export function remapCodes(a, n, theirs, ours) {
  if (!Array.isArray(theirs) || theirs.every((name, i) => ours[i] === name)) return;
  const map = new Uint8Array(256);
  theirs.forEach((name, i) => { const k = ours.indexOf(name); map[i] = k < 0 ? 0 : k; });
  for (let r = 0; r < n; r++) a[r] = map[a[r]];
}
