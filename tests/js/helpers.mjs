// Small trees for the JavaScript tests.
import { TreeStore } from '../../web/js/treestore.js';

/**
 * A tree from [id, parentId, dir, status, bound] rows (parents before children).
 * dir: 'down' | 'up' | null.
 */
export function storeOf(rows, sense = 'min') {
  const store = new TreeStore(4);
  store.sense = sense;
  const depthOf = new Map();
  const events = rows.map(([id, parent, dir, status, bound], k) => {
    const depth = parent === null ? 0 : depthOf.get(parent) + 1;
    depthOf.set(id, depth);
    return { kind: 'node', id, parent, depth, order: k, time: k * 0.1,
      branch: dir ? { var: id % 3, name: `x${id % 3}`, dir, value: 0 } : null,
      bound, status };
  });
  store.appendEvents(events);
  return store;
}

/** A complete binary tree of the given depth (2^(depth+1) - 1 nodes), ids in BFS order. */
export function fullTree(depth, leafStatus = 'pruned') {
  const rows = [];
  const total = 2 ** (depth + 1) - 1;
  for (let id = 0; id < total; id++) {
    const parent = id === 0 ? null : Math.floor((id - 1) / 2);
    const dir = id === 0 ? null : id % 2 === 1 ? 'down' : 'up';
    const isLeaf = 2 * id + 1 >= total;
    rows.push([id, parent, dir, isLeaf ? leafStatus : 'branched', 10 + Math.log2(id + 1)]);
  }
  return storeOf(rows);
}
