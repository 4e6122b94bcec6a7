// The live forecast: a refresh loop that asks the server again every few
// seconds with at most one request in flight, and the words for a forecast
// (remaining nodes and time with their range). Pure: no DOM; timers and the
// clock can be passed in, so Node tests drive it without waiting.

import { formatCount, formatSeconds } from './format.js';

export const REFRESH_MS = 2000; // the shortest pause between two answers and the next ask
export const SLOW_FACTOR = 2; // ...and at least this many times the last request's duration

/**
 * Calls `fetcher()` (a promise) now, then again `pause` ms after each answer,
 * pause = max(minMs, factor × the answer's duration): a growing run whose
 * findings take longer to compute is asked less often, and the server never
 * sees two requests of one page at once. `stop()` ends it; an answer that
 * arrives after stop() is dropped.
 */
export class RefreshLoop {
  constructor(fetcher, { onResult, onError, minMs = REFRESH_MS, factor = SLOW_FACTOR,
    setTimer = (fn, ms) => setTimeout(fn, ms), clearTimer = (t) => clearTimeout(t),
    now = () => Date.now() } = {}) {
    this.fetcher = fetcher;
    this.onResult = onResult;
    this.onError = onError;
    this.minMs = minMs;
    this.factor = factor;
    this.setTimer = setTimer;
    this.clearTimer = clearTimer;
    this.now = now;
    this.inFlight = false;
    this.stopped = true;
    this.requests = 0;
    this.lastPause = 0;
    this._timer = null;
  }

  start() {
    this.stopped = false;
    this._ask();
  }

  stop() {
    this.stopped = true;
    if (this._timer !== null) this.clearTimer(this._timer);
    this._timer = null;
  }

  _ask() {
    this._timer = null;
    if (this.stopped || this.inFlight) return;
    this.inFlight = true;
    this.requests++;
    const t0 = this.now();
    let p;
    try {
      p = Promise.resolve(this.fetcher());
    } catch (err) {
      p = Promise.reject(err);
    }
    return p.then((r) => {
      if (!this.stopped) this.onResult?.(r);
    }, (err) => {
      if (!this.stopped) this.onError?.(err);
    }).finally(() => {
      this.inFlight = false;
      if (this.stopped) return;
      this.lastPause = Math.max(this.minMs, this.factor * (this.now() - t0));
      this._timer = this.setTimer(() => this._ask(), this.lastPause);
    });
  }
}

/**
 * A count for a forecast: exact below 10,000, else three significant digits
 * (a forecast is not that precise): 1,234 · 125,000 · 1.7 million · 2.4 billion.
 */
export function roughCount(n) {
  if (n === null || n === undefined || !Number.isFinite(n)) return '\u2014';
  let a = Math.round(n);
  if (a >= 1e4) a = Number(a.toPrecision(3));
  if (a < 1e6) return formatCount(a);
  if (a < 1e9) return `${(a / 1e6).toPrecision(a < 1e7 ? 2 : 3).replace(/\.0$/, '')} million`;
  if (a < 1e12) return `${(a / 1e9).toPrecision(a < 1e10 ? 2 : 3).replace(/\.0$/, '')} billion`;
  return `${(a / 1e12).toPrecision(2)} trillion`;
}

/** Seconds for a forecast: format.js's words up to two days, then days and years. */
export function roughSeconds(s) {
  if (s === null || s === undefined || !Number.isFinite(s)) return '\u2014';
  const day = 86400;
  if (s < 2 * day) return formatSeconds(s);
  if (s < 730 * day) return `${Math.round(s / day)} days`;
  return `${(s / (365 * day)).toPrecision(2)} years`;
}

/** "a – b" for a range; "at least a" when there is no upper end. */
export function rangeText(low, high, fmt) {
  if (high === null || high === undefined || !Number.isFinite(high)) return `at least ${fmt(low)}`;
  return `${fmt(low)} \u2013 ${fmt(high)}`;
}

/**
 * What the run strip says about a forecast (`forecast` of GET /api/runs/{id}/findings),
 * as {text, state}: state is 'none' (nothing to say yet), 'complete' or 'estimate'.
 */
export function forecastLine(fc) {
  if (!fc) return { text: 'Forecast: not available', state: 'none' };
  if (fc.finished) {
    // `done` counts every node created, `processed_total` the relaxations solved.
    const solved = fc.processed_total ?? fc.done;
    const extra = solved !== fc.done ? ` (${formatCount(solved)} solved)` : '';
    return { text: `Tree complete: ${formatCount(fc.done)} nodes${extra}`, state: 'complete' };
  }
  if (fc.total_nodes === null || fc.total_nodes === undefined) {
    return { text: 'Forecast: waiting for the first nodes', state: 'none' };
  }
  const left = fc.remaining_nodes;
  const lowLeft = Math.max(0, (fc.low ?? fc.total_nodes) - fc.done);
  const highLeft = fc.high === null || fc.high === undefined ? null : Math.max(0, fc.high - fc.done);
  let text = `Forecast: ~${roughCount(left)} more nodes (${rangeText(lowLeft, highLeft, roughCount)})`;
  if (fc.remaining_seconds !== null && fc.remaining_seconds !== undefined) {
    text += `, ~${roughSeconds(fc.remaining_seconds)} (${rangeText(fc.remaining_seconds_low,
      fc.remaining_seconds_high, roughSeconds)})`;
  }
  return { text, state: 'estimate' };
}
