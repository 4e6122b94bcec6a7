// The tree renderer: draws one planned frame (lod.js) on a Canvas 2D, in
// batches: all edges in one stroke, then marks grouped by status (one fill
// per status), then the selection, the path to the root and the incumbent.

import { MARK_BAR, MARK_FOLDED, MARK_RARE } from './lod.js';
import { traceShape } from './shapes.js';
import {
  EDGE_COLOUR, INCUMBENT_COLOUR, PATH_COLOUR, STATUS_COUNT, STATUS_STYLE,
} from './statuses.js';
import { formatCount, formatValue } from './format.js';
import { niceStep } from './view.js';

const BACKGROUND = '#fbfbf8';
const HIGHLIGHT_COLOUR = '#5a2d82'; // nodes a finding points at: a colour no status uses
export const NOTE_COLOUR = '#8c4f12'; // the tag on a node that carries a note (also in app.css)
const AXIS_TEXT = '#5b6169';
const FONT = '11px system-ui, -apple-system, "Segoe UI", sans-serif';

export class TreeRenderer {
  constructor(canvas) {
    this.canvas = canvas;
    this.ctx = canvas.getContext('2d', { alpha: false });
    this.width = 0;
    this.height = 0;
    this.ratio = 1;
    this._byStatus = Array.from({ length: STATUS_COUNT }, () => []);
  }

  /** Match the backing store to the element's CSS size; true when it changed. */
  resize() {
    const rect = this.canvas.getBoundingClientRect();
    const ratio = Math.min(2, window.devicePixelRatio || 1);
    const w = Math.max(1, Math.round(rect.width));
    const h = Math.max(1, Math.round(rect.height));
    if (w === this.width && h === this.height && ratio === this.ratio) return false;
    this.width = w;
    this.height = h;
    this.ratio = ratio;
    this.canvas.width = Math.round(w * ratio);
    this.canvas.height = Math.round(h * ratio);
    return true;
  }

  /**
   * Draw a planned frame. `deco` holds what is drawn over it:
   * {layout, view, scene, selected, pathRows, highlightRows, incumbentRows, incumbentY, sense, markRadius}
   */
  draw(list, deco) {
    const ctx = this.ctx;
    const { width: w, height: h } = this;
    ctx.setTransform(this.ratio, 0, 0, this.ratio, 0, 0);
    ctx.fillStyle = BACKGROUND;
    ctx.fillRect(0, 0, w, h);
    this._axis(deco);
    if (deco.layout === 'bound') this._incumbentShade(deco);

    // Edges: one path, one stroke.
    const e = list.edges;
    const edgeCount = list.edgeCount;
    if (edgeCount) {
      ctx.beginPath();
      for (let i = 0, j = 0; i < edgeCount; i++, j += 4) {
        ctx.moveTo(e[j], e[j + 1]);
        ctx.lineTo(e[j + 2], e[j + 3]);
      }
      ctx.lineWidth = edgeCount > 20000 ? 0.5 : 1;
      ctx.strokeStyle = EDGE_COLOUR;
      ctx.stroke();
    }

    // Marks, grouped by status so each colour is set once.
    const groups = this._byStatus;
    for (const g of groups) g.length = 0;
    const bars = [];
    const special = [];
    for (let i = 0; i < list.markCount; i++) {
      const kind = list.markKind[i];
      if (kind === MARK_BAR) bars.push(i);
      else if (kind === MARK_FOLDED || kind === MARK_RARE) special.push(i);
      else groups[list.markStatus[i]].push(i);
    }
    this._bars(list, bars);
    const r = deco.markRadius;
    for (let s = 0; s < STATUS_COUNT; s++) {
      const g = groups[s];
      if (!g.length) continue;
      const style = STATUS_STYLE[s];
      ctx.fillStyle = style.colour;
      if (r < 2.6) {
        const d = Math.max(2, 2 * r);
        for (const i of g) ctx.fillRect(list.markX[i] - d / 2, list.markY[i] - d / 2, d, d);
      } else {
        ctx.beginPath();
        for (const i of g) traceShape(ctx, style.shape, list.markX[i], list.markY[i], r);
        ctx.fill();
        if (r >= 4) {
          ctx.lineWidth = 0.75;
          ctx.strokeStyle = 'rgba(255,255,255,0.85)';
          ctx.stroke();
        }
      }
    }
    this._special(list, special, r);
    if (deco.layout === 'bound') this._incumbentLine(deco);
    this._incumbentNodes(deco, r);
    this._highlight(deco, r);
    this._notes(deco, r);
    this._path(deco);
    this._selection(deco, r);
    this._caption(deco);
  }

  _bars(list, bars) {
    if (!bars.length) return;
    const ctx = this.ctx;
    bars.sort((a, b) => list.markStatus[a] - list.markStatus[b]);
    let current = -1;
    for (const i of bars) {
      const s = list.markStatus[i];
      if (s !== current) {
        ctx.fillStyle = STATUS_STYLE[s].colour;
        current = s;
      }
      const y = list.markY[i];
      const len = Math.max(2, list.markY2[i] - y);
      ctx.fillRect(list.markX[i] - 0.75, y, 1.5, len);
    }
  }

  _special(list, idx, r) {
    if (!idx.length) return;
    const ctx = this.ctx;
    const rr = Math.max(r, 3.5);
    for (const i of idx) {
      const x = list.markX[i];
      const y = list.markY[i];
      const style = STATUS_STYLE[list.markStatus[i]];
      if (list.markKind[i] === MARK_FOLDED) {
        ctx.beginPath();
        ctx.moveTo(x, y - 2);
        ctx.lineTo(x + 8, y + 12);
        ctx.lineTo(x - 8, y + 12);
        ctx.closePath();
        ctx.fillStyle = style.colour;
        ctx.fill();
        ctx.lineWidth = 1.5;
        ctx.strokeStyle = PATH_COLOUR;
        ctx.stroke();
        const size = this._scene?.store.size[list.markRow[i]];
        if (size) {
          ctx.font = FONT;
          ctx.fillStyle = PATH_COLOUR;
          ctx.textAlign = 'center';
          ctx.fillText(`+${formatCount(size - 1)}`, x, y + 24);
        }
      } else {
        ctx.beginPath();
        traceShape(ctx, style.shape, x, y, rr);
        ctx.fillStyle = style.colour;
        ctx.fill();
        ctx.lineWidth = 1;
        ctx.strokeStyle = '#ffffff';
        ctx.stroke();
      }
    }
  }

  _screen(deco, row) {
    const { view, scene } = deco;
    const x = ((scene.store.x[row] - view.x0) * this.width) / (view.x1 - view.x0);
    const y = ((scene.y[row] - view.y0) * this.height) / (view.y1 - view.y0) + scene.shiftOf(row);
    return [x, y];
  }

  _incumbentNodes(deco, r) {
    const rows = deco.incumbentRows;
    if (!rows?.length) return;
    const ctx = this.ctx;
    ctx.lineWidth = 2;
    ctx.strokeStyle = INCUMBENT_COLOUR;
    const last = rows[rows.length - 1];
    for (const row of rows) {
      if (deco.hidden?.(row)) continue;
      const [x, y] = this._screen(deco, row);
      if (x < -20 || x > this.width + 20 || y < -20 || y > this.height + 20) continue;
      ctx.beginPath();
      ctx.arc(x, y, Math.max(r, 3.5) + (row === last ? 5 : 3.5), 0, 2 * Math.PI);
      ctx.stroke();
    }
  }

  /** Rows a finding points at: a dark square outline with a white halo, one path. */
  _highlight(deco, r) {
    const rows = deco.highlightRows;
    if (!rows?.length) return;
    const ctx = this.ctx;
    const s = Math.max(r, 3.5) + 3;
    ctx.beginPath();
    for (const row of rows) {
      if (deco.hidden?.(row)) continue;
      const [x, y] = this._screen(deco, row);
      if (x < -s || x > this.width + s || y < -s || y > this.height + s) continue;
      ctx.rect(x - s, y - s, 2 * s, 2 * s);
    }
    strokeOnHalo(ctx, 4, 2, HIGHLIGHT_COLOUR);
  }

  /** Rows carrying a note: a small tag with a cut corner above the node's right, one path. */
  _notes(deco, r) {
    const rows = deco.noteRows;
    if (!rows?.length) return;
    const ctx = this.ctx;
    const off = Math.max(r, 3.5) + 1;
    const s = 8;
    ctx.beginPath();
    for (const row of rows) {
      if (deco.hidden?.(row)) continue;
      const [x, y] = this._screen(deco, row);
      if (x < -20 || x > this.width + 20 || y < -20 || y > this.height + 20) continue;
      const left = x + off - 1;
      const top = y - off - s + 1;
      ctx.moveTo(left, top);
      ctx.lineTo(left + s - 3, top);
      ctx.lineTo(left + s, top + 3);
      ctx.lineTo(left + s, top + s);
      ctx.lineTo(left, top + s);
      ctx.closePath();
    }
    ctx.lineWidth = 2.5;
    ctx.strokeStyle = '#ffffff';
    ctx.stroke();
    ctx.fillStyle = NOTE_COLOUR;
    ctx.fill();
  }

  _path(deco) {
    const rows = deco.pathRows;
    if (!rows || rows.length < 2) return;
    const ctx = this.ctx;
    ctx.beginPath();
    rows.forEach((row, k) => {
      const [x, y] = this._screen(deco, row);
      if (k === 0) ctx.moveTo(x, y);
      else ctx.lineTo(x, y);
    });
    strokeOnHalo(ctx, 3, 1.75, PATH_COLOUR);
  }

  _selection(deco, r) {
    if (deco.selected === null || deco.selected === undefined || deco.selected < 0) return;
    const [x, y] = this._screen(deco, deco.selected);
    const ctx = this.ctx;
    const rr = Math.max(r, 3.5) + 4;
    ctx.beginPath();
    ctx.arc(x, y, rr, 0, 2 * Math.PI);
    ctx.lineWidth = 4;
    ctx.strokeStyle = '#ffffff';
    ctx.stroke();
    ctx.lineWidth = 2;
    ctx.strokeStyle = PATH_COLOUR;
    ctx.stroke();
  }

  _incumbentY(deco) {
    const v = deco.incumbentY;
    if (!Number.isFinite(v)) return NaN;
    return Math.round(((v - deco.view.y0) * this.height) / (deco.view.y1 - deco.view.y0)) + 0.5;
  }

  /** Everything below the incumbent line is worse than the incumbent: shade it lightly. */
  _incumbentShade(deco) {
    const y = this._incumbentY(deco);
    if (!(y < this.height)) return;
    const top = Math.max(0, y);
    this.ctx.fillStyle = 'rgba(230, 159, 0, 0.07)';
    this.ctx.fillRect(0, top, this.width, this.height - top);
  }

  _incumbentLine(deco) {
    const v = deco.incumbentY;
    const y = this._incumbentY(deco);
    if (!Number.isFinite(y)) return;
    const ctx = this.ctx;
    if (y >= 0 && y <= this.height) {
      ctx.lineWidth = 4;
      ctx.strokeStyle = 'rgba(255,255,255,0.7)';
      ctx.beginPath();
      ctx.moveTo(0, y);
      ctx.lineTo(this.width, y);
      ctx.stroke();
      ctx.setLineDash([6, 4]);
      ctx.lineWidth = 2;
      ctx.strokeStyle = INCUMBENT_COLOUR;
      ctx.beginPath();
      ctx.moveTo(0, y);
      ctx.lineTo(this.width, y);
      ctx.stroke();
      ctx.setLineDash([]);
    }
    const base = `incumbent ${formatValue(deco.sense === 'max' ? -v : v)}`;
    const label = y < 0 ? `${base} \u2191` : y > this.height ? `${base} \u2193` : base;
    ctx.font = FONT;
    const tw = ctx.measureText(label).width;
    const ly = Math.min(this.height - 6, Math.max(30, y - 5));
    ctx.fillStyle = 'rgba(255,255,255,0.9)';
    ctx.fillRect(this.width - tw - 14, ly - 12, tw + 10, 16);
    ctx.textAlign = 'right';
    ctx.fillStyle = '#00704f';
    ctx.fillText(label, this.width - 9, ly);
  }

  _axis(deco) {
    const { view } = deco;
    const ctx = this.ctx;
    const h = this.height;
    const span = view.y1 - view.y0;
    const step = niceStep(span / Math.max(2, Math.floor(h / 60)), deco.layout === 'depth');
    if (!(step > 0)) return;
    ctx.font = FONT;
    ctx.textAlign = 'left';
    ctx.fillStyle = AXIS_TEXT;
    ctx.strokeStyle = 'rgba(0,0,0,0.05)';
    ctx.lineWidth = 1;
    const first = Math.ceil(view.y0 / step) * step;
    ctx.beginPath();
    for (let v = first; v <= view.y1; v += step) {
      const y = Math.round(((v - view.y0) * h) / span) + 0.5;
      ctx.moveTo(0, y);
      ctx.lineTo(this.width, y);
    }
    ctx.stroke();
    for (let v = first; v <= view.y1; v += step) {
      const y = ((v - view.y0) * h) / span;
      const text = deco.layout === 'depth' ? `depth ${Math.round(v)}`
        : formatValue(deco.sense === 'max' ? -v : v, 5);
      const tw = ctx.measureText(text).width;
      ctx.fillStyle = 'rgba(251,251,248,0.85)';
      ctx.fillRect(2, y - 14, tw + 6, 13);
      ctx.fillStyle = AXIS_TEXT;
      ctx.fillText(text, 5, y - 3);
    }
  }

  _caption(deco) {
    const ctx = this.ctx;
    const text = deco.layout === 'depth' ? 'down: depth'
      : `down: node bound, worse further down (${deco.sense === 'max' ? 'maximising' : 'minimising'})`;
    ctx.font = FONT;
    ctx.textAlign = 'left';
    const tw = ctx.measureText(text).width;
    ctx.fillStyle = 'rgba(251,251,248,0.9)';
    ctx.fillRect(2, this.height - 17, tw + 8, 15);
    ctx.fillStyle = AXIS_TEXT;
    ctx.fillText(text, 6, this.height - 6);
  }

  bindScene(scene) {
    this._scene = scene;
  }
}

/** Stroke the current path twice: a wide light halo, then the colour, so it reads on any mark. */
function strokeOnHalo(ctx, haloWidth, width, colour) {
  ctx.lineWidth = haloWidth;
  ctx.strokeStyle = 'rgba(255,255,255,0.9)';
  ctx.stroke();
  ctx.lineWidth = width;
  ctx.strokeStyle = colour;
  ctx.stroke();
}
