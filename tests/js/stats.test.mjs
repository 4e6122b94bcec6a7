import { test } from 'node:test';
import assert from 'node:assert/strict';
import { branchingStats, countByDepth, countByStatus, sortRows } from '../../web/js/stats.js';
import { STATUS_CODE } from '../../web/js/statuses.js';
import { storeOf } from './helpers.mjs';

// root 0 (bound 10) branches on x0; down child 1 (bound 12) branches on x1 into 3 (14) and 4
// (infeasible); up child 2 (bound 11) is pruned. Var of a child = id % 3 in the helper, so set
// the variables by hand below.
function tree(sense = 'min') {
  const s = storeOf([
    [0, null, null, 'branched', 10],
    [1, 0, 'down', 'branched', 12],
    [2, 0, 'up', 'pruned', 11],
    [3, 1, 'down', 'integral', 14],
    [4, 1, 'up', 'infeasible', null],
  ], sense);
  s.var.set([-1, 0, 0, 1, 1]);
  return s;
}

test('counts by status and by depth', () => {
  const s = tree();
  const c = countByStatus(s.status, s.n);
  assert.equal(c[STATUS_CODE.branched], 2);
  assert.equal(c[STATUS_CODE.infeasible], 1);
  const d = countByDepth(s.status, s.depth, s.n);
  assert.equal(d.depths, 3);
  assert.equal(d.counts[2 * 7 + STATUS_CODE.integral], 1);
  assert.equal(d.counts[1 * 7 + STATUS_CODE.pruned], 1);
});

test('branching statistics per variable (computed by hand)', () => {
  const rows = branchingStats(tree());
  const x0 = rows.find((r) => r.var === 0);
  const x1 = rows.find((r) => r.var === 1);
  assert.equal(x0.branched, 1);
  assert.equal(x0.downMean, 2); // 12 - 10
  assert.equal(x0.upMean, 1); // 11 - 10
  assert.equal(x1.branched, 1);
  assert.equal(x1.downMean, 2); // 14 - 12
  assert.ok(Number.isNaN(x1.upMean));
  assert.equal(x1.upInfeasible, 1);
  assert.equal(x0.firstRow, 0);
  assert.equal(x1.firstRow, 1);
});

test('for a maximisation a falling bound is a positive gain', () => {
  const s = tree('max');
  s.bound.set([10, 8, 9, 7, NaN]);
  const x0 = branchingStats(s).find((r) => r.var === 0);
  assert.equal(x0.downMean, 2);
  assert.equal(x0.upMean, 1);
});

test('sorting puts unknown values last and breaks ties by variable', () => {
  const rows = [{ var: 2, v: 1 }, { var: 1, v: NaN }, { var: 0, v: 1 }, { var: 3, v: 5 }];
  assert.deepEqual(sortRows(rows, 'v', true).map((r) => r.var), [3, 0, 2, 1]);
  assert.deepEqual(sortRows(rows, 'v', false).map((r) => r.var), [0, 2, 3, 1]);
  const named = [{ var: 0, name: 'x10' }, { var: 1, name: 'x9' }];
  assert.deepEqual(sortRows(named, 'name', false).map((r) => r.name), ['x9', 'x10']);
});
