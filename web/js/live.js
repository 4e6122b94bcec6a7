// Live mode: the run's Server-Sent Events stream. Handlers only queue the
// events and ask for a frame; the inspector drains the queue when it draws.
// The browser resumes a dropped connection itself with Last-Event-ID; after a
// `resync` (this viewer fell behind) we reconnect at once from the last id.

import { api } from './api.js';

export class LiveFeed {
  /** hooks: {onEvents(), onEnd(info), onState(state)}; state: connecting|open|retrying|ended */
  constructor(runId, hooks) {
    this.runId = runId;
    this.hooks = hooks;
    this.queue = [];
    this.lastId = -1;
    this.source = null;
    this.ended = false;
    this.batches = 0;
    this.reconnects = 0;
    this._retry = 0;
  }

  start(lastId = -1) {
    this.startId = lastId; // -1: from the first event; else after a tree snapshot
    this.lastId = lastId;
    this._open();
  }

  _open() {
    this._close();
    if (this.ended) return;
    const url = `${api.streamUrl(this.runId)}${this.lastId >= 0 ? `?last_id=${this.lastId}` : ''}`;
    const es = new EventSource(url);
    this.source = es;
    this.hooks.onState?.('connecting');
    es.addEventListener('open', () => {
      this._retry = 0;
      this.hooks.onState?.('open');
    });
    es.addEventListener('batch', (e) => {
      const events = JSON.parse(e.data);
      for (const ev of events) this.queue.push(ev);
      if (e.lastEventId) this.lastId = Number(e.lastEventId);
      this.batches++;
      this.hooks.onEvents?.();
    });
    es.addEventListener('end', (e) => {
      this.ended = true;
      this._close();
      let info = {};
      try { info = JSON.parse(e.data); } catch { /* keep {} */ }
      this.hooks.onState?.('ended');
      this.hooks.onEnd?.(info);
    });
    es.addEventListener('resync', (e) => {
      // The server closes the stream; catch up from the file after the id it names.
      try {
        const k = JSON.parse(e.data).last_id;
        if (Number.isInteger(k)) this.lastId = k;
      } catch { /* keep our own last id */ }
      this.reconnects++;
      this._open();
    });
    es.addEventListener('error', () => {
      if (this.ended) return;
      if (es.readyState === EventSource.CLOSED) {
        // The browser gave up (an HTTP error): try again ourselves, a little later each time.
        this._retry = Math.min(this._retry + 1, 6);
        this.reconnects++;
        this.hooks.onState?.('retrying');
        this._timer = setTimeout(() => this._open(), 500 * 2 ** this._retry);
      } else {
        this.hooks.onState?.('retrying'); // the browser reconnects with Last-Event-ID
      }
    });
  }

  /** Take every queued event (the caller applies them). */
  drain() {
    const q = this.queue;
    this.queue = [];
    return q;
  }

  _close() {
    clearTimeout(this._timer);
    if (this.source) {
      this.source.close();
      this.source = null;
    }
  }

  stop() {
    this.ended = true;
    this._close();
  }
}
