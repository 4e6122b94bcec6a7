import { test } from 'node:test';
import assert from 'node:assert/strict';
import { formatHash, parseHash } from '../../web/js/hashstate.js';
import { actionFor } from '../../web/js/keys.js';
import { DrawList, planFrame } from '../../web/js/lod.js';
import { Scene } from '../../web/js/scene.js';
import {
  clampSpeed, clampStep, counterText, findFlagged, nextAfter, notesByStep, playedTo, prevBefore,
  solvedRanks, StepPages, stepOfOrder, stepToX, subtreeLastStep, visibleCount, visibleMask, xToStep,
} from '../../web/js/walkplan.js';
import { storeOf } from './helpers.mjs';

test('steps are the solved rows in processing order; unsolved rows have no step', () => {
  // rows 0..5 with orders (by hand): row 3 never solved, rows 1 and 4 solved late
  const order = Int32Array.from([0, 4, 1, -1, 3, 2]);
  const { rank, rows } = solvedRanks(order, 6);
  assert.deepEqual(Array.from(rows), [0, 2, 5, 4, 1]);
  assert.deepEqual(Array.from(rank), [0, 4, 1, -1, 3, 2]);
  // a log with gaps in its orders is renumbered 0, 1, 2, ... like the server does
  const gappy = solvedRanks(Int32Array.from([10, 30, -1, 20]), 4);
  assert.deepEqual(Array.from(gappy.rows), [0, 3, 1]);
  assert.deepEqual(Array.from(gappy.rank), [0, 2, -1, 1]);
  // huge orders take the sorting path and agree
  const big = solvedRanks(Int32Array.from([5e8, 7, 3e8, -1]), 4);
  assert.deepEqual(Array.from(big.rows), [1, 2, 0]);
  assert.equal(stepOfOrder(Int32Array.from([10, 30, -1, 20]), gappy.rows, 20), 1);
  assert.equal(stepOfOrder(Int32Array.from([10, 30, -1, 20]), gappy.rows, 25), -1);
});

test('the visible mask at step k holds exactly the rows solved by then', () => {
  const order = Int32Array.from([0, 4, 1, -1, 3, 2]);
  const { rank } = solvedRanks(order, 6);
  const at2 = visibleMask(rank, 6, 2);
  assert.deepEqual(Array.from(at2.mask), [1, 0, 1, 0, 0, 1]);
  assert.equal(at2.count, 3);
  assert.equal(visibleCount(rank, 6, 0), 1);
  assert.equal(visibleCount(rank, 6, 4), 5); // the last step: every solved row, not the unsolved one
  assert.equal(visibleCount(rank, 6, 99), 5);
});

test('a subtree is wholly revealed at the last step of its nodes, never with an unsolved node', () => {
  //      0
  //    1   2        orders: 0:0, 1:1, 2:2, 3:3, 4:-1 (unsolved), 5:4
  //   3 4   5
  const parent = Int32Array.from([-1, 0, 0, 1, 1, 2]);
  const order = Int32Array.from([0, 1, 2, 3, -1, 4]);
  const { rank } = solvedRanks(order, 6);
  const span = subtreeLastStep(parent, rank, 6);
  assert.equal(span[2], 4); // node 2 and node 5
  assert.equal(span[3], 3);
  assert.ok(span[1] > 1e9); // holds the unsolved node 4
  assert.ok(span[0] > 1e9);
});

test('planFrame with a reveal draws only the rows solved by the step', () => {
  // a root, two children, four grandchildren; processing order = row order (helpers.storeOf)
  const store = storeOf([
    [0, null, null, 'branched', 1], [1, 0, 'down', 'branched', 2], [2, 0, 'up', 'branched', 3],
    [3, 1, 'down', 'pruned', 4], [4, 1, 'up', 'pruned', 4], [5, 2, 'down', 'pruned', 5],
    [6, 2, 'up', 'integral', 5],
  ]);
  const scene = new Scene(store);
  scene.update('depth');
  const { rank } = solvedRanks(store.order, store.n);
  const span = subtreeLastStep(store.parent, rank, store.n);
  const view = { x0: -1, x1: 5, y0: -1, y1: 3, width: 600, height: 400 };
  const drawn = (limit) => {
    const list = planFrame(scene.frameScene(), view, { statusMask: 0x7f, lodPx: 1,
      reveal: { rank, limit, span } }, new DrawList());
    // rare statuses are drawn twice (again on top), so count each row once
    const rows = [...new Set(list.markRow.subarray(0, list.markCount))].sort((a, b) => a - b);
    return { rows, edges: list.edgeCount };
  };
  assert.deepEqual(drawn(0), { rows: [0], edges: 0 });
  assert.deepEqual(drawn(2), { rows: [0, 1, 2], edges: 2 });
  assert.deepEqual(drawn(4), { rows: [0, 1, 2, 3, 4], edges: 4 });
  assert.deepEqual(drawn(6).rows, [0, 1, 2, 3, 4, 5, 6]);
  // zoomed far out a wholly revealed subtree may become one bar, a half-revealed one may not
  const far = { x0: -1e4, x1: 1e4, y0: -1, y1: 3, width: 600, height: 400 };
  const bars = (limit) => {
    const list = planFrame(scene.frameScene(), far, { statusMask: 0x7f, lodPx: 1,
      reveal: { rank, limit, span } }, new DrawList());
    return Array.from(list.markKind.subarray(0, list.markCount));
  };
  assert.equal(bars(6)[0], 1); // the whole tree: one bar (rare statuses are marked on top of it)
  assert.ok(!bars(3).includes(1)); // step 3: nodes 4..6 still hidden, so no bar
});

test('next and previous jumps in an ascending list of steps', () => {
  const list = [3, 10, 10, 42];
  assert.equal(nextAfter(list, -1), 3);
  assert.equal(nextAfter(list, 3), 10);
  assert.equal(nextAfter(list, 10), 42);
  assert.equal(nextAfter(list, 42), -1);
  assert.equal(prevBefore(list, 42), 10);
  assert.equal(prevBefore(list, 10), 3);
  assert.equal(prevBefore(list, 3), -1);
  assert.equal(nextAfter([], 0), -1);
});

/** A fake steps API over `total` steps; flag(k) says which steps are pruned. */
function fakeSteps(total, flag) {
  const calls = [];
  const fetchPage = async (start, count) => {
    calls.push([start, count]);
    const steps = [];
    for (let k = start; k < Math.min(total, start + count); k++) steps.push({ step: k, node: k, prune: flag(k) });
    return { total, start, steps, incumbent_steps: [7, 250], finding_steps: [0], note_steps: [], sense: 'min',
      end_status: 'optimal' };
  };
  return { fetchPage, calls };
}

test('pages: one request per page, shared while in flight, prefetched past the middle', async () => {
  const { fetchPage, calls } = fakeSteps(450, () => false);
  const pages = new StepPages(fetchPage, { pageSize: 200 });
  const [a, b] = await Promise.all([pages.get(5), pages.get(199)]);
  assert.equal(a.step, 5);
  assert.equal(b.step, 199);
  assert.deepEqual(calls, [[0, 200]]);
  assert.equal(pages.total, 450);
  assert.deepEqual(pages.lists.incumbent, [7, 250]);
  // stepping through page 0 one step at a time: no request until past the middle
  for (let k = 0; k < 100; k++) { assert.ok(pages.peek(k)); pages.prefetch(k); }
  assert.equal(calls.length, 1);
  pages.prefetch(100);
  pages.prefetch(101);
  await pages.load(200);
  assert.deepEqual(calls, [[0, 200], [200, 200]]);
  assert.equal(pages.requests, 2);
  assert.equal(await pages.get(450), undefined); // past the end: no request
  pages.prefetch(399);
  await pages.load(400);
  assert.equal(calls.length, 3);
  pages.prefetch(449); // the last page: nothing after it
  assert.equal(calls.length, 3);
});

test('pages: the least recently used page goes first', async () => {
  const { fetchPage, calls } = fakeSteps(1000, () => false);
  const pages = new StepPages(fetchPage, { pageSize: 100, maxPages: 2 });
  await pages.get(0);
  await pages.get(100);
  pages.peek(0); // page 0 used again
  await pages.get(200); // evicts page 100
  assert.ok(pages.has(0) && pages.has(200) && !pages.has(100));
  await pages.get(150);
  assert.equal(calls.length, 4);
});

test('the next pruned step is found across pages, forwards and backwards', async () => {
  const pruned = new Set([3, 250, 251, 430]);
  const { fetchPage, calls } = fakeSteps(450, (k) => pruned.has(k));
  const pages = new StepPages(fetchPage, { pageSize: 200 });
  assert.equal(await findFlagged(pages, 3, 'prune', 1), 250); // reads page 200 as well
  assert.equal(await findFlagged(pages, 250, 'prune', 1), 251);
  assert.equal(await findFlagged(pages, 251, 'prune', 1), 430);
  assert.equal(await findFlagged(pages, 430, 'prune', 1), -1);
  assert.equal(await findFlagged(pages, 250, 'prune', -1), 3);
  assert.equal(await findFlagged(pages, 3, 'prune', -1), -1);
  assert.deepEqual(calls.map((c) => c[0]).sort((x, y) => x - y), [0, 200, 400]); // each page once
});

test('notes are placed at their node\u2019s step, or at their order when the node is unknown', () => {
  const stepOfNode = (id) => ({ 4: 3, 9: 7 })[id] ?? -1;
  const stepOfOrder = (o) => (o === 12 ? 11 : -1);
  const notes = [
    { id: 'a', node: 4, order: 3 }, { id: 'b', node: 9, order: 7 }, { id: 'c', node: 4, order: 3 },
    { id: 'd', node: null, order: 12 }, { id: 'e', node: 77, order: null }, // node 77: never solved
  ];
  const { byStep, steps, nodeIds } = notesByStep(notes, stepOfNode, stepOfOrder);
  assert.deepEqual(steps, [3, 7, 11]);
  assert.deepEqual(byStep.get(3).map((n) => n.id), ['a', 'c']);
  assert.deepEqual([...nodeIds].sort((x, y) => x - y), [4, 9, 77]);
});

test('counter, speed, timeline positions and playing', () => {
  assert.equal(counterText(11, 111), 'Step 12 of 111');
  assert.equal(counterText(0, 1234), 'Step 1 of 1,234');
  assert.equal(clampStep(-3, 10), 0);
  assert.equal(clampStep(12, 10), 9);
  assert.equal(clampStep(4.4, 10), 4);
  assert.equal(clampSpeed(0), 1);
  assert.equal(clampSpeed(80), 50);
  assert.equal(clampSpeed(20), 20);
  assert.equal(stepToX(0, 4, 400), 50);
  assert.equal(xToStep(399, 4, 400), 3);
  assert.equal(xToStep(-5, 4, 400), 0);
  assert.equal(xToStep(stepToX(7, 111, 900), 111, 900), 7);
  // 50 steps per second: 2.2 s after step 0 is step 110, and it stops at the last step
  assert.equal(playedTo(0, 2200, 50, 111), 110);
  assert.equal(playedTo(0, 9000, 50, 111), 110);
  assert.equal(playedTo(5, 999, 1, 111), 5);
});

test('the walkthrough link form and its keys', () => {
  const s = parseHash('#run=depot-siting-loose.most-fractional.best-bound&step=12');
  assert.equal(s.step, 12);
  assert.equal(formatHash(s), '#run=depot-siting-loose.most-fractional.best-bound&step=12');
  assert.equal(parseHash('#run=a&step=-1').step, null);
  assert.equal(parseHash('#run=a&node=3').step, null);
  assert.deepEqual(parseHash(formatHash({ ...s, node: 4 })), { ...s, node: 4 }); // old keys still work
  assert.equal(actionFor('.'), 'walk-next');
  assert.equal(actionFor(','), 'walk-prev');
  assert.equal(actionFor('n'), 'walk-incumbent');
  assert.equal(actionFor('N'), 'walk-incumbent-back');
  assert.equal(actionFor('w'), 'walk-toggle');
  assert.equal(actionFor('f'), 'fit'); // the inspector's keys are unchanged
  assert.equal(actionFor('p'), 'parent');
});
