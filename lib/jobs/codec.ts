/**
 * A compact, bit-exact binary form for a chunk's per-replicate results, stored as bytea in
 * simulation_chunks. The value is any tree of plain objects, arrays, strings, booleans, null,
 * numbers and typed arrays. Typed arrays are copied byte for byte (so NaN payloads, −0 and
 * subnormals survive); everything else goes into a small JSON header, with −0, NaN and ±∞
 * spelled out because JSON cannot hold them.
 *
 * Layout: "UWC1" · uint32 LE header length · header (UTF-8 JSON) · zero padding to a multiple
 * of 8 · the typed arrays' bytes, each starting on a multiple of 8.
 *
 * `concatReplicates` joins the results of consecutive chunks in replicate order: typed arrays
 * at the same place in the tree are concatenated; every other leaf must be equal in all parts.
 */

const MAGIC = 'UWC1';

const TYPED = {
  Float64Array,
  Float32Array,
  Int32Array,
  Uint32Array,
  Int16Array,
  Uint16Array,
  Int8Array,
  Uint8Array,
} as const;
type TypedName = keyof typeof TYPED;
type AnyTyped = InstanceType<(typeof TYPED)[TypedName]>;

function typedName(v: unknown): TypedName | undefined {
  if (!ArrayBuffer.isView(v) || v instanceof DataView) return undefined;
  const name = v.constructor.name;
  return name in TYPED ? (name as TypedName) : undefined;
}

const align8 = (n: number) => (n + 7) & ~7;

interface Slot {
  $ta: TypedName;
  o: number;
  n: number;
}

export function encodeResults(value: unknown): Uint8Array {
  const arrays: { bytes: Uint8Array; offset: number }[] = [];
  let bodyLength = 0;
  const walk = (v: unknown, path: string): unknown => {
    const t = typedName(v);
    if (t) {
      const a = v as AnyTyped;
      const offset = bodyLength;
      arrays.push({ bytes: new Uint8Array(a.buffer, a.byteOffset, a.byteLength), offset });
      bodyLength = align8(offset + a.byteLength);
      return { $ta: t, o: offset, n: a.length } satisfies Slot;
    }
    if (typeof v === 'number') {
      if (Number.isNaN(v)) return { $f: 'NaN' };
      if (v === Infinity) return { $f: 'Infinity' };
      if (v === -Infinity) return { $f: '-Infinity' };
      if (Object.is(v, -0)) return { $f: '-0' };
      return v;
    }
    if (v === null || typeof v === 'string' || typeof v === 'boolean') return v;
    if (Array.isArray(v)) return v.map((x, i) => walk(x, `${path}[${i}]`));
    if (typeof v === 'object' && Object.getPrototypeOf(v) === Object.prototype) {
      const out: Record<string, unknown> = {};
      for (const [k, x] of Object.entries(v as Record<string, unknown>)) {
        if (k.startsWith('$')) throw new Error(`encodeResults: key ${path}.${k} may not start with "$"`);
        if (x !== undefined) out[k] = walk(x, `${path}.${k}`);
      }
      return out;
    }
    throw new Error(`encodeResults: cannot store ${path} (${typeof v})`);
  };
  const header = new TextEncoder().encode(JSON.stringify(walk(value, '$')));
  const start = align8(8 + header.length);
  const out = new Uint8Array(start + bodyLength);
  out.set(new TextEncoder().encode(MAGIC), 0);
  new DataView(out.buffer).setUint32(4, header.length, true);
  out.set(header, 8);
  for (const a of arrays) out.set(a.bytes, start + a.offset);
  return out;
}

export function decodeResults(bytes: Uint8Array): unknown {
  if (bytes.length < 8 || new TextDecoder().decode(bytes.subarray(0, 4)) !== MAGIC) {
    throw new Error('decodeResults: not a stored chunk (bad header)');
  }
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const headerLength = view.getUint32(4, true);
  const header = JSON.parse(new TextDecoder().decode(bytes.subarray(8, 8 + headerLength))) as unknown;
  const start = align8(8 + headerLength);
  const walk = (v: unknown): unknown => {
    if (Array.isArray(v)) return v.map(walk);
    if (v && typeof v === 'object') {
      const o = v as Record<string, unknown>;
      if (typeof o.$ta === 'string') {
        const slot = o as unknown as Slot;
        const Ctor = TYPED[slot.$ta];
        if (!Ctor) throw new Error(`decodeResults: unknown array type ${slot.$ta}`);
        const byteLength = slot.n * Ctor.BYTES_PER_ELEMENT;
        // Copy into a buffer of its own: the result must not alias the (pooled) buffer the bytes
        // came in. (Uint8Array's slice copies; a Node Buffer's slice would not.)
        const copy = Uint8Array.prototype.slice.call(bytes, start + slot.o, start + slot.o + byteLength);
        if (copy.length !== byteLength) throw new Error('decodeResults: truncated chunk');
        return new Ctor(copy.buffer, 0, slot.n);
      }
      if (typeof o.$f === 'string') return Number(o.$f === '-0' ? -0 : o.$f);
      const out: Record<string, unknown> = {};
      for (const [k, x] of Object.entries(o)) out[k] = walk(x);
      return out;
    }
    return v;
  };
  return walk(header);
}

/** Joins per-replicate results of consecutive chunks (in replicate order) into one. */
export function concatReplicates<T>(parts: readonly T[]): T {
  if (parts.length === 0) throw new Error('concatReplicates: no parts');
  if (parts.length === 1) return parts[0]!;
  const join = (vs: unknown[], path: string): unknown => {
    const first = vs[0];
    const t = typedName(first);
    if (t) {
      const arrays = vs as AnyTyped[];
      if (arrays.some((a) => typedName(a) !== t)) throw new Error(`concatReplicates: ${path} changes type between chunks`);
      const out = new TYPED[t](arrays.reduce((s, a) => s + a.length, 0));
      let at = 0;
      for (const a of arrays) {
        (out as AnyTyped).set(a as never, at);
        at += a.length;
      }
      return out;
    }
    if (Array.isArray(first)) {
      if (vs.some((v) => !Array.isArray(v) || v.length !== first.length)) throw new Error(`concatReplicates: ${path} differs in shape between chunks`);
      return first.map((_, i) => join(vs.map((v) => (v as unknown[])[i]), `${path}[${i}]`));
    }
    if (first && typeof first === 'object') {
      const out: Record<string, unknown> = {};
      for (const k of Object.keys(first)) out[k] = join(vs.map((v) => (v as Record<string, unknown>)[k]), `${path}.${k}`);
      return out;
    }
    if (vs.some((v) => !Object.is(v, first))) throw new Error(`concatReplicates: ${path} differs between chunks`);
    return first;
  };
  return join(parts as unknown[], '$') as T;
}
