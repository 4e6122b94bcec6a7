// The visible rectangle of the tree in layout units, and the moves on it
// (fit, zoom about a point, pan). Pure, no DOM. A view is
// {x0, x1, y0, y1}: layout x from x0 to x1 fills the canvas width, layout y
// from y0 (top) to y1 (bottom) fills its height.

const MIN_SPAN = 1e-9;

/**
 * The view showing [xLo, xHi] × [yLo, yHi] with `pad` CSS pixels of margin on
 * each side (`padLeft` on the left, where the axis labels go).
 */
export function fitView(xLo, xHi, yLo, yHi, width, height, pad = 24, padLeft = pad) {
  let wx = xHi - xLo;
  let wy = yHi - yLo;
  if (!(wx > 0)) { xLo -= 1; xHi += 1; wx = 2; }
  if (!(wy > 0)) { yLo -= 0.5; yHi += 0.5; wy = 1; }
  const fx = Math.max(1, width - pad - padLeft) / wx;
  const fy = Math.max(1, height - 2 * pad) / wy;
  const py = pad / fy;
  return { x0: xLo - padLeft / fx, x1: xHi + pad / fx, y0: yLo - py, y1: yHi + py };
}

/** Zoom by `fx` horizontally and `fy` vertically (2 = twice as close) about pixel (px, py). */
export function zoomAt(view, fx, fy, px, py, width, height) {
  const ax = view.x0 + (px / width) * (view.x1 - view.x0);
  const ay = view.y0 + (py / height) * (view.y1 - view.y0);
  return {
    x0: ax - (ax - view.x0) / fx,
    x1: ax + (view.x1 - ax) / fx,
    y0: ay - (ay - view.y0) / fy,
    y1: ay + (view.y1 - ay) / fy,
  };
}

/** Move the view by (dx, dy) CSS pixels (content follows the pointer). */
export function panBy(view, dx, dy, width, height) {
  const ux = ((view.x1 - view.x0) / width) * dx;
  const uy = ((view.y1 - view.y0) / height) * dy;
  return { x0: view.x0 - ux, x1: view.x1 - ux, y0: view.y0 - uy, y1: view.y1 - uy };
}

/** Keep a view sensible: spans at least `minX`/`minY`, at most `maxX`/`maxY` layout units. */
export function clampView(view, { minX = 0.5, maxX = Infinity, minY = MIN_SPAN, maxY = Infinity } = {}) {
  let { x0, x1, y0, y1 } = view;
  const fixSpan = (a, b, lo, hi) => {
    const mid = 0.5 * (a + b);
    let span = b - a;
    if (!(span >= lo)) span = lo;
    if (span > hi) span = hi;
    return [mid - span / 2, mid + span / 2];
  };
  [x0, x1] = fixSpan(x0, x1, minX, maxX);
  [y0, y1] = fixSpan(y0, y1, minY, maxY);
  return { x0, x1, y0, y1 };
}

/** Centre the view on (x, y) without changing its zoom. */
export function centreOn(view, x, y) {
  const hx = 0.5 * (view.x1 - view.x0);
  const hy = 0.5 * (view.y1 - view.y0);
  return { x0: x - hx, x1: x + hx, y0: y - hy, y1: y + hy };
}

export function toScreenX(view, width, x) {
  return ((x - view.x0) * width) / (view.x1 - view.x0);
}

export function toScreenY(view, height, y) {
  return ((y - view.y0) * height) / (view.y1 - view.y0);
}

/** A short text form of a view for the URL: "x0,x1,y0,y1" with enough digits. */
export function viewToText(view) {
  const f = (v) => Number(v.toPrecision(7)).toString();
  return [view.x0, view.x1, view.y0, view.y1].map(f).join(',');
}

export function viewFromText(text) {
  if (!text) return null;
  const parts = String(text).split(',').map(Number);
  if (parts.length !== 4 || parts.some((v) => !Number.isFinite(v))) return null;
  const [x0, x1, y0, y1] = parts;
  if (!(x1 > x0) || !(y1 > y0)) return null;
  return { x0, x1, y0, y1 };
}

/** Does view `a` differ from `b` by less than a pixel-ish tolerance? */
export function sameView(a, b, tol = 1e-6) {
  if (!a || !b) return false;
  const sx = Math.max(Math.abs(a.x1 - a.x0), MIN_SPAN) * tol;
  const sy = Math.max(Math.abs(a.y1 - a.y0), MIN_SPAN) * tol;
  return Math.abs(a.x0 - b.x0) <= sx && Math.abs(a.x1 - b.x1) <= sx &&
    Math.abs(a.y0 - b.y0) <= sy && Math.abs(a.y1 - b.y1) <= sy;
}

/** A round step (1, 2, 5 × 10^k) near `raw`; whole numbers only for depths. */
export function niceStep(raw, integer = false) {
  if (!(raw > 0) || !Number.isFinite(raw)) return 0;
  const p = 10 ** Math.floor(Math.log10(raw));
  const m = raw / p;
  const step = (m <= 1 ? 1 : m <= 2 ? 2 : m <= 5 ? 5 : 10) * p;
  return integer ? Math.max(1, Math.round(step)) : step;
}
