// The drawing scene of a tree: the store's columns plus what the renderer
// needs derived from them (children lists, a layout for live runs, vertical
// positions for the current layout, subtree counts and ranges, rare rows).
// Recomputed only when the store or the layout changes. Pure, no DOM.

import {
  AGG_STRIDE, boundPositions, buildChildren, finiteRange, inheritedBounds, parentsFirst, preorder,
  subtreeCounts, subtreeMax, subtreeRange, tidyLayout,
} from './tidy.js';
import { DISCARDED, OPEN, STATUS_COUNT } from './statuses.js';

// Pixels between a parent and a child whose bound is only inherited (bound layout).
export const INHERIT_SHIFT = 9;
import { rareRowsOf } from './lod.js';

export class Scene {
  constructor(store) {
    this.store = store;
    this.layout = 'depth';
    this.folded = new Uint8Array(Math.max(1, store.capacity));
    this.foldedCount = 0;
    this._version = -1;
    this._yKey = null;
    this.n = 0;
    this.inheritedActive = false;
  }

  /** Bring every derived array up to date; returns true when anything changed. */
  update(layout = this.layout) {
    const s = this.store;
    let changed = false;
    if (this._version !== s.version) {
      const n = s.n;
      this.children = buildChildren(s.parent, s.dir, n, { sort: !s.hasLayout });
      if (!s.hasLayout) {
        tidyLayout(s.parent, s.dir, n, s, this.children);
        s.hasLayout = true;
      }
      this.topDown = parentsFirst(s.parent, n) ? null : preorder(this.children, n);
      this.counts = subtreeCounts(s.parent, s.status, n, {
        incumbentRows: s.incumbentRows, topDown: this.topDown, out: this.counts,
      });
      // Nodes per status: the roots' subtree counts add up to the whole tree.
      const totals = new Uint32Array(STATUS_COUNT);
      for (const root of this.children.roots) {
        for (let k = 0; k < STATUS_COUNT; k++) totals[k] += this.counts[root * AGG_STRIDE + k];
      }
      this.totals = totals;
      this.rareRows = rareRowsOf(s.status, n, s.incumbentRows, { totals });
      if (this.folded.length < n) {
        const f = new Uint8Array(s.capacity);
        f.set(this.folded);
        this.folded = f;
      }
      this.n = n;
      this._version = s.version;
      this._yKey = null;
      this.xRange = n ? [s.xMin[this.children.roots[0]], maxOver(s.xMax, this.children.roots)] : [0, 1];
      changed = true;
    }
    const key = `${layout}:${this._version}`;
    if (this._yKey !== key) {
      const n = this.n;
      if (layout === 'bound') {
        this.yBound = boundPositions(s.parent, s.bound, n, s.sense, this.yBound, this.topDown);
        this.y = this.yBound;
        this.inherited = inheritedBounds(s.bound, s.status, n, (1 << DISCARDED) | (1 << OPEN),
          this.inherited);
        const range = subtreeRange(s.parent, this.y, n, { topDown: this.topDown, out: this._range });
        this._range = range;
        this.yLo = range.yLo;
        this.yHi = range.yHi;
        this.inheritedActive = true;
      } else {
        // Depths as they are: a subtree starts at its root's depth, so only the deepest
        // depth below each node needs computing.
        this.y = s.depth;
        this.yLo = s.depth;
        this.inheritedActive = false;
        this.yHi = subtreeMax(s.parent, s.depth, n, this.topDown, this._depthHi);
        this._depthHi = this.yHi;
      }
      this.yRange = finiteRange(this.y, n);
      this.layout = layout;
      this._yKey = key;
      changed = true;
    }
    return changed;
  }

  /** The arrays `planFrame` walks. */
  frameScene() {
    const s = this.store;
    return {
      n: this.n, parent: s.parent, children: this.children, x: s.x, xMin: s.xMin, xMax: s.xMax,
      y: this.y, yLo: this.yLo, yHi: this.yHi, status: s.status, depth: s.depth, size: s.size,
      counts: this.counts, folded: this.foldedCount ? this.folded : null,
      inherited: this.inheritedActive ? this.inherited : null, inheritShift: INHERIT_SHIFT,
      foldedCount: this.foldedCount, rareRows: this.rareRows,
    };
  }

  toggleFold(row) {
    if (row < 0 || row >= this.n) return;
    if (this.children.start[row + 1] === this.children.start[row]) return; // a leaf
    this.folded[row] = this.folded[row] ? 0 : 1;
    this.foldedCount += this.folded[row] ? 1 : -1;
  }

  unfoldAll() {
    this.folded.fill(0);
    this.foldedCount = 0;
  }

  isHiddenByFold(row) {
    if (!this.foldedCount) return false;
    for (let p = this.store.parent[row]; p >= 0; p = this.store.parent[p]) if (this.folded[p]) return true;
    return false;
  }

  /** Screen y offset of a row in the current layout (see INHERIT_SHIFT). */
  shiftOf(row) {
    return this.inheritedActive && this.inherited[row] ? INHERIT_SHIFT : 0;
  }

  /** Children of a row, the down child first. */
  childrenOf(row) {
    const { start, list } = this.children;
    const dir = this.store.dir;
    return Array.from(list.subarray(start[row], start[row + 1])).sort((a, b) => dir[a] - dir[b] || a - b);
  }
}

function maxOver(a, rows) {
  let m = -Infinity;
  for (const r of rows) if (a[r] > m) m = a[r];
  return m;
}
