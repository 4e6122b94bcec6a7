// Decoding of the binary tree format served by GET /api/runs/{id}/tree?format=bin.
// Pure: takes an ArrayBuffer (already un-gzipped by the browser), gives typed arrays.
//
// Layout: "UGT1", uint32 LE length of the meta JSON, the meta JSON
// ({nodes, fields: [{name, dtype, offset, length}], ...}), then each field's
// little-endian array, 8-byte aligned. Offsets count from the start of the
// buffer, or from the data section when the meta says so (`data_offset`).

const MAGIC = 'UGT1';

const KINDS = {
  int8: [Int8Array, 1], uint8: [Uint8Array, 1], bool: [Uint8Array, 1],
  int16: [Int16Array, 2], uint16: [Uint16Array, 2],
  int32: [Int32Array, 4], uint32: [Uint32Array, 4],
  int64: [null, 8], uint64: [null, 8],
  float32: [Float32Array, 4], float64: [Float64Array, 8],
};

const NUMPY_CODES = {
  i1: 'int8', u1: 'uint8', b1: 'bool', i2: 'int16', u2: 'uint16', i4: 'int32',
  u4: 'uint32', i8: 'int64', u8: 'uint64', f4: 'float32', f8: 'float64',
};

/** "int32", "<i4", "|u1", "float64" ... -> canonical name; throws on big-endian or unknown. */
export function canonicalDtype(dtype) {
  const d = String(dtype).trim().toLowerCase();
  if (KINDS[d]) return d;
  const m = /^([<>|=]?)([a-z]\d)$/.exec(d);
  if (m && NUMPY_CODES[m[2]]) {
    if (m[1] === '>') throw new Error(`big-endian field type ${dtype} is not supported`);
    return NUMPY_CODES[m[2]];
  }
  throw new Error(`unknown field type ${dtype}`);
}

export class TreeFormatError extends Error {}

/** Read the header: {meta, dataStart} (dataStart: first byte after the padded meta). */
export function readHeader(buffer) {
  if (buffer.byteLength < 8) throw new TreeFormatError('tree data is too short');
  const head = new Uint8Array(buffer, 0, 4);
  const magic = String.fromCharCode(head[0], head[1], head[2], head[3]);
  if (magic !== MAGIC) throw new TreeFormatError(`tree data does not start with ${MAGIC}`);
  const metaLength = new DataView(buffer).getUint32(4, true);
  if (8 + metaLength > buffer.byteLength) throw new TreeFormatError('tree meta runs past the end');
  const text = new TextDecoder().decode(new Uint8Array(buffer, 8, metaLength));
  let meta;
  try {
    meta = JSON.parse(text);
  } catch (e) {
    throw new TreeFormatError(`tree meta is not JSON: ${e.message}`);
  }
  const dataStart = Math.ceil((8 + metaLength) / 8) * 8;
  return { meta, dataStart };
}

/**
 * Decode every field into a typed array. 64-bit integers become Int32Array
 * when every value fits (ids, rows, depths and counts always do in practice),
 * else Float64Array. Returns {nodes, meta, columns: {name: TypedArray}}.
 */
export function decodeTree(buffer) {
  const { meta, dataStart } = readHeader(buffer);
  const n = Number(meta.nodes ?? meta.node_count ?? meta.count ?? 0);
  const fields = Array.isArray(meta.fields) ? meta.fields : Object.entries(meta.fields ?? {})
    .map(([name, f]) => ({ name, ...f }));
  const base = fieldBase(meta, fields, dataStart);
  const columns = {};
  for (const f of fields) {
    const dtype = canonicalDtype(f.dtype);
    const length = Number(f.length ?? f.count ?? n);
    const [, width] = KINDS[dtype];
    const offset = base + Number(f.offset);
    if (offset + length * width > buffer.byteLength) {
      throw new TreeFormatError(`field ${f.name} runs past the end of the data`);
    }
    columns[f.name] = view(buffer, offset, length, dtype);
  }
  return { nodes: n, meta, columns };
}

function fieldBase(meta, fields, dataStart) {
  if (meta.data_offset !== undefined) return Number(meta.data_offset);
  if (meta.base !== undefined) return Number(meta.base);
  if (!fields.length) return 0;
  const first = Math.min(...fields.map((f) => Number(f.offset)));
  // Offsets from the buffer's start can never point inside the header.
  return first < dataStart ? dataStart : 0;
}

function view(buffer, offset, count, dtype) {
  const [Kind, width] = KINDS[dtype];
  if (Kind) {
    if (offset % width === 0) return new Kind(buffer, offset, count);
    return new Kind(buffer.slice(offset, offset + count * width));
  }
  return narrow64(buffer, offset, count, dtype === 'uint64');
}

/** 64-bit integers -> Int32Array if every value fits, else Float64Array (exact to 2^53). */
export function narrow64(buffer, offset, count, unsigned = false) {
  const words = offset % 4 === 0
    ? new Int32Array(buffer, offset, count * 2)
    : new Int32Array(buffer.slice(offset, offset + count * 8));
  const out = new Int32Array(count);
  let fits = true;
  for (let i = 0, j = 0; i < count; i++, j += 2) {
    const lo = words[j];
    const hi = words[j + 1];
    if (hi !== (lo >> 31) || (unsigned && lo < 0)) { fits = false; break; }
    out[i] = lo;
  }
  if (fits) return out;
  const wide = new Float64Array(count);
  for (let i = 0, j = 0; i < count; i++, j += 2) {
    const lo = words[j] >>> 0;
    const hi = unsigned ? words[j + 1] >>> 0 : words[j + 1];
    wide[i] = hi * 4294967296 + lo;
  }
  return wide;
}

/** Build the binary format (used by tests and the benchmark page). */
export function encodeTree(columns, extraMeta = {}) {
  const names = Object.keys(columns);
  const n = names.length ? columns[names[0]].length : 0;
  const fields = [];
  let offset = 0;
  for (const name of names) {
    const a = columns[name];
    const dtype = dtypeOf(a);
    fields.push({ name, dtype, offset, length: a.length });
    offset += Math.ceil(a.byteLength / 8) * 8;
  }
  const metaText = new TextEncoder().encode(JSON.stringify({ nodes: n, fields, ...extraMeta }));
  const dataStart = Math.ceil((8 + metaText.length) / 8) * 8;
  const buffer = new ArrayBuffer(dataStart + offset);
  const bytes = new Uint8Array(buffer);
  bytes.set([85, 71, 84, 49], 0); // "UGT1"
  new DataView(buffer).setUint32(4, metaText.length, true);
  bytes.set(metaText, 8);
  fields.forEach((f, i) => {
    const a = columns[names[i]];
    bytes.set(new Uint8Array(a.buffer, a.byteOffset, a.byteLength), dataStart + f.offset);
  });
  return buffer;
}

function dtypeOf(a) {
  if (a instanceof Float64Array) return 'float64';
  if (a instanceof Float32Array) return 'float32';
  if (a instanceof Int32Array) return 'int32';
  if (a instanceof Uint32Array) return 'uint32';
  if (a instanceof Int16Array) return 'int16';
  if (a instanceof Uint16Array) return 'uint16';
  if (a instanceof Int8Array) return 'int8';
  if (a instanceof Uint8Array) return 'uint8';
  if (a instanceof BigInt64Array) return 'int64';
  throw new Error('unsupported array type');
}
