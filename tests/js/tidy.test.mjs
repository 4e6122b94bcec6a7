import { test } from 'node:test';
import assert from 'node:assert/strict';
import {
  AGG_STRIDE, boundPositions, buildChildren, FLAG_INCUMBENT, parentsFirst, preorder,
  subtreeCounts, subtreeMax, subtreeRange, tidyLayout,
} from '../../web/js/tidy.js';
import { STATUS_CODE } from '../../web/js/statuses.js';
import { fullTree, storeOf } from './helpers.mjs';

// The same small tree as the server's layout tests use in spirit: a root whose
// down child branches again (leaves at x = 0, 1) and whose up child is a leaf (x = 2).
const small = () => storeOf([
  [0, null, null, 'branched', 1],
  [1, 0, 'up', 'pruned', 3], // written first but drawn right: down before up
  [2, 0, 'down', 'branched', 2],
  [3, 2, 'down', 'integral', 2.5],
  [4, 2, 'up', 'infeasible', null],
]);

test('children are ordered down before up, then by row', () => {
  const s = small();
  const ch = buildChildren(s.parent, s.dir, s.n);
  assert.deepEqual(Array.from(ch.roots), [0]);
  assert.deepEqual(Array.from(ch.list.subarray(ch.start[0], ch.start[1])), [2, 1]);
  assert.deepEqual(Array.from(preorder(ch, s.n)), [0, 2, 3, 4, 1]);
  const unsorted = buildChildren(s.parent, s.dir, s.n, { sort: false });
  assert.deepEqual(Array.from(unsorted.list.subarray(unsorted.start[0], unsorted.start[1])), [1, 2]);
});

test('tidy layout: leaves one apart, parents centred, extents and sizes', () => {
  const s = small();
  const lay = tidyLayout(s.parent, s.dir, s.n);
  // by hand: leaves 3 -> 0, 4 -> 1, 1 -> 2; node 2 at 0.5; root between 0.5 and 2
  assert.deepEqual(Array.from(lay.x), [1.25, 2, 0.5, 0, 1]);
  assert.deepEqual(Array.from(lay.xMin), [0, 2, 0, 0, 1]);
  assert.deepEqual(Array.from(lay.xMax), [2, 2, 1, 0, 1]);
  assert.deepEqual(Array.from(lay.size), [5, 1, 3, 1, 1]);
  assert.equal(lay.leaves, 3);
});

test('tidy layout of a full binary tree is symmetric', () => {
  const s = fullTree(6);
  const lay = tidyLayout(s.parent, s.dir, s.n);
  assert.equal(lay.leaves, 64);
  assert.equal(lay.x[0], 31.5);
  assert.equal(lay.size[0], 127);
  for (let r = 0; r < s.n; r++) {
    assert.ok(lay.xMin[r] <= lay.x[r] && lay.x[r] <= lay.xMax[r]);
  }
});

test('forests lay their roots side by side', () => {
  const s = storeOf([[0, null, null, 'integral', 1], [5, null, null, 'branched', 1],
    [6, 5, 'down', 'pruned', 2], [7, 5, 'up', 'pruned', 2]]);
  const lay = tidyLayout(s.parent, s.dir, s.n);
  assert.deepEqual(Array.from(lay.x), [0, 1.5, 1, 2]);
});

test('subtree counts and flags add up from the leaves', () => {
  const s = small();
  const counts = subtreeCounts(s.parent, s.status, s.n, { incumbentRows: [3] });
  const at = (r, name) => counts[r * AGG_STRIDE + STATUS_CODE[name]];
  assert.equal(at(0, 'branched'), 2);
  assert.equal(at(0, 'pruned'), 1);
  assert.equal(at(0, 'integral'), 1);
  assert.equal(at(0, 'infeasible'), 1);
  assert.equal(at(1, 'pruned'), 1);
  assert.equal(counts[0 * AGG_STRIDE + 7] & FLAG_INCUMBENT, FLAG_INCUMBENT);
  assert.equal(counts[1 * AGG_STRIDE + 7] & FLAG_INCUMBENT, 0);
  // the same with an explicit parents-first order
  const ch = buildChildren(s.parent, s.dir, s.n);
  const again = subtreeCounts(s.parent, s.status, s.n, { topDown: preorder(ch, s.n) });
  assert.equal(again[0 * AGG_STRIDE + STATUS_CODE.branched], 2);
  assert.ok(parentsFirst(s.parent, s.n));
});

test('bound positions: worse goes down, unknown bounds inherit the parent', () => {
  const s = small();
  const y = boundPositions(s.parent, s.bound, s.n, 'min');
  assert.deepEqual(Array.from(y), [1, 3, 2, 2.5, 2]);
  const ymax = boundPositions(s.parent, s.bound, s.n, 'max');
  assert.deepEqual(Array.from(ymax), [-1, -3, -2, -2.5, -2]);
  const range = subtreeRange(s.parent, y, s.n);
  assert.equal(range.yLo[0], 1);
  assert.equal(range.yHi[0], 3);
  assert.equal(range.yHi[2], 2.5);
});

test('deepest depth below each node', () => {
  const s = small();
  assert.deepEqual(Array.from(subtreeMax(s.parent, s.depth, s.n).subarray(0, s.n)), [2, 1, 2, 2, 2]);
});
