// Tree structure helpers on typed arrays: children lists, pre-order, the tidy
// layout (the same rule as the server's analysis/layout.py, for live runs),
// and per-subtree aggregates used by the level of detail. Pure, no DOM.

export const AGG_STRIDE = 8; // per row: counts of the 7 statuses, then 1 flag word
export const FLAG_INCUMBENT = 1; // the subtree holds a node that found an incumbent

/**
 * Children of each row in CSR form: children of r are list[start[r] .. start[r+1]),
 * ordered by direction (down before up) then by row (`sort: false` keeps row order,
 * enough for drawing when the layout is given). Roots (parent -1) in `roots`.
 */
export function buildChildren(parent, dir, n, { sort = true } = {}) {
  const start = new Int32Array(n + 1);
  let rootCount = 0;
  for (let r = 0; r < n; r++) {
    const p = parent[r];
    if (p >= 0) start[p + 1]++;
    else rootCount++;
  }
  for (let r = 0; r < n; r++) start[r + 1] += start[r];
  const fill = start.slice(0, n);
  const list = new Int32Array(Math.max(0, n - rootCount));
  const roots = new Int32Array(rootCount);
  let k = 0;
  for (let r = 0; r < n; r++) {
    const p = parent[r];
    if (p >= 0) list[fill[p]++] = r;
    else roots[k++] = r;
  }
  if (!sort) return { start, list, roots };
  // Rows arrive in row order; only the direction key can be out of order.
  for (let p = 0; p < n; p++) {
    const a = start[p];
    const b = start[p + 1];
    if (b - a < 2) continue;
    if (b - a === 2) {
      if (dir[list[a]] > dir[list[a + 1]]) {
        const t = list[a]; list[a] = list[a + 1]; list[a + 1] = t;
      }
      continue;
    }
    for (let i = a + 1; i < b; i++) { // insertion sort, stable
      const c = list[i];
      let j = i - 1;
      while (j >= a && dir[list[j]] > dir[c]) { list[j + 1] = list[j]; j--; }
      list[j + 1] = c;
    }
  }
  return { start, list, roots };
}

/** Rows in pre-order (parent before its children, children in list order). */
export function preorder(children, n) {
  const { start, list, roots } = children;
  const out = new Int32Array(n);
  const stack = new Int32Array(n + 1);
  let top = 0;
  let k = 0;
  for (let i = roots.length - 1; i >= 0; i--) stack[top++] = roots[i];
  while (top > 0) {
    const r = stack[--top];
    out[k++] = r;
    for (let i = start[r + 1] - 1; i >= start[r]; i--) stack[top++] = list[i];
  }
  return k === n ? out : out.subarray(0, k);
}

/** True when every parent row comes before its children (true of run tables). */
export function parentsFirst(parent, n) {
  for (let r = 0; r < n; r++) if (parent[r] >= r) return false;
  return true;
}

/**
 * Tidy layout: leaves 0, 1, 2, ... in pre-order, each parent midway between
 * its first and last child; x_min/x_max the leaf span of the subtree; size the
 * subtree's node count. Writes into `out` (arrays of length >= n) when given.
 */
export function tidyLayout(parent, dir, n, out = null, children = null) {
  const ch = children ?? buildChildren(parent, dir, n);
  const pre = preorder(ch, n);
  const x = out?.x ?? new Float64Array(n);
  const xMin = out?.xMin ?? new Float64Array(n);
  const xMax = out?.xMax ?? new Float64Array(n);
  const size = out?.size ?? new Int32Array(n);
  const { start, list } = ch;
  let leaf = 0;
  for (let i = 0; i < pre.length; i++) {
    const r = pre[i];
    if (start[r + 1] === start[r]) {
      x[r] = leaf; xMin[r] = leaf; xMax[r] = leaf; size[r] = 1;
      leaf++;
    }
  }
  for (let i = pre.length - 1; i >= 0; i--) { // children before parents
    const r = pre[i];
    const a = start[r];
    const b = start[r + 1];
    if (a === b) continue;
    const first = list[a];
    const last = list[b - 1];
    x[r] = 0.5 * (x[first] + x[last]);
    xMin[r] = xMin[first];
    xMax[r] = xMax[last];
    let s = 1;
    for (let j = a; j < b; j++) s += size[list[j]];
    size[r] = s;
  }
  return { x, xMin, xMax, size, leaves: leaf, children: ch, pre };
}

/**
 * Status counts per subtree, from the leaves up: counts[r*8 + s] is the number
 * of nodes of status s in r's subtree, counts[r*8 + 7] its flags
 * (FLAG_INCUMBENT). `topDown` lists rows parents-first; omit it when every
 * parent row precedes its children (true of run tables).
 */
export function subtreeCounts(parent, status, n, { incumbentRows = [], topDown = null,
  out = null } = {}) {
  const counts = out && out.length >= n * AGG_STRIDE ? out : new Uint32Array(n * AGG_STRIDE);
  counts.fill(0, 0, n * AGG_STRIDE);
  for (let r = 0; r < n; r++) counts[r * AGG_STRIDE + status[r]] = 1;
  for (const r of incumbentRows) if (r >= 0 && r < n) counts[r * AGG_STRIDE + 7] |= FLAG_INCUMBENT;
  const m = topDown ? topDown.length : n;
  for (let i = m - 1; i >= 0; i--) {
    const r = topDown ? topDown[i] : i;
    const p = parent[r];
    if (p < 0) continue;
    const a = r * AGG_STRIDE;
    const b = p * AGG_STRIDE;
    counts[b] += counts[a];
    counts[b + 1] += counts[a + 1];
    counts[b + 2] += counts[a + 2];
    counts[b + 3] += counts[a + 3];
    counts[b + 4] += counts[a + 4];
    counts[b + 5] += counts[a + 5];
    counts[b + 6] += counts[a + 6];
    counts[b + 7] |= counts[a + 7];
  }
  return counts;
}

/** Smallest and largest y in each subtree: {yLo, yHi}. */
export function subtreeRange(parent, y, n, { topDown = null, out = null } = {}) {
  const yLo = out?.yLo?.length >= n ? out.yLo : new Float64Array(n);
  const yHi = out?.yHi?.length >= n ? out.yHi : new Float64Array(n);
  yLo.set(y.subarray(0, n));
  yHi.set(y.subarray(0, n));
  const m = topDown ? topDown.length : n;
  for (let i = m - 1; i >= 0; i--) {
    const r = topDown ? topDown[i] : i;
    const p = parent[r];
    if (p < 0) continue;
    if (yLo[r] < yLo[p]) yLo[p] = yLo[r];
    if (yHi[r] > yHi[p]) yHi[p] = yHi[r];
  }
  return { yLo, yHi };
}

/**
 * Rows whose bound is not their own in the bound layout: never solved (discarded,
 * open) or without a bound (infeasible). They are leaves; the renderer draws them
 * a few pixels below their parent so that they do not hide it.
 */
export function inheritedBounds(bound, status, n, notOwn, out = null) {
  const flag = out && out.length >= n ? out : new Uint8Array(n);
  for (let r = 0; r < n; r++) {
    const b = bound[r];
    flag[r] = (b !== b || !Number.isFinite(b) || ((notOwn >> status[r]) & 1)) ? 1 : 0;
  }
  return flag;
}

/** Largest value of `v` in each subtree (Int32Array), e.g. the deepest depth below a node. */
export function subtreeMax(parent, v, n, topDown = null, out = null) {
  const hi = out && out.length >= n ? out : new Int32Array(Math.max(n, v.length));
  hi.set(v.subarray(0, n));
  const m = topDown ? topDown.length : n;
  for (let i = m - 1; i >= 0; i--) {
    const r = topDown ? topDown[i] : i;
    const p = parent[r];
    if (p >= 0 && hi[r] > hi[p]) hi[p] = hi[r];
  }
  return hi;
}

/**
 * Vertical position in the bound layout: the bound turned so that worse is
 * larger (down the screen); a node without a bound sits at its parent's.
 */
export function boundPositions(parent, bound, n, sense, out = null, topDown = null) {
  const y = out && out.length >= n ? out : new Float64Array(n);
  const sign = sense === 'max' ? -1 : 1;
  const m = topDown ? topDown.length : n;
  for (let i = 0; i < m; i++) {
    const r = topDown ? topDown[i] : i;
    const b = bound[r];
    if (b === b && Number.isFinite(b)) y[r] = sign * b;
    else {
      const p = parent[r];
      y[r] = p >= 0 ? y[p] : NaN;
    }
  }
  // A root without a bound: the smallest known value, so it stays on screen.
  let lo = Infinity;
  for (let r = 0; r < n; r++) if (y[r] < lo) lo = y[r];
  if (!Number.isFinite(lo)) lo = 0;
  for (let i = 0; i < m; i++) {
    const r = topDown ? topDown[i] : i;
    if (y[r] !== y[r]) y[r] = parent[r] >= 0 ? y[parent[r]] : lo;
  }
  return y;
}

/** Range of finite values in a[0..n): [lo, hi], or [0, 1] when there is none. */
export function finiteRange(a, n) {
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < n; i++) {
    const v = a[i];
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  if (!Number.isFinite(lo) || !Number.isFinite(hi)) return [0, 1];
  return [lo, hi];
}
