import { test } from 'node:test';
import assert from 'node:assert/strict';
import { DrawList, dominantStatus, MARK_BAR, MARK_FOLDED, MARK_NODE, MARK_RARE, pickMark,
  planFrame, rareRowsOf } from '../../web/js/lod.js';
import { Scene } from '../../web/js/scene.js';
import { ALL_STATUSES, STATUS_CODE } from '../../web/js/statuses.js';
import { AGG_STRIDE } from '../../web/js/tidy.js';
import { fitView } from '../../web/js/view.js';
import { fullTree, storeOf } from './helpers.mjs';

function frame(store, box, opts = {}, layout = 'depth') {
  const view = { width: 1600, height: 400, ...box };
  const scene = new Scene(store);
  scene.update(layout);
  const out = new DrawList();
  planFrame(scene.frameScene(), view, { statusMask: ALL_STATUSES, lodPx: 1, ...opts }, out);
  return { scene, out };
}

const kinds = (out) => Array.from(out.markKind.subarray(0, out.markCount));

test('a wide view draws every node and every edge', () => {
  const s = fullTree(4); // 31 nodes, 16 leaves
  const { out } = frame(s, fitView(0, 15, 0, 4, 1600, 400));
  assert.equal(out.markCount, 31);
  assert.equal(out.edgeCount, 30);
  assert.ok(kinds(out).every((k) => k === MARK_NODE));
});

test('subtrees narrower than a pixel become one bar each', () => {
  const s = fullTree(12); // 8191 nodes, 4096 leaves
  const { out } = frame(s, { ...fitView(0, 4095, 0, 12, 200, 300), width: 200, height: 300 });
  assert.ok(out.markCount < 600, `drew ${out.markCount} marks`);
  assert.ok(kinds(out).some((k) => k === MARK_BAR));
  assert.ok(out.visited < 1000, `visited ${out.visited} rows`);
  // bars take the dominant closing status, not "branched"
  const bars = [];
  for (let i = 0; i < out.markCount; i++) if (out.markKind[i] === MARK_BAR) bars.push(out.markStatus[i]);
  assert.ok(bars.every((st) => st === STATUS_CODE.pruned));
});

test('subtrees outside the view are skipped', () => {
  const s = fullTree(10);
  const full = fitView(0, 1023, 0, 10, 2000, 300);
  const right = { ...full, x0: 900, x1: 1023 };
  const all = frame(s, { ...full, width: 2000, height: 300 });
  const part = frame(s, { ...right, width: 2000, height: 300 });
  assert.ok(part.out.visited < all.out.visited / 3);
  for (let i = 0; i < part.out.markCount; i++) {
    assert.ok(part.out.markX[i] > -10 && part.out.markX[i] < 2010);
  }
});

test('rare rows stay visible inside bars, filtered statuses disappear', () => {
  const rows = [[0, null, null, 'branched', 0]];
  for (let id = 1; id < 4001; id++) {
    const parent = Math.floor((id - 1) / 2);
    rows.push([id, parent, id % 2 ? 'down' : 'up', id === 3999 ? 'failed' : 'branched', 1]);
  }
  const s = storeOf(rows.map((r, i) => (i >= 2000 && r[3] !== 'failed' ? [...r.slice(0, 3), 'pruned', 1] : r)));
  s.setIncumbents([{ node: 3000, objective: 5 }]);
  const scene = new Scene(s);
  scene.update('depth');
  const view = fitView(scene.xRange[0], scene.xRange[1], 0, 12, 100, 200);
  const out = new DrawList();
  planFrame(scene.frameScene(), { ...view, width: 100, height: 200 },
    { statusMask: ALL_STATUSES, lodPx: 1 }, out);
  const rare = [];
  for (let i = 0; i < out.markCount; i++) if (out.markKind[i] === MARK_RARE) rare.push(out.markRow[i]);
  assert.ok(rare.includes(s.rowOf(3999)), 'failed node kept');
  assert.ok(rare.includes(s.rowOf(3000)), 'incumbent node kept');
  const noFailed = new DrawList();
  planFrame(scene.frameScene(), { ...view, width: 100, height: 200 },
    { statusMask: ALL_STATUSES & ~(1 << STATUS_CODE.failed), lodPx: 1 }, noFailed);
  for (let i = 0; i < noFailed.markCount; i++) assert.notEqual(noFailed.markStatus[i], STATUS_CODE.failed);
});

test('dominant status honours the filter; folded subtrees draw one mark', () => {
  const counts = new Uint32Array(AGG_STRIDE);
  counts[0] = 10; counts[2] = 5; counts[3] = 7;
  assert.equal(dominantStatus(counts, 0, ALL_STATUSES), 3);
  assert.equal(dominantStatus(counts, 0, 1 | (1 << 2)), 2);
  assert.equal(dominantStatus(counts, 0, 1), 0);
  assert.equal(dominantStatus(counts, 0, 1 << 5), -1);

  const s = fullTree(4);
  const scene = new Scene(s);
  scene.update('depth');
  scene.toggleFold(s.rowOf(1));
  const out = new DrawList();
  planFrame(scene.frameScene(), { ...fitView(0, 15, 0, 4, 1600, 400), width: 1600, height: 400 },
    { statusMask: ALL_STATUSES, lodPx: 1 }, out);
  assert.equal(kinds(out).filter((k) => k === MARK_FOLDED).length, 1);
  assert.equal(out.markCount, 1 + 1 + 15); // root, the folded mark, the other half
  assert.ok(scene.isHiddenByFold(s.rowOf(3)));
});

test('depth filter stops the walk; picking finds the nearest mark', () => {
  const s = fullTree(5);
  const view = { ...fitView(0, 31, 0, 5, 1600, 400), width: 1600, height: 400 };
  const { out } = frame(s, view, { depthMax: 2 });
  assert.equal(out.markCount, 7);
  const i = pickMark(out, out.markX[3] + 2, out.markY[3] - 1, 8);
  assert.equal(i, 3);
  assert.equal(pickMark(out, -100, -100, 8), -1);
});

test('rare rows: incumbents first, statuses under the share', () => {
  const status = new Uint8Array(1000).fill(2);
  status[10] = 6;
  const rare = rareRowsOf(status, 1000, [5]);
  assert.deepEqual(Array.from(rare), [5, 10]);
});
