import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { quantileOf, quantileSorted, radixSort, smallestK } from '../../src/audit/stats.js';

describe('statistics without sorting', () => {
  it('quantileOf equals the quantile of the sorted values (random arrays with ties and Infinity)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.oneof(fc.integer({ min: 0, max: 5 }).map((k) => k / 4), fc.double({ min: 0, max: 10, noNaN: true }), fc.constant(Infinity)), { minLength: 0, maxLength: 300 }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        (vals, q) => {
          const a = Float64Array.from(vals);
          const finite = Float64Array.from(vals.filter((v) => v < Infinity)).sort();
          expect(quantileOf(a, q)).toBe(quantileSorted(finite, q));
          const positive = Float64Array.from(vals.filter((v) => v > 0 && v < Infinity)).sort();
          expect(quantileOf(a, q, 0)).toBe(quantileSorted(positive, q));
        },
      ),
      { numRuns: 2000, seed: 9 },
    );
  });

  it('smallestK returns the k smallest in ascending order, ties by index', () => {
    const a = Float64Array.from([3, 1, 2, 1, Infinity, 0.5]);
    expect(Array.from(smallestK(a, 4))).toEqual([5, 1, 3, 2]);
    expect(Array.from(smallestK(a, 10))).toEqual([5, 1, 3, 2, 0, 4]);
  });

  it('quantileOf on large arrays of clustered, equal and negative values equals the sorted quantile', () => {
    fc.assert(
      fc.property(
        fc.array(fc.oneof(fc.constant(2.5), fc.double({ min: -1e6, max: 1e6, noNaN: true }), fc.double({ min: 2, max: 2.0001, noNaN: true })), { minLength: 3000, maxLength: 6000 }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        (vals, q) => {
          const a = Float64Array.from(vals);
          expect(quantileOf(a, q)).toBe(quantileSorted(Float64Array.from(vals).sort(), q));
        },
      ),
      { numRuns: 60, seed: 4 },
    );
  });
});

describe('radixSort', () => {
  it('orders doubles as Float64Array.prototype.sort does (negatives, -0, ties, Infinity, subnormals)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.oneof(fc.double({ noNaN: true }), fc.constantFrom(0, -0, 1, -1, Infinity, -Infinity, 5e-324, -5e-324), fc.integer({ min: 0, max: 50 }).map((k) => k / 8)), { minLength: 2048, maxLength: 5000 }),
        (vals) => {
          const expected = Float64Array.from(vals).sort();
          const got = radixSort(Float64Array.from(vals));
          expect(Buffer.compare(Buffer.from(got.buffer), Buffer.from(expected.buffer))).toBe(0);
        },
      ),
      { numRuns: 40, seed: 11 },
    );
  });

  it('sorts a view with an offset into a larger buffer in place', () => {
    const buf = new Float64Array(10_000);
    for (let i = 0; i < buf.length; i++) buf[i] = Math.sin(i) * 1e3;
    const view = buf.subarray(100, 9_000);
    const expected = Float64Array.from(view).sort();
    expect(radixSort(view)).toBe(view);
    expect(Array.from(view)).toEqual(Array.from(expected));
    expect(buf[50]).toBe(Math.sin(50) * 1e3);
  });
});
