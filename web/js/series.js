// Bound series for the chart: growable columns and a reduction to a few
// points per pixel (first, last, and each bucket's min and max, in x order)
// over the visible x range. Pure, no DOM.

/** One curve: x ascending, y values (NaN = unknown); grows by doubling. */
export class Curve {
  constructor(capacity = 256) {
    this.n = 0;
    this.x = new Float64Array(capacity);
    this.y = new Float64Array(capacity);
  }

  static from(xs, ys) {
    const c = new Curve(Math.max(1, xs.length));
    for (let i = 0; i < xs.length; i++) c.push(xs[i] ?? NaN, ys[i] ?? NaN);
    return c;
  }

  static wrap(x, y) {
    const c = new Curve(0);
    c.x = x;
    c.y = y;
    c.n = x.length;
    return c;
  }

  push(x, y) {
    if (this.n >= this.x.length) {
      const cap = Math.max(256, this.x.length * 2);
      const nx = new Float64Array(cap);
      const ny = new Float64Array(cap);
      nx.set(this.x.subarray(0, this.n));
      ny.set(this.y.subarray(0, this.n));
      this.x = nx;
      this.y = ny;
    }
    this.x[this.n] = x;
    this.y[this.n] = y;
    this.n++;
  }

  get last() {
    return this.n ? this.y[this.n - 1] : NaN;
  }

  get lastX() {
    return this.n ? this.x[this.n - 1] : NaN;
  }
}

/** First index i in x[0..n) with x[i] >= v (n if none). */
export function lowerBound(x, n, v) {
  let lo = 0;
  let hi = n;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (x[mid] < v) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/**
 * Reduce curve points with from <= x <= to to at most about 2 * buckets + 4
 * points: the point just before the range and just after it (so lines run to
 * the edges), and each bucket's first, lowest, highest and last point in x
 * order. NaN values are skipped. Returns {x: number[], y: number[]}.
 */
export function reduceRange(curve, from, to, buckets) {
  const { x, y } = curve;
  const n = curve.n;
  const outX = [];
  const outY = [];
  if (n === 0) return { x: outX, y: outY };
  let a = lowerBound(x, n, from);
  let b = lowerBound(x, n, to);
  while (b < n && x[b] <= to) b++;
  if (a > 0) a--; // one point before the range
  if (b < n) b++; // one point after
  const count = b - a;
  if (count <= 2 * buckets + 4) {
    for (let i = a; i < b; i++) if (y[i] === y[i]) { outX.push(x[i]); outY.push(y[i]); }
    return { x: outX, y: outY };
  }
  const lo = x[a];
  const span = x[b - 1] - lo || 1;
  const scale = buckets / span;
  let i = a;
  while (i < b) {
    const bucket = Math.min(buckets - 1, Math.floor((x[i] - lo) * scale));
    let j = i;
    let iMin = -1;
    let iMax = -1;
    let iFirst = -1;
    let iLast = -1;
    while (j < b && Math.min(buckets - 1, Math.floor((x[j] - lo) * scale)) === bucket) {
      const v = y[j];
      if (v === v) {
        if (iFirst < 0) iFirst = j;
        iLast = j;
        if (iMin < 0 || v < y[iMin]) iMin = j;
        if (iMax < 0 || v > y[iMax]) iMax = j;
      }
      j++;
    }
    if (iFirst >= 0) {
      const picks = [iFirst, iMin, iMax, iLast].sort((p, q) => p - q);
      let prev = -1;
      for (const k of picks) {
        if (k === prev) continue;
        outX.push(x[k]);
        outY.push(y[k]);
        prev = k;
      }
    }
    i = j;
  }
  return { x: outX, y: outY };
}

/** The contract's relative gap; NaN while either side is unknown. */
export function relativeGap(primal, dual) {
  if (!Number.isFinite(primal) || !Number.isFinite(dual)) return NaN;
  return Math.abs(primal - dual) / Math.max(Math.abs(primal), Math.abs(dual), 1e-10);
}

/** Full x range of a set of curves: [lo, hi] or null. */
export function curvesRange(curves) {
  let lo = Infinity;
  let hi = -Infinity;
  for (const c of curves) {
    if (!c || c.n === 0) continue;
    if (c.x[0] < lo) lo = c.x[0];
    if (c.x[c.n - 1] > hi) hi = c.x[c.n - 1];
  }
  return Number.isFinite(lo) ? [lo, hi] : null;
}

/**
 * Primal, dual and gap curves over both x axes (nodes processed, seconds),
 * filled from the server's series or appended from live events.
 */
export class BoundSeries {
  constructor() {
    this.axes = {
      nodes: { primal: new Curve(), dual: new Curve(), gap: new Curve(), loaded: false },
      time: { primal: new Curve(), dual: new Curve(), gap: new Curve(), loaded: false },
    };
    this.incumbents = []; // {nodes, time, objective, node}
    this.version = 0;
  }

  /** Replace one axis with the server's answer to GET .../series. */
  setFromServer(axis, body) {
    const a = this.axes[axis];
    a.primal = Curve.from(body.primal.x, body.primal.y);
    a.dual = Curve.from(body.dual.x, body.dual.y);
    a.gap = Curve.from(body.gap.x, body.gap.y);
    a.loaded = true;
    this.incumbents = (body.incumbents ?? []).map((inc) => ({
      nodes: inc.order === null || inc.order === undefined ? 0 : inc.order + 1,
      time: inc.time, objective: inc.objective, node: inc.node,
    }));
    this.version++;
  }

  /** Append live events (incumbent and progress). */
  appendEvents(events) {
    let changed = false;
    for (const ev of events) {
      if (ev.kind === 'incumbent') {
        const nodes = ev.order === null || ev.order === undefined ? 0 : ev.order + 1;
        this.incumbents.push({ nodes, time: ev.time, objective: ev.objective, node: ev.node });
        pushMonotone(this.axes.nodes.primal, nodes, ev.objective);
        pushMonotone(this.axes.time.primal, ev.time, ev.objective);
        changed = true;
      } else if (ev.kind === 'progress' || ev.kind === 'end') {
        const nodes = ev.nodes;
        const dual = ev.dual_bound ?? NaN;
        const primal = ev.kind === 'end' ? (ev.objective ?? NaN) : (ev.primal_bound ?? NaN);
        let gap = ev.gap ?? NaN;
        if (!Number.isFinite(gap)) gap = relativeGap(primal, dual);
        for (const [axis, x] of [['nodes', nodes], ['time', ev.time]]) {
          if (!Number.isFinite(x)) continue;
          const a = this.axes[axis];
          if (Number.isFinite(dual)) pushMonotone(a.dual, x, dual);
          if (Number.isFinite(primal) && a.primal.n) pushMonotone(a.primal, x, primal);
          if (Number.isFinite(gap)) pushMonotone(a.gap, x, gap);
          a.loaded = true;
        }
        changed = true;
      }
    }
    if (changed) this.version++;
    return changed;
  }
}

/** Append (x, y), keeping x non-decreasing (a later equal x replaces nothing, it adds a step). */
function pushMonotone(curve, x, y) {
  if (curve.n && x < curve.x[curve.n - 1]) x = curve.x[curve.n - 1];
  curve.push(x, y);
}
