// The tree view: owns the canvas, the current view rectangle, the filters and
// the selection; turns pointer input into view changes. Input handlers only
// record what happened and mark the view dirty; drawing happens once per
// animation frame in `paint`.

import { DrawList, pickMark, planFrame } from './lod.js';
import { Scene } from './scene.js';
import { TreeRenderer } from './treecanvas.js';
import { ALL_STATUSES } from './statuses.js';
import { clampView, centreOn, fitView, panBy, zoomAt } from './view.js';

const DRAG_PX = 4;

export class TreeView {
  /**
   * canvas: the <canvas>; scheduler: FrameScheduler; hooks: {onSelect(row),
   * onView(view), onHover(info|null, x, y), onDrawn(stats)}
   */
  constructor(canvas, scheduler, hooks = {}) {
    this.canvas = canvas;
    this.scheduler = scheduler;
    this.hooks = hooks;
    this.renderer = new TreeRenderer(canvas);
    this.list = new DrawList();
    this.store = null;
    this.scene = null;
    this.layout = 'depth';
    this.view = null;
    this.pendingView = null; // a view from the URL, applied once the tree is known
    this.follow = true; // refit as a live tree grows, until the user moves the view
    this.statusMask = ALL_STATUSES;
    this.depthMin = 0;
    this.depthMax = Infinity;
    this.selected = -1;
    this.pathRows = null;
    this.highlightRows = null; // rows a finding points at (Int32Array), outlined
    this.reveal = null; // the walkthrough: {rank, limit, span, incumbent} (only solved rows drawn)
    this.noteRows = null; // rows carrying a reviewer's note (Int32Array), tagged
    this.hover = null; // {x, y} pointer position over the canvas
    this.lastDraw = { ms: 0, marks: 0, edges: 0, visited: 0 };
    this.drawCount = 0;
    this._drag = null;
    scheduler.on('tree', () => this.paint());
    scheduler.on('hover', () => this._paintHover());
    this._bind();
  }

  setStore(store) {
    this.store = store;
    this.scene = new Scene(store);
    this.renderer.bindScene(this.scene);
    this.selected = -1;
    this.pathRows = null;
    this.highlightRows = null;
    this.reveal = null;
    this.noteRows = null;
    this.view = null;
    this.follow = true;
    this.mark();
  }

  /**
   * The walkthrough's step: draw only rows with 0 <= rank[row] <= limit; `span` is
   * each subtree's last step (walkplan.subtreeLastStep), `incumbent` the incumbent
   * after the step (model sense, null for none). null shows the whole tree again.
   */
  setReveal(reveal) {
    this.reveal = reveal;
    this.mark();
  }

  /** Tag these rows as carrying a note; null clears. */
  setNoteRows(rows) {
    this.noteRows = rows && rows.length ? rows : null;
    this.mark();
  }

  _revealed(row) {
    const rv = this.reveal;
    return !rv || (rv.rank[row] >= 0 && rv.rank[row] <= rv.limit);
  }

  /** Outline these rows (a finding's nodes); null clears. */
  setHighlight(rows) {
    this.highlightRows = rows && rows.length ? rows : null;
    this.mark();
  }

  /** The tree grew (live): keep it fitted unless the user has moved the view. */
  grew() {
    if (this.follow) this.view = null;
    this.mark();
  }

  mark() {
    this.scheduler.mark('tree');
  }

  // ------------------------------------------------------------ view moves
  setLayout(layout) {
    if (layout === this.layout) return;
    this.layout = layout;
    this.view = null; // a new vertical axis: fit again
    this.mark();
  }

  fit() {
    if (!this.scene) return;
    this.scene.update(this.layout);
    const [x0, x1] = this.scene.xRange;
    let [y0, y1] = this.scene.yRange;
    if (this.layout === 'bound') {
      const inc = this.incumbentY();
      if (Number.isFinite(inc)) { y0 = Math.min(y0, inc); y1 = Math.max(y1, inc); }
    }
    if (this.layout === 'depth' && Number.isFinite(this.depthMax)) y1 = Math.min(y1, this.depthMax);
    this._setView(fitView(x0, x1, y0, y1, this.renderer.width || 800, this.renderer.height || 400,
      26, 60), { user: false });
    this.follow = true;
  }

  zoom(fx, fy, px = null, py = null) {
    if (!this.view) return;
    const w = this.renderer.width;
    const h = this.renderer.height;
    this._setView(zoomAt(this.view, fx, fy, px ?? w / 2, py ?? h / 2, w, h));
  }

  pan(dx, dy) {
    if (!this.view) return;
    this._setView(panBy(this.view, dx, dy, this.renderer.width, this.renderer.height));
  }

  centreOnRow(row) {
    if (!this.view || row < 0) return;
    this._setView(centreOn(this.view, this.store.x[row], this.scene.y[row]));
  }

  zoomToSubtree(row) {
    if (!this.scene || row < 0) return;
    this.scene.update(this.layout);
    const s = this.store;
    this._setView(fitView(s.xMin[row], s.xMax[row], this.scene.yLo[row], this.scene.yHi[row],
      this.renderer.width, this.renderer.height, 40));
  }

  _setView(v, { user = true } = {}) {
    if (!this.scene) return;
    if (user) this.follow = false;
    const [x0, x1] = this.scene.xRange;
    const [y0, y1] = this.scene.yRange;
    this.view = clampView(v, {
      minX: 0.2, maxX: Math.max(4, (x1 - x0) * 4), minY: Math.max(1e-9, (y1 - y0) * 1e-6),
      maxY: Math.max(4, (y1 - y0) * 6),
    });
    this.hooks.onView?.(this.view);
    this.mark();
  }

  // ------------------------------------------------------------ filters, folds, selection
  setStatusMask(mask) {
    this.statusMask = mask;
    this.mark();
  }

  setDepthRange(lo, hi) {
    this.depthMin = Number.isFinite(lo) ? lo : 0;
    this.depthMax = Number.isFinite(hi) ? hi : Infinity;
    this.mark();
  }

  toggleFold(row) {
    this.scene?.toggleFold(row);
    this.mark();
  }

  unfoldAll() {
    this.scene?.unfoldAll();
    this.mark();
  }

  select(row, { centre = false } = {}) {
    this.selected = row;
    this.pathRows = row >= 0 ? this.store.pathTo(row) : null;
    if (centre && row >= 0 && this.view) {
      const sx = this._sx(row);
      const sy = this._sy(row);
      if (sx < 20 || sx > this.renderer.width - 20 || sy < 20 || sy > this.renderer.height - 20) {
        this.centreOnRow(row);
      }
    }
    this.mark();
  }

  incumbentY() {
    const v = this.reveal ? (this.reveal.incumbent ?? NaN) : this.store?.incumbentValue;
    if (!Number.isFinite(v)) return NaN;
    return this.store.sense === 'max' ? -v : v;
  }

  _sx(row) {
    return ((this.store.x[row] - this.view.x0) * this.renderer.width) / (this.view.x1 - this.view.x0);
  }

  _sy(row) {
    return ((this.scene.y[row] - this.view.y0) * this.renderer.height) / (this.view.y1 - this.view.y0) +
      this.scene.shiftOf(row);
  }

  // ------------------------------------------------------------ drawing
  paint() {
    if (!this.scene) return;
    const t0 = performance.now();
    this.paintStarted = t0;
    this.scene.update(this.layout);
    const t1 = performance.now();
    this.renderer.resize();
    if (this.scene.n === 0) {
      this.renderer.draw(this.list, this._deco(0));
      return;
    }
    if (!this.view) {
      if (this.pendingView) {
        const v = this.pendingView;
        this.pendingView = null;
        this._setView(v);
      } else this.fit();
    }
    const view = { ...this.view, width: this.renderer.width, height: this.renderer.height };
    const fs = this.scene.frameScene();
    planFrame(fs, view, {
      statusMask: this.statusMask, depthMin: this.depthMin, depthMax: this.depthMax, lodPx: 1,
      clipY: this.layout === 'depth' && Number.isFinite(this.depthMax) ? this.depthMax : undefined,
      reveal: this.reveal ?? undefined,
    }, this.list);
    const kx = view.width / (view.x1 - view.x0);
    const ky = this.layout === 'depth' ? view.height / (view.y1 - view.y0) : Infinity;
    const radius = Math.max(1.2, Math.min(6.5, kx * 0.36, ky * 0.3));
    this.renderer.draw(this.list, this._deco(radius));
    const ms = performance.now() - t0;
    this.drawCount++;
    this.lastDraw = { ms, sceneMs: t1 - t0, marks: this.list.markCount, edges: this.list.edgeCount,
      visited: this.list.visited, nodes: this.scene.n };
    this.hooks.onDrawn?.(this.lastDraw);
    if (this.hover) this._paintHover();
  }

  _deco(radius) {
    const shown = (rows) => (rows && this.reveal ? rows.filter((r) => this._revealed(r)) : rows);
    return {
      layout: this.layout, view: this.view ?? { x0: 0, x1: 1, y0: 0, y1: 1 }, scene: this.scene,
      selected: this.selected, pathRows: this.pathRows, highlightRows: shown(this.highlightRows),
      noteRows: shown(this.noteRows),
      incumbentRows: shown(this.store?.incumbentRows ?? []), incumbentY: this.incumbentY(),
      sense: this.store?.sense, markRadius: radius,
      hidden: (row) => this.scene.isHiddenByFold(row),
    };
  }

  /** What is under pixel (x, y): {row, kind, status} or null. */
  pick(x, y) {
    const i = pickMark(this.list, x, y, 9);
    if (i < 0) return null;
    return { row: this.list.markRow[i], kind: this.list.markKind[i], status: this.list.markStatus[i],
      x: this.list.markX[i], y: this.list.markY[i] };
  }

  _paintHover() {
    if (!this.hover || this._drag?.moved) {
      this.hooks.onHover?.(null);
      return;
    }
    this.hooks.onHover?.(this.pick(this.hover.x, this.hover.y), this.hover.x, this.hover.y);
  }

  // ------------------------------------------------------------ input
  _bind() {
    const c = this.canvas;
    const local = (e) => {
      const r = c.getBoundingClientRect();
      return [e.clientX - r.left, e.clientY - r.top];
    };
    c.addEventListener('pointerdown', (e) => {
      if (e.button !== 0) return;
      const [x, y] = local(e);
      this._drag = { x, y, lastX: x, lastY: y, moved: false, id: e.pointerId };
      c.setPointerCapture(e.pointerId);
    });
    c.addEventListener('pointermove', (e) => {
      const [x, y] = local(e);
      const d = this._drag;
      if (d) {
        if (!d.moved && Math.hypot(x - d.x, y - d.y) > DRAG_PX) {
          d.moved = true;
          c.classList.add('dragging');
        }
        if (d.moved) {
          this.pan(x - d.lastX, y - d.lastY);
          d.lastX = x;
          d.lastY = y;
        }
      }
      this.hover = { x, y };
      this.scheduler.mark('hover');
    });
    const end = (e) => {
      const d = this._drag;
      this._drag = null;
      c.classList.remove('dragging');
      if (c.hasPointerCapture?.(e.pointerId)) c.releasePointerCapture(e.pointerId);
      if (d && !d.moved && e.type === 'pointerup') {
        const [x, y] = local(e);
        const hit = this.pick(x, y);
        this.hooks.onSelect?.(hit ? hit.row : -1, hit);
      }
    };
    c.addEventListener('pointerup', end);
    c.addEventListener('pointercancel', end);
    c.addEventListener('pointerleave', () => {
      this.hover = null;
      this.scheduler.mark('hover');
    });
    c.addEventListener('dblclick', (e) => {
      const [x, y] = local(e);
      const hit = this.pick(x, y);
      if (hit) this.zoomToSubtree(hit.row);
      else this.zoom(2, 1, x, y);
    });
    c.addEventListener('wheel', (e) => {
      e.preventDefault();
      const [x, y] = local(e);
      const delta = e.deltaY || e.deltaX;
      const scale = e.deltaMode === 1 ? 0.05 : 0.0025;
      const f = Math.exp(-delta * scale);
      if (e.shiftKey) this.zoom(1, f, x, y);
      else if (e.ctrlKey || e.altKey) this.zoom(f, f, x, y);
      else this.zoom(f, 1, x, y);
    }, { passive: false });
    new ResizeObserver(() => this.mark()).observe(c);
  }
}

