import { test } from 'node:test';
import assert from 'node:assert/strict';
import { decodeTree, encodeTree } from '../../web/js/bintree.js';
import { remapCodes, TreeStore } from '../../web/js/treestore.js';
import { STATUS_CODE } from '../../web/js/statuses.js';

test('live node events append, grow by doubling and index ids', () => {
  const s = new TreeStore(4);
  const events = [{ kind: 'node', id: 0, parent: null, depth: 0, order: 0, time: 0, branch: null,
    bound: 1, status: 'branched' }];
  for (let id = 1; id < 5000; id++) {
    events.push({ kind: 'node', id, parent: Math.floor((id - 1) / 2), depth: Math.floor(Math.log2(id + 1)),
      order: id, time: id / 1000, branch: { var: id % 7, name: `y${id % 7}`, dir: id % 2 ? 'down' : 'up', value: 1 },
      bound: 1 + id / 100, status: 'pruned' });
    if (id === 40) events.push({ kind: 'incumbent', node: 40, order: 40, time: 0.04, objective: 3 });
  }
  assert.equal(s.appendEvents(events), 5000);
  assert.equal(s.n, 5000);
  assert.ok(s.capacity >= 5000 && s.capacity < 16384);
  assert.equal(s.rowOf(4999), 4999);
  assert.equal(s.parent[4999], 2499);
  assert.equal(s.status[7], STATUS_CODE.pruned);
  assert.equal(s.dir[1], 1);
  assert.equal(s.varNames[3], 'y3');
  assert.deepEqual(s.incumbentRows, [40]);
  assert.equal(s.incumbent[41], 3);
  assert.ok(Number.isNaN(s.incumbent[39]));
  assert.deepEqual(s.pathTo(9), [0, 1, 4, 9]);
  assert.equal(s.rowAtOrder(77), 77);
  assert.equal(s.rowAtTime(0.0505), 50);
  assert.equal(s.hasLayout, false);
});

test('sparse ids use a map', () => {
  const s = new TreeStore();
  s.appendEvents([{ kind: 'node', id: 1e9, parent: null, depth: 0, status: 'integral', bound: 0 }]);
  assert.equal(s.rowOf(1e9), 0);
  assert.equal(s.rowOf(5), -1);
});

test('a decoded binary tree becomes a store without copies; codes are remapped', () => {
  const cols = {
    id: Int32Array.from([0, 1, 2]), parent: Int32Array.from([-1, 0, 0]),
    depth: Int32Array.from([0, 1, 1]), order: Int32Array.from([0, 1, -1]),
    status: Uint8Array.from([0, 1, 0]), bound: Float64Array.from([1, 2, NaN]),
    x: Float32Array.from([0.5, 0, 1]), x_min: Float32Array.from([0, 0, 1]),
    x_max: Float32Array.from([1, 0, 1]), subtree_size: Int32Array.from([3, 1, 1]),
  };
  // the server lists statuses in another order: code 1 is "pruned" there
  const decoded = decodeTree(encodeTree(cols, { sense: 'max', var_names: { 3: 'z' },
    statuses: ['branched', 'pruned', 'integral', 'infeasible', 'discarded', 'open', 'failed'] }));
  const s = TreeStore.fromDecoded(decoded);
  assert.equal(s.n, 3);
  assert.equal(s.sense, 'max');
  assert.ok(s.hasLayout);
  assert.ok(s.x instanceof Float32Array);
  assert.equal(s.status[1], STATUS_CODE.pruned);
  assert.equal(s.varNames[3], 'z');
  assert.equal(s.rowOf(2), 2);
  const a = Uint8Array.from([0, 1, 2]);
  remapCodes(a, 3, ['a', 'b', 'c'], ['c', 'b', 'a']);
  assert.deepEqual(Array.from(a), [2, 1, 0]);
});
