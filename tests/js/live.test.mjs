import { test } from 'node:test';
import assert from 'node:assert/strict';
import { LiveFeed } from '../../web/js/live.js';
import { FrameScheduler } from '../../web/js/frame.js';

// A stand-in for the browser's EventSource: records URLs, lets a test fire events.
class FakeSource {
  static opened = [];
  static CLOSED = 2;
  constructor(url) {
    this.url = url;
    this.readyState = 0;
    this.listeners = {};
    FakeSource.opened.push(this);
  }
  addEventListener(name, fn) { (this.listeners[name] ??= []).push(fn); }
  fire(name, data, lastEventId = '') {
    for (const fn of this.listeners[name] ?? []) fn({ data: JSON.stringify(data), lastEventId });
  }
  close() { this.readyState = 2; this.closed = true; }
}

test('batches are queued, a resync reconnects after the last id, end closes', () => {
  globalThis.EventSource = FakeSource;
  FakeSource.opened = [];
  let woken = 0;
  let ended = null;
  const feed = new LiveFeed('run-1', { onEvents: () => woken++, onEnd: (info) => { ended = info; } });
  feed.start(-1);
  const first = FakeSource.opened[0];
  assert.equal(first.url, '/api/runs/run-1/stream');
  first.fire('batch', [{ kind: 'node', id: 0 }, { kind: 'node', id: 1 }], '1');
  first.fire('batch', [{ kind: 'progress', nodes: 2 }], '2');
  assert.equal(woken, 2);
  assert.equal(feed.drain().length, 3);
  assert.equal(feed.queue.length, 0);
  first.fire('resync', { last_id: 2 });
  assert.ok(first.closed);
  const second = FakeSource.opened[1];
  assert.equal(second.url, '/api/runs/run-1/stream?last_id=2');
  second.fire('batch', [{ kind: 'end', status: 'optimal' }], '3');
  second.fire('end', { status: 'optimal', last_id: 3 });
  assert.deepEqual(ended, { status: 'optimal', last_id: 3 });
  assert.ok(second.closed && feed.ended);
  assert.equal(feed.lastId, 3);
  assert.equal(FakeSource.opened.length, 2);
});

test('a tree snapshot resumes the stream after the events it covers', () => {
  globalThis.EventSource = FakeSource;
  FakeSource.opened = [];
  const feed = new LiveFeed('big run', {});
  feed.start(41);
  assert.equal(FakeSource.opened[0].url, '/api/runs/big%20run/stream?last_id=41');
  feed.stop();
});

test('many marks, one frame; painters run in order, only when dirty', () => {
  const frames = [];
  globalThis.requestAnimationFrame = (fn) => { frames.push(fn); return frames.length; };
  globalThis.cancelAnimationFrame = () => {};
  const s = new FrameScheduler();
  const ran = [];
  s.on('live', () => ran.push('live'));
  s.on('tree', () => ran.push('tree'));
  s.on('bounds', () => ran.push('bounds'));
  for (let i = 0; i < 100; i++) s.mark('tree');
  s.mark('live');
  assert.equal(frames.length, 1);
  frames[0](0);
  assert.deepEqual(ran, ['live', 'tree']);
  s.mark('bounds');
  assert.equal(frames.length, 2);
  frames[1](16);
  assert.deepEqual(ran, ['live', 'tree', 'bounds']);
});
