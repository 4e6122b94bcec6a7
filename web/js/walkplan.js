// The walkthrough's pure helpers (no DOM): which rows are solved by step k,
// the page cache of narrated steps, jumps to the next interesting step, and
// where notes sit. Step k is the k-th relaxation solved: the solved rows
// sorted by processing order (ties by row), as the server numbers them.

export const PAGE_SIZE = 200; // steps per request (the server allows up to 500)
export const MIN_SPEED = 1; // steps per second
export const MAX_SPEED = 50;
export const SPEEDS = Object.freeze([1, 2, 5, 10, 20, 50]);
const UNSOLVED_SPAN = 0x7fffffff; // a subtree holding a never-solved node is never "all revealed"

/**
 * Ranks of the solved rows: `rank[row]` is the step that solved the row (-1 when
 * never solved) and `rows[k]` the row solved at step k.
 */
export function solvedRanks(order, n) {
  let count = 0;
  let maxOrder = -1;
  for (let r = 0; r < n; r++) {
    const o = order[r];
    if (o >= 0) {
      count++;
      if (o > maxOrder) maxOrder = o;
    }
  }
  const rows = new Int32Array(count);
  const rank = new Int32Array(n).fill(-1);
  if (count === 0) return { rank, rows };
  if (maxOrder < 4 * n + 1024) {
    // Orders are small integers: bucket them (a bucket holds its rows in row order).
    const first = new Int32Array(maxOrder + 2);
    for (let r = 0; r < n; r++) if (order[r] >= 0) first[order[r] + 1]++;
    for (let o = 0; o <= maxOrder; o++) first[o + 1] += first[o];
    for (let r = 0; r < n; r++) if (order[r] >= 0) rows[first[order[r]]++] = r;
  } else {
    let k = 0;
    for (let r = 0; r < n; r++) if (order[r] >= 0) rows[k++] = r;
    rows.sort((a, b) => order[a] - order[b] || a - b);
  }
  for (let k = 0; k < count; k++) rank[rows[k]] = k;
  return { rank, rows };
}

/** The step that solved processing order `o` (binary search over `rows`), or -1. */
export function stepOfOrder(order, rows, o) {
  let lo = 0;
  let hi = rows.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (order[rows[mid]] < o) lo = mid + 1;
    else hi = mid;
  }
  return lo < rows.length && order[rows[lo]] === o ? lo : -1;
}

/** Visibility of every row at step k: {mask (1 = solved by then), count}. */
export function visibleMask(rank, n, k, out = null) {
  const mask = out && out.length >= n ? out : new Uint8Array(n);
  let count = 0;
  for (let r = 0; r < n; r++) {
    const on = rank[r] >= 0 && rank[r] <= k ? 1 : 0;
    mask[r] = on;
    count += on;
  }
  return { mask, count };
}

/** Rows solved by step k (a count over the rows, not k + 1 taken on trust). */
export function visibleCount(rank, n, k) {
  let count = 0;
  for (let r = 0; r < n; r++) if (rank[r] >= 0 && rank[r] <= k) count++;
  return count;
}

/**
 * The last step touching each subtree: the largest rank below and at each row,
 * or a huge value when the subtree holds a node that is never solved. A subtree
 * whose span is <= k is wholly revealed at step k (the tree may draw it as one bar).
 * `topDown`: rows with every parent before its children (null when rows already are).
 */
export function subtreeLastStep(parent, rank, n, topDown = null) {
  const span = new Int32Array(n);
  for (let r = 0; r < n; r++) span[r] = rank[r] < 0 ? UNSOLVED_SPAN : rank[r];
  const m = topDown ? topDown.length : n;
  for (let i = m - 1; i >= 0; i--) {
    const r = topDown ? topDown[i] : i;
    const p = parent[r];
    if (p >= 0 && span[r] > span[p]) span[p] = span[r];
  }
  return span;
}

/** Clamp a step index to [0, total - 1] (0 when there are no steps). */
export function clampStep(k, total) {
  if (!(total > 0)) return 0;
  const v = Math.round(Number(k));
  if (!Number.isFinite(v) || v < 0) return 0;
  return v >= total ? total - 1 : v;
}

/** A speed in steps per second, kept within [MIN_SPEED, MAX_SPEED]. */
export function clampSpeed(v) {
  const s = Number(v);
  if (!Number.isFinite(s)) return 5;
  return Math.min(MAX_SPEED, Math.max(MIN_SPEED, s));
}

/** "Step 12 of 111" for the 0-based step 11. */
export function counterText(k, total) {
  if (!(total > 0)) return 'No steps';
  return `Step ${(k + 1).toLocaleString('en')} of ${total.toLocaleString('en')}`;
}

/** The first entry of an ascending list that is > k, or -1. */
export function nextAfter(list, k) {
  let lo = 0;
  let hi = list.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (list[mid] <= k) lo = mid + 1;
    else hi = mid;
  }
  return lo < list.length ? list[lo] : -1;
}

/** The last entry of an ascending list that is < k, or -1. */
export function prevBefore(list, k) {
  let lo = 0;
  let hi = list.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (list[mid] < k) lo = mid + 1;
    else hi = mid;
  }
  return lo > 0 ? list[lo - 1] : -1;
}

/** Where step k falls in a timeline `width` wide (the centre of its slot). */
export function stepToX(k, total, width) {
  if (!(total > 0)) return 0;
  return ((k + 0.5) * width) / total;
}

/** The step under position x of a timeline `width` wide. */
export function xToStep(x, total, width) {
  if (!(total > 0) || !(width > 0)) return 0;
  return clampStep(Math.floor((x / width) * total), total);
}

/**
 * The page cache of narrated steps. `fetchPage(start, count)` returns a promise
 * of the steps API's body; pages are fetched once (a request in flight is
 * shared) and the `maxPages` used least recently are kept.
 */
export class StepPages {
  constructor(fetchPage, { pageSize = PAGE_SIZE, maxPages = 64 } = {}) {
    this.fetchPage = fetchPage;
    this.pageSize = pageSize;
    this.maxPages = maxPages;
    this.pages = new Map(); // page start -> steps array (insertion order = recency)
    this.inflight = new Map(); // page start -> promise
    this.requests = 0;
    this.total = null;
    this.lists = { incumbent: [], finding: [], note: [] };
    this.sense = 'min';
    this.endStatus = null;
  }

  pageOf(k) {
    return Math.floor(k / this.pageSize) * this.pageSize;
  }

  /** The step if its page is here, else undefined (never fetches). */
  peek(k) {
    const start = this.pageOf(k);
    const page = this.pages.get(start);
    if (!page) return undefined;
    this.pages.delete(start); // most recently used last
    this.pages.set(start, page);
    return page[k - start];
  }

  has(k) {
    return this.pages.has(this.pageOf(k));
  }

  /** A promise of step k (undefined past the end). */
  async get(k) {
    const hit = this.peek(k);
    if (hit !== undefined || (this.total !== null && (k < 0 || k >= this.total))) return hit;
    await this.load(this.pageOf(k));
    return this.peek(k);
  }

  /** Fetch the page starting at `start` unless it is here or on its way. */
  load(start) {
    if (this.pages.has(start)) return Promise.resolve(this.pages.get(start));
    if (this.total !== null && start >= this.total) return Promise.resolve([]);
    const pending = this.inflight.get(start);
    if (pending) return pending;
    this.requests++;
    const p = this.fetchPage(start, this.pageSize).then((body) => {
      this.inflight.delete(start);
      this._learn(body);
      const steps = body.steps ?? [];
      this.pages.set(start, steps);
      while (this.pages.size > this.maxPages) this.pages.delete(this.pages.keys().next().value);
      return steps;
    }, (err) => {
      this.inflight.delete(start);
      throw err;
    });
    this.inflight.set(start, p);
    return p;
  }

  /** Start fetching the page after k's when k is past the middle of its page. */
  prefetch(k) {
    const start = this.pageOf(k);
    const next = start + this.pageSize;
    if (k - start >= this.pageSize / 2 && (this.total === null || next < this.total) &&
        !this.pages.has(next)) this.load(next).catch(() => {});
  }

  _learn(body) {
    if (typeof body.total === 'number') this.total = body.total;
    this.lists = {
      incumbent: body.incumbent_steps ?? this.lists.incumbent,
      finding: body.finding_steps ?? this.lists.finding,
      note: body.note_steps ?? this.lists.note,
    };
    if (body.sense) this.sense = body.sense;
    if ('end_status' in body) this.endStatus = body.end_status;
  }

  /** Forget every cached page (the notes of the steps changed). */
  clear() {
    this.pages.clear();
  }
}

/**
 * The next (dir = +1) or previous (dir = -1) step after k whose `flag` is true,
 * reading pages from `pages` (fetched as needed); -1 when there is none.
 */
export async function findFlagged(pages, k, flag, dir = 1) {
  if (pages.total === null) await pages.get(0);
  const total = pages.total ?? 0;
  let i = k + dir;
  while (i >= 0 && i < total) {
    const start = pages.pageOf(i);
    const steps = await pages.load(start);
    const end = start + steps.length;
    for (; i >= start && i < end; i += dir) if (steps[i - start]?.[flag]) return i;
    if (steps.length === 0) break;
  }
  return -1;
}

/**
 * Notes grouped by the step they sit at: {byStep: Map step -> [note], steps:
 * ascending step list, nodeIds: Set of node ids carrying a note}. A note names a
 * node and/or a processing order; `stepOfNode(id)` and `stepOfOrder(o)` map them.
 */
export function notesByStep(notes, stepOfNode, stepOfOrder) {
  const byStep = new Map();
  const nodeIds = new Set();
  for (const note of notes ?? []) {
    let k = -1;
    if (note.node !== null && note.node !== undefined) {
      nodeIds.add(note.node);
      k = stepOfNode(note.node);
    }
    if (k < 0 && note.order !== null && note.order !== undefined) k = stepOfOrder(note.order);
    if (k < 0) continue;
    if (!byStep.has(k)) byStep.set(k, []);
    byStep.get(k).push(note);
  }
  return { byStep, steps: Array.from(byStep.keys()).sort((a, b) => a - b), nodeIds };
}

/** Where a playing walkthrough is `elapsedMs` after it started at `from`. */
export function playedTo(from, elapsedMs, speed, total) {
  const k = from + Math.floor((Math.max(0, elapsedMs) * clampSpeed(speed)) / 1000);
  return clampStep(k, total);
}
