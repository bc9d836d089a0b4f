import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { quantileOf, quantileSorted, smallestK } from '../../src/audit/stats.js';

describe('statistics without sorting', () => {
  it('quantileOf equals the quantile of the sorted values (random arrays with ties and Infinity)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.oneof(fc.integer({ min: 0, max: 5 }).map((k) => k / 4), fc.double({ min: 0, max: 10, noNaN: true }), fc.constant(Infinity)), { minLength: 0, maxLength: 300 }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        (vals, q) => {
          const a = Float64Array.from(vals);
          const finite = Float64Array.from(vals.filter((v) => v < Infinity)).sort();
          expect(quantileOf(a, q, (v) => v < Infinity)).toBe(quantileSorted(finite, q));
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
});
