// Figures computed from the tree arrays: nodes by status, by depth and
// status, and per-variable branching statistics. Pure, no DOM.

import { INFEASIBLE, STATUS_COUNT } from './statuses.js';

/** Nodes per status code: Uint32Array(7). */
export function countByStatus(status, n) {
  const out = new Uint32Array(STATUS_COUNT);
  for (let r = 0; r < n; r++) out[status[r]]++;
  return out;
}

/** Nodes per depth and status: {depths, counts: Uint32Array(depths * 7)}, row-major by depth. */
export function countByDepth(status, depth, n) {
  let maxDepth = 0;
  for (let r = 0; r < n; r++) if (depth[r] > maxDepth) maxDepth = depth[r];
  const depths = n ? maxDepth + 1 : 0;
  const counts = new Uint32Array(depths * STATUS_COUNT);
  for (let r = 0; r < n; r++) counts[depth[r] * STATUS_COUNT + status[r]]++;
  return { depths, counts };
}

/**
 * Per variable: how often the search branched on it, and the mean bound gain
 * of its down and up children (child bound minus parent bound, turned so that a
 * positive gain means the bound got worse, i.e. tighter, for the model's sense).
 * Children without a bound (infeasible) are counted apart.
 * Returns an array of plain rows, one per variable branched on (a small list).
 */
export function branchingStats(store) {
  const { n, parent, var: vars, dir, bound, status } = store;
  const sign = store.sense === 'max' ? -1 : 1;
  const index = new Map();
  const rows = [];
  const rowFor = (v) => {
    let k = index.get(v);
    if (k === undefined) {
      k = rows.length;
      index.set(v, k);
      rows.push({ var: v, branched: 0, downN: 0, downSum: 0, upN: 0, upSum: 0,
        downInfeasible: 0, upInfeasible: 0, firstRow: -1, firstDepth: Infinity });
    }
    return rows[k];
  };
  const counted = new Uint8Array(n); // parents already counted as one branching
  for (let r = 0; r < n; r++) {
    const p = parent[r];
    const v = vars[r];
    if (p < 0 || v < 0) continue;
    const d = dir[r];
    const row = rowFor(v);
    if (!counted[p]) {
      counted[p] = 1;
      row.branched++;
      if (store.depth[p] < row.firstDepth) { row.firstDepth = store.depth[p]; row.firstRow = p; }
    }
    const gain = sign * (bound[r] - bound[p]);
    const infeasible = status[r] === INFEASIBLE || !Number.isFinite(bound[r]);
    if (d === 1) {
      if (infeasible) row.downInfeasible++;
      else if (Number.isFinite(gain)) { row.downN++; row.downSum += gain; }
    } else if (d === 2) {
      if (infeasible) row.upInfeasible++;
      else if (Number.isFinite(gain)) { row.upN++; row.upSum += gain; }
    }
  }
  for (const row of rows) {
    row.downMean = row.downN ? row.downSum / row.downN : NaN;
    row.upMean = row.upN ? row.upSum / row.upN : NaN;
    // A product score, as pseudocost rules use: both sides must move the bound.
    const eps = 1e-6;
    row.score = Number.isFinite(row.downMean) || Number.isFinite(row.upMean)
      ? Math.max(row.downMean || 0, eps) * Math.max(row.upMean || 0, eps) : NaN;
  }
  return rows;
}

/** Sort rows by `key` ("var", "name", "branched", "downMean", "upMean", ...); NaN last. */
export function sortRows(rows, key, descending = true) {
  const sign = descending ? -1 : 1;
  return rows.slice().sort((a, b) => {
    const va = a[key];
    const vb = b[key];
    if (typeof va === 'string' || typeof vb === 'string') {
      return sign * String(va ?? '').localeCompare(String(vb ?? ''), undefined, { numeric: true });
    }
    const na = va === undefined || Number.isNaN(va);
    const nb = vb === undefined || Number.isNaN(vb);
    if (na || nb) return na === nb ? a.var - b.var : na ? 1 : -1;
    if (va === vb) return a.var - b.var;
    return sign * (va - vb);
  });
}
