// Formatting of numbers, gaps, times and counts for people. Pure, no DOM.

const DASH = '\u2014';

/** A bound or objective value: up to `digits` significant digits, no trailing zeros. */
export function formatValue(v, digits = 6) {
  if (v === null || v === undefined || Number.isNaN(v)) return DASH;
  if (v === Infinity) return '+\u221e';
  if (v === -Infinity) return '\u2212\u221e';
  if (v === 0) return '0';
  const a = Math.abs(v);
  if (a >= 1e9 || a < 1e-4) return trimExp(v.toExponential(digits - 1)).replace('-', '\u2212');
  const decimals = Math.max(0, digits - 1 - Math.floor(Math.log10(a)));
  let s = v.toFixed(Math.min(decimals, 12));
  if (s.includes('.')) s = s.replace(/0+$/, '').replace(/\.$/, '');
  return s.startsWith('-') ? `\u2212${s.slice(1)}` : s;
}

function trimExp(s) {
  return s.replace(/\.?0+e/, 'e');
}

/** A relative gap (0.0123) as a percentage ("1.23%"). */
export function formatGap(g) {
  if (g === null || g === undefined || Number.isNaN(g)) return DASH;
  const p = g * 100;
  if (p === 0) return '0%';
  if (p < 0.01) return '<0.01%';
  if (p < 10) return `${p.toFixed(2)}%`;
  if (p < 100) return `${p.toFixed(1)}%`;
  return `${Math.round(p)}%`;
}

/** A count with thin thousands separators: 1234567 -> "1,234,567". */
export function formatCount(n) {
  if (n === null || n === undefined || Number.isNaN(n)) return DASH;
  const s = String(Math.round(Math.abs(n)));
  const out = s.replace(/\B(?=(\d{3})+(?!\d))/g, ',');
  return n < 0 ? `\u2212${out}` : out;
}

/** Seconds for people: "0.41 s", "12.3 s", "4 min 05 s", "1 h 02 min". */
export function formatSeconds(s) {
  if (s === null || s === undefined || Number.isNaN(s)) return DASH;
  if (s < 0.01) return `${(s * 1000).toFixed(s < 0.001 ? 2 : 1)} ms`;
  if (s < 10) return `${s.toFixed(2)} s`;
  if (s < 60) return `${s.toFixed(1)} s`;
  const m = Math.floor(s / 60);
  if (m < 60) return `${m} min ${String(Math.floor(s - m * 60)).padStart(2, '0')} s`;
  const h = Math.floor(m / 60);
  return `${h} h ${String(m - h * 60).padStart(2, '0')} min`;
}

/** A share (0..1) as a whole percentage, never rounding a non-zero share to 0. */
export function formatShare(part, whole) {
  if (!whole) return DASH;
  const p = (100 * part) / whole;
  if (part > 0 && p < 1) return '<1%';
  return `${Math.round(p)}%`;
}

/** A signed change ("+1.25", "−0.5"), for bound gains. */
export function formatDelta(v, digits = 4) {
  if (v === null || v === undefined || Number.isNaN(v)) return DASH;
  if (v === 0) return '0';
  const s = formatValue(Math.abs(v), digits);
  return v > 0 ? `+${s}` : `\u2212${s}`;
}

/** "down" or "up" bound change as the inequality it adds: "x3 ≤ 2". */
export function formatBranch(name, dir, value) {
  const op = dir === 'up' ? '\u2265' : '\u2264';
  return `${name} ${op} ${formatValue(value)}`;
}

/** A run id shortened for headings: the model part and the rule/order. */
export function describeRunId(id) {
  const parts = String(id).split('.');
  if (parts.length >= 3) return { model: parts[0], rest: parts.slice(1).join(' \u00b7 ') };
  return { model: String(id), rest: '' };
}
