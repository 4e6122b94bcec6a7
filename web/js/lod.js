// Level of detail: which marks and edges to draw for one view of the tree.
// Pure, no DOM. Walks the tree from the roots, skipping every subtree whose
// precomputed extent lies outside the view, and drawing each subtree narrower
// than `lodPx` pixels as one bar coloured by the status that dominates inside.
// Rare rows (nodes that found incumbents, failed nodes, ...) are added on top,
// so they stay visible however far the view is zoomed out.

import { AGG_STRIDE } from './tidy.js';
import { BRANCHED, STATUS_COUNT } from './statuses.js';

export const MARK_NODE = 0;
export const MARK_BAR = 1; // a collapsed-by-size subtree: a bar from the node down
export const MARK_FOLDED = 2; // a subtree the user folded
export const MARK_RARE = 3; // a rare node kept visible on top

export class DrawList {
  constructor() {
    this.edges = new Float32Array(4096);
    this.edgeCount = 0;
    this.cap = 0;
    this.markCount = 0;
    this.visited = 0;
    this.stack = new Int32Array(1024);
    this._growMarks(4096);
  }

  _growMarks(cap) {
    const keep = this.markCount;
    const grow = (Kind, old) => {
      const a = new Kind(cap);
      if (old) a.set(old.subarray(0, keep));
      return a;
    };
    this.markRow = grow(Int32Array, this.markRow);
    this.markX = grow(Float32Array, this.markX);
    this.markY = grow(Float32Array, this.markY);
    this.markY2 = grow(Float32Array, this.markY2);
    this.markKind = grow(Uint8Array, this.markKind);
    this.markStatus = grow(Uint8Array, this.markStatus);
    this.cap = cap;
  }

  reset() {
    this.edgeCount = 0;
    this.markCount = 0;
    this.visited = 0;
  }

  addMark(row, x, y, y2, kind, status) {
    if (this.markCount >= this.cap) this._growMarks(this.cap * 2);
    const i = this.markCount++;
    this.markRow[i] = row;
    this.markX[i] = x;
    this.markY[i] = y;
    this.markY2[i] = y2;
    this.markKind[i] = kind;
    this.markStatus[i] = status;
  }

  addEdge(x1, y1, x2, y2) {
    if ((this.edgeCount + 1) * 4 > this.edges.length) {
      const a = new Float32Array(this.edges.length * 2);
      a.set(this.edges);
      this.edges = a;
    }
    const j = this.edgeCount++ * 4;
    this.edges[j] = x1;
    this.edges[j + 1] = y1;
    this.edges[j + 2] = x2;
    this.edges[j + 3] = y2;
  }
}

/**
 * The status that dominates row r's subtree among the statuses allowed by
 * `mask`: the most frequent closing status (branched only when nothing else
 * is allowed or present); -1 when the subtree holds no allowed status.
 */
export function dominantStatus(counts, r, mask) {
  const base = r * AGG_STRIDE;
  let best = -1;
  let bestCount = 0;
  for (let s = 1; s < STATUS_COUNT; s++) {
    if (!((mask >> s) & 1)) continue;
    const c = counts[base + s];
    if (c > bestCount) { best = s; bestCount = c; }
  }
  if (best < 0 && ((mask >> BRANCHED) & 1) && counts[base + BRANCHED] > 0) best = BRANCHED;
  return best;
}

/**
 * Fill `out` (a DrawList) with the marks and edges of `scene` seen through `view`.
 * scene: {n, parent, children: {start, list, roots}, x, xMin, xMax, y, yLo, yHi,
 *         status, depth, size, counts, folded (Uint8Array|null), foldedCount, rareRows}
 * view:  {x0, x1, y0, y1, width, height}  (layout rectangle -> CSS pixels)
 * opts:  {statusMask, depthMin, depthMax, lodPx, margin, reveal}
 *   reveal (the walkthrough): {rank, limit, span}: only rows with 0 <= rank[row] <= limit
 *   are drawn (a node is solved after its parent, so a hidden node hides its subtree);
 *   a narrow subtree becomes a bar only when wholly revealed (span[row] <= limit).
 * Screen coordinates: sx = (x - x0) * width / (x1 - x0), the same for y.
 */
export function planFrame(scene, view, opts, out) {
  out.reset();
  const { x, xMin, xMax, y, yLo, yHi, status, depth, size, counts, folded } = scene;
  const inherited = scene.inherited ?? null; // rows drawn `inheritShift` px lower
  const shift = scene.inheritShift ?? 0;
  const { start, list, roots } = scene.children;
  const mask = opts.statusMask;
  const dMin = opts.depthMin ?? 0;
  const dMax = opts.depthMax ?? Infinity;
  const lodPx = opts.lodPx ?? 1;
  const margin = opts.margin ?? 8;
  const kx = view.width / (view.x1 - view.x0);
  const ky = view.height / (view.y1 - view.y0);
  const ox = view.x0;
  const oy = view.y0;
  const X0 = ox - margin / kx;
  const X1 = view.x1 + margin / kx;
  const Y0 = oy - margin / ky;
  const Y1 = view.y1 + margin / ky;
  const W = view.width + margin;
  const H = view.height + margin;
  if (out.stack.length < scene.n + 1) out.stack = new Int32Array(scene.n + 1);
  const stack = out.stack;
  const reveal = opts.reveal ?? null;
  const rank = reveal ? reveal.rank : null;
  const limit = reveal ? reveal.limit : 0;
  const span = reveal ? reveal.span : null;
  let top = 0;
  for (let i = roots.length - 1; i >= 0; i--) {
    const r = roots[i];
    if (rank !== null && !(rank[r] >= 0 && rank[r] <= limit)) continue;
    if (xMax[r] >= X0 && xMin[r] <= X1 && yHi[r] >= Y0 && yLo[r] <= Y1) stack[top++] = r;
  }
  let visited = 0;
  while (top > 0) {
    const r = stack[--top];
    visited++;
    const sx = (x[r] - ox) * kx;
    const sy = (y[r] - oy) * ky + (inherited !== null && inherited[r] ? shift : 0);
    if (folded !== null && folded[r]) {
      const s = dominantStatus(counts, r, mask);
      out.addMark(r, sx, sy, sy, MARK_FOLDED, s < 0 ? status[r] : s);
      continue;
    }
    if (size[r] > 1 && (xMax[r] - xMin[r]) * kx < lodPx && (span === null || span[r] <= limit)) {
      const s = dominantStatus(counts, r, mask);
      if (s >= 0) {
        let bottom = yHi[r];
        if (opts.clipY !== undefined && bottom > opts.clipY) bottom = opts.clipY;
        out.addMark(r, sx, sy, (bottom - oy) * ky, MARK_BAR, s);
      }
      continue;
    }
    const st = status[r];
    if (((mask >> st) & 1) && depth[r] >= dMin && sx >= -margin && sx <= W && sy >= -margin &&
        sy <= H) out.addMark(r, sx, sy, sy, MARK_NODE, st);
    for (let j = start[r]; j < start[r + 1]; j++) {
      const c = list[j];
      if (depth[c] > dMax) continue;
      if (rank !== null && !(rank[c] >= 0 && rank[c] <= limit)) continue;
      const cx = (x[c] - ox) * kx;
      const cy = (y[c] - oy) * ky + (inherited !== null && inherited[c] ? shift : 0);
      if (!((sx < -margin && cx < -margin) || (sx > W && cx > W) ||
            (sy < -margin && cy < -margin) || (sy > H && cy > H))) {
        out.addEdge(sx, sy, cx, cy);
      }
      if (xMax[c] >= X0 && xMin[c] <= X1 && yHi[c] >= Y0 && yLo[c] <= Y1) stack[top++] = c;
    }
  }
  out.visited = visited;
  addRare(scene, view, opts, out, kx, ky);
  return out;
}

function addRare(scene, view, opts, out, kx, ky) {
  const rare = scene.rareRows;
  if (!rare || rare.length === 0) return;
  const { x, y, status, depth, parent, folded } = scene;
  const mask = opts.statusMask;
  const dMin = opts.depthMin ?? 0;
  const dMax = opts.depthMax ?? Infinity;
  const rank = opts.reveal ? opts.reveal.rank : null;
  const limit = opts.reveal ? opts.reveal.limit : 0;
  for (let i = 0; i < rare.length; i++) {
    const r = rare[i];
    if (r < 0 || r >= scene.n) continue;
    if (rank !== null && !(rank[r] >= 0 && rank[r] <= limit)) continue;
    const st = status[r];
    if (!((mask >> st) & 1) || depth[r] < dMin || depth[r] > dMax) continue;
    const sx = (x[r] - view.x0) * kx;
    const sy = (y[r] - view.y0) * ky + (scene.inherited && scene.inherited[r] ? scene.inheritShift : 0);
    if (sx < -4 || sx > view.width + 4 || sy < -4 || sy > view.height + 4) continue;
    if (folded !== null && scene.foldedCount > 0 && insideFolded(parent, folded, r)) continue;
    out.addMark(r, sx, sy, sy, MARK_RARE, st);
  }
}

function insideFolded(parent, folded, r) {
  for (let p = parent[r]; p >= 0; p = parent[p]) if (folded[p]) return true;
  return false;
}

/**
 * Index of the mark nearest (px, py) within `radius` CSS pixels, or -1.
 * Bars count by their distance to the vertical segment; single nodes win ties.
 */
export function pickMark(list, px, py, radius = 8) {
  let best = -1;
  let bestD = radius * radius;
  for (let i = 0; i < list.markCount; i++) {
    const dx = list.markX[i] - px;
    if (dx > radius || dx < -radius) continue;
    let dy = list.markY[i] - py;
    if (list.markKind[i] === MARK_BAR) {
      const y1 = list.markY[i];
      const y2 = list.markY2[i];
      dy = py < y1 ? y1 - py : py > y2 ? py - y2 : 0;
    }
    let d = dx * dx + dy * dy;
    if (list.markKind[i] !== MARK_BAR) d -= 0.01; // single nodes before bars
    if (d <= bestD) { bestD = d; best = i; }
  }
  return best;
}

/**
 * Rows worth keeping visible at any zoom: incumbent nodes and statuses rarer than
 * `share`. `totals` (nodes per status) is counted here when not given.
 */
export function rareRowsOf(status, n, incumbentRows, { share = 0.002, cap = 4000, totals = null } = {}) {
  let counts = totals;
  if (!counts) {
    counts = new Uint32Array(STATUS_COUNT);
    for (let r = 0; r < n; r++) counts[status[r]]++;
  }
  const rare = [];
  for (let s = 1; s < STATUS_COUNT; s++) if (counts[s] > 0 && counts[s] <= Math.max(8, share * n)) rare.push(s);
  const out = [];
  const seen = new Set(incumbentRows);
  for (const r of incumbentRows) out.push(r);
  if (rare.length) {
    let m = 0;
    for (const s of rare) m |= 1 << s;
    for (let r = 0; r < n && out.length < cap; r++) {
      if (((m >> status[r]) & 1) && !seen.has(r)) out.push(r);
    }
  }
  return Int32Array.from(out);
}
