// At most one redraw per animation frame: handlers mark parts dirty, and the
// next frame runs the painters of the dirty parts, in registration order.

export class FrameScheduler {
  constructor() {
    this.painters = [];
    this.dirty = new Set();
    this.pending = 0;
    this.frames = 0;
    this._run = this._run.bind(this);
  }

  /** Register `paint` for `part`; painters run in the order they were added. */
  on(part, paint) {
    this.painters.push([part, paint]);
  }

  mark(...parts) {
    for (const p of parts) this.dirty.add(p);
    if (!this.pending) this.pending = requestAnimationFrame(this._run);
  }

  /** Run the dirty painters now (benchmarks and tests). */
  flush() {
    if (this.pending) cancelAnimationFrame(this.pending);
    this._run(performance.now());
  }

  _run(now) {
    this.pending = 0;
    this.frames++;
    const dirty = this.dirty;
    this.dirty = new Set();
    for (const [part, paint] of this.painters) {
      if (!dirty.has(part)) continue;
      try {
        paint(now);
      } catch (err) {
        console.error(`drawing ${part} failed:`, err); // report it, keep the other parts alive
      }
    }
  }
}
