import { describe, expect, it } from 'vitest';
import { concatReplicates, decodeResults, encodeResults } from './codec';

const bits = (a: Float64Array) => Array.from(new Uint32Array(a.buffer, a.byteOffset, a.length * 2));

describe('encodeResults / decodeResults', () => {
  it('round-trips typed arrays byte for byte, including NaN payloads, −0 and subnormals', () => {
    const f = new Float64Array([1.5, -0, Number.MIN_VALUE, Infinity, -Infinity, 0.1 + 0.2]);
    const nanBits = new DataView(new ArrayBuffer(8));
    nanBits.setUint32(0, 0x7ff80000 | 0x1234, true); // a NaN with a payload
    const withNan = new Float64Array([...f, new Float64Array(nanBits.buffer)[0]!]);
    const value = {
      mixed: { estimate: withNan, converged: new Uint8Array([1, 0, 1]) },
      ols: { df: new Int32Array([-3, 7]), label: 'ols', weights: new Float32Array([0.25, 3]) },
      scalars: [1, -0, NaN, Infinity, -Infinity, 2 ** 53, null, true, 'x'],
    };
    const back = decodeResults(encodeResults(value)) as typeof value;
    expect(bits(back.mixed.estimate)).toEqual(bits(withNan));
    expect(Array.from(back.mixed.converged)).toEqual([1, 0, 1]);
    expect(back.ols.df).toBeInstanceOf(Int32Array);
    expect(Array.from(back.ols.df)).toEqual([-3, 7]);
    expect(Array.from(back.ols.weights)).toEqual([0.25, 3]);
    expect(back.ols.label).toBe('ols');
    expect(Object.is(back.scalars[1], -0)).toBe(true);
    expect(back.scalars[2]).toBeNaN();
    expect(back.scalars.slice(3)).toEqual([Infinity, -Infinity, 2 ** 53, null, true, 'x']);
  });

  it('reads arrays that are views into a larger buffer', () => {
    const big = new Float64Array([9, 8, 7, 6]);
    const back = decodeResults(encodeResults({ a: big.subarray(1, 3) })) as { a: Float64Array };
    expect(Array.from(back.a)).toEqual([8, 7]);
  });

  it('reads bytes that come as a Node Buffer inside a larger pooled buffer (as pg returns bytea)', () => {
    const bytes = encodeResults({ a: new Float64Array([1.25, -2]), b: new Int32Array([7]) });
    const pool = Buffer.alloc(bytes.length + 24, 0xff);
    pool.set(bytes, 16);
    const back = decodeResults(pool.subarray(16, 16 + bytes.length)) as { a: Float64Array; b: Int32Array };
    expect(Array.from(back.a)).toEqual([1.25, -2]);
    expect(Array.from(back.b)).toEqual([7]);
    expect(back.a.byteOffset).toBe(0);
  });

  it('refuses bytes that are not a stored chunk, and values it cannot store', () => {
    expect(() => decodeResults(new Uint8Array([1, 2, 3, 4, 5, 6, 7, 8]))).toThrow(/bad header/);
    expect(() => encodeResults({ f: () => 1 })).toThrow(/cannot store \$\.f/);
    expect(() => encodeResults({ $x: 1 })).toThrow(/may not start/);
  });
});

describe('concatReplicates', () => {
  it('joins typed arrays in order and keeps equal scalars', () => {
    const a = { n: 2, ols: { est: new Float64Array([1, 2]) } };
    const b = { n: 2, ols: { est: new Float64Array([3]) } };
    const c = { n: 2, ols: { est: new Float64Array([4, 5]) } };
    const joined = concatReplicates([a, b, c]);
    expect(Array.from(joined.ols.est)).toEqual([1, 2, 3, 4, 5]);
    expect(joined.n).toBe(2);
  });

  it('refuses parts whose shape or scalars differ', () => {
    expect(() => concatReplicates([{ n: 1 }, { n: 2 }])).toThrow(/\$\.n differs/);
    expect(() => concatReplicates([{ a: new Float64Array(1) }, { a: new Int32Array(1) }])).toThrow(/changes type/);
  });
});
