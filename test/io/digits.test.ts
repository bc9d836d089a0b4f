// Numbers written into bytes must read exactly as ECMAScript's Number::toString writes them
// (ECMA-262, Number::toString: shortest digits that round-trip, the closest of them); String(x)
// of the running engine is the reference.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { MAX_NUMBER_BYTES, writeInteger, writeNumber } from '../../src/io/digits.js';
import { rng } from '../helpers/meshes.js';

const latin1 = new TextDecoder('latin1');
const buf = new Uint8Array(64);

function text(x: number): string {
  return latin1.decode(buf.subarray(0, writeNumber(buf, 0, x)));
}

function reference(x: number): string {
  // String() without its one loss: -0 is written "-0" so that it reads back as itself
  return x === Infinity ? 'inf' : x === -Infinity ? '-inf' : x !== x ? 'nan' : Object.is(x, -0) ? '-0' : String(x);
}

/** A double from two 32-bit halves (every bit pattern, subnormals and NaNs included). */
function fromBits(hi: number, lo: number): number {
  const f = new Float64Array(1);
  const u = new Uint32Array(f.buffer);
  const little = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;
  u[little ? 1 : 0] = hi >>> 0;
  u[little ? 0 : 1] = lo >>> 0;
  return f[0]!;
}

describe('writeNumber', () => {
  it('special values and the edges of the fixed and exponent forms (ECMA-262 Number::toString, steps 6-9)', () => {
    const cases = [0, -0, 1, -1, 0.1, 0.5, 1 / 3, 2 / 3, 1e21, 1e21 - 65536, 123456789012345680000, 1e-6, 1e-7, 1.5e-7, 9.999999999999999e-7,
      Number.MAX_VALUE, Number.MIN_VALUE, 2.2250738585072014e-308, 2.225073858507201e-308, Number.EPSILON, 2 ** 53, 2 ** 53 + 2, 2 ** 60,
      9007199254740991, 4503599627370496.5, 0.30000000000000004, 5e-324, -1.7976931348623157e308, 1e16, 1e17, 9.999999999999998e16,
      1e23, 8.41e21, 5e-310, NaN, Infinity, -Infinity, 100, 1e15, 123.456, 180, 60.00000000000001];
    for (const x of cases) expect(text(x), String(x)).toBe(reference(x));
  });

  it('powers of two and of ten over the whole range', () => {
    for (let e = -1074; e <= 1023; e++) {
      const x = 2 ** e;
      expect(text(x)).toBe(reference(x));
      expect(text(x * 1.5)).toBe(reference(x * 1.5));
    }
    for (let k = -323; k <= 308; k++) {
      const x = Number(`1e${k}`);
      expect(text(x)).toBe(reference(x));
      expect(text(-x * 7)).toBe(reference(-x * 7));
    }
  });

  it('random bit patterns, mesh-like values and short decimals (seeded)', () => {
    const next = rng(20240601);
    for (let i = 0; i < 150_000; i++) {
      const kind = i % 5;
      let x: number;
      if (kind === 0) x = fromBits(next() * 2 ** 32, next() * 2 ** 32);
      else if (kind === 1) x = next() * 100; // angles, ratios
      else if (kind === 2) x = 4e6 + next() * 1e5; // projected coordinates
      else if (kind === 3) x = Math.round(next() * 1e6) / 1000; // short decimals
      else x = next() * 10 ** Math.floor(next() * 40 - 20);
      const got = text(x);
      if (got !== reference(x)) expect(got, `bits of ${x}`).toBe(reference(x));
    }
  });

  it('any double (fast-check)', () => {
    fc.assert(fc.property(fc.double(), (x) => text(x) === reference(x)), { numRuns: 20_000 });
  });

  it('never writes more than MAX_NUMBER_BYTES', () => {
    for (const x of [-1.2345678901234567e-308, -2.2250738585072014e-308, -1.7976931348623157e308, -5e-324]) {
      expect(writeNumber(buf, 0, x)).toBeLessThanOrEqual(MAX_NUMBER_BYTES);
    }
  });

  it('integers up to 2^53 as plain digits', () => {
    for (const v of [0, 7, 10, 99, 100, 12345678, 99999999, 100000000, 123456789012345, 2 ** 53 - 1]) {
      expect(latin1.decode(buf.subarray(0, writeInteger(buf, 0, v)))).toBe(String(v));
    }
  });
});
