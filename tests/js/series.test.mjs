import { test } from 'node:test';
import assert from 'node:assert/strict';
import { BoundSeries, Curve, lowerBound, reduceRange, relativeGap } from '../../web/js/series.js';

test('a curve grows by doubling and keeps its points', () => {
  const c = new Curve(2);
  for (let i = 0; i < 1000; i++) c.push(i, i * i);
  assert.equal(c.n, 1000);
  assert.ok(c.x.length >= 1000 && c.x.length <= 2048);
  assert.equal(c.y[999], 999 * 999);
  assert.equal(c.last, 999 * 999);
});

test('reduction keeps every extreme and a few points per bucket', () => {
  const n = 1_000_000;
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) { x[i] = i; y[i] = Math.sin(i / 5000) * 100; }
  y[123457] = 1e6; // a spike that must survive
  y[876543] = -1e6;
  const c = Curve.wrap(x, y);
  const r = reduceRange(c, 0, n - 1, 500);
  assert.ok(r.x.length <= 4 * 500 + 4, `${r.x.length} points`);
  assert.ok(r.y.includes(1e6) && r.y.includes(-1e6));
  for (let i = 1; i < r.x.length; i++) assert.ok(r.x[i] >= r.x[i - 1], 'x stays in order');
  assert.equal(r.x[0], 0);
  assert.equal(r.x[r.x.length - 1], n - 1);
});

test('reduction over a visible range includes the neighbours just outside it', () => {
  const c = Curve.from([0, 10, 20, 30, 40], [5, 4, 3, 2, 1]);
  const r = reduceRange(c, 12, 28, 100);
  assert.deepEqual(r.x, [10, 20, 30]);
  assert.deepEqual(r.y, [4, 3, 2]);
  const nan = Curve.from([0, 1, 2], [1, NaN, 3]);
  assert.deepEqual(reduceRange(nan, 0, 2, 10).y, [1, 3]);
  assert.equal(lowerBound(c.x, c.n, 25), 3);
});

test('gap follows the contract', () => {
  assert.equal(relativeGap(2030, 716.68).toFixed(4), '0.6470');
  assert.ok(Number.isNaN(relativeGap(NaN, 1)));
  assert.equal(relativeGap(0, 0), 0);
});

test('live events fill both axes; the server answer fills one', () => {
  const s = new BoundSeries();
  s.appendEvents([
    { kind: 'progress', time: 0.1, nodes: 1, dual_bound: 10, primal_bound: null, gap: null },
    { kind: 'incumbent', time: 0.2, order: 3, node: 7, objective: 20 },
    { kind: 'progress', time: 0.3, nodes: 5, dual_bound: 12, primal_bound: 20, gap: 0.4 },
  ]);
  assert.deepEqual(Array.from(s.axes.nodes.dual.x.subarray(0, 2)), [1, 5]);
  assert.deepEqual(Array.from(s.axes.time.primal.y.subarray(0, s.axes.time.primal.n)), [20, 20]);
  assert.equal(s.incumbents[0].nodes, 4);
  s.setFromServer('nodes', { primal: { x: [4, 9], y: [20, 20] }, dual: { x: [1], y: [10] },
    gap: { x: [4], y: [0.5] }, incumbents: [{ order: 3, time: 0.2, objective: 20, node: 7 }] });
  assert.equal(s.axes.nodes.primal.n, 2);
  assert.ok(s.axes.nodes.loaded);
});
