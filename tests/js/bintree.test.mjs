import { test } from 'node:test';
import assert from 'node:assert/strict';
import { canonicalDtype, decodeTree, encodeTree, narrow64, TreeFormatError } from '../../web/js/bintree.js';

test('numpy dtype strings are understood', () => {
  assert.equal(canonicalDtype('<i4'), 'int32');
  assert.equal(canonicalDtype('|u1'), 'uint8');
  assert.equal(canonicalDtype('float64'), 'float64');
  assert.equal(canonicalDtype('<f8'), 'float64');
  assert.throws(() => canonicalDtype('>i4'), /big-endian/);
  assert.throws(() => canonicalDtype('complex'), /unknown/);
});

test('encode then decode gives the same columns', () => {
  const cols = {
    id: Int32Array.from([0, 1, 2]),
    parent: Int32Array.from([-1, 0, 0]),
    status: Uint8Array.from([0, 2, 3]),
    bound: Float64Array.from([1.5, 2.5, NaN]),
  };
  const { nodes, columns } = decodeTree(encodeTree(cols));
  assert.equal(nodes, 3);
  assert.deepEqual(Array.from(columns.parent), [-1, 0, 0]);
  assert.deepEqual(Array.from(columns.status), [0, 2, 3]);
  assert.equal(columns.bound[1], 2.5);
  assert.ok(Number.isNaN(columns.bound[2]));
  assert.ok(columns.bound instanceof Float64Array);
});

test('a buffer with absolute offsets and int64 fields decodes', () => {
  // Hand-built like numpy would write it: offsets counted from the buffer start.
  const n = 2;
  const metaFor = (dataStart) => JSON.stringify({ nodes: n, fields: [
    { name: 'id', dtype: '<i8', offset: dataStart, length: n },
    { name: 'bound', dtype: '<f8', offset: dataStart + 16, length: n },
  ] });
  const start = 256;
  const meta = metaFor(start).padEnd(start - 8, ' ');
  const buf = new ArrayBuffer(start + 32);
  const bytes = new Uint8Array(buf);
  bytes.set([85, 71, 84, 49]);
  new DataView(buf).setUint32(4, meta.length, true);
  bytes.set(new TextEncoder().encode(meta), 8);
  new BigInt64Array(buf, start, 2).set([7n, -1n]);
  new Float64Array(buf, start + 16, 2).set([3.25, -4]);
  const { columns } = decodeTree(buf);
  assert.ok(columns.id instanceof Int32Array);
  assert.deepEqual(Array.from(columns.id), [7, -1]);
  assert.deepEqual(Array.from(columns.bound), [3.25, -4]);
});

test('int64 beyond 32 bits widens to float64', () => {
  const buf = new ArrayBuffer(16);
  new BigInt64Array(buf).set([2n ** 40n + 5n, -3n]);
  const out = narrow64(buf, 0, 2);
  assert.ok(out instanceof Float64Array);
  assert.equal(out[0], 2 ** 40 + 5);
  assert.equal(out[1], -3);
});

test('bad data is refused with a clear message', () => {
  assert.throws(() => decodeTree(new ArrayBuffer(4)), TreeFormatError);
  const buf = new Uint8Array(16);
  buf.set([80, 75, 3, 4]);
  assert.throws(() => decodeTree(buf.buffer), /UGT1/);
});
