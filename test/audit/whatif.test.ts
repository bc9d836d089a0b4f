/** What remeshing would buy: the k → limit curve and the gain table, against hand values and a brute force. */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { CURVE_STEP, lowerBound, remeshCurve } from '../../src/audit/whatif.js';

const sortedOf = (xs: number[]) => Float64Array.from(xs.filter((x) => x < Infinity)).sort();

describe('remeshCurve', () => {
  it('a handful of cells with known steps: the curve and the k for each gain', () => {
    // per-cell steps 4, 1, 2, 1.2, 8, 3 and one unlimited cell; sorted: 1, 1.2, 2, 3, 4, 8
    const w = remeshCurve(sortedOf([4, 1, 2, 1.2, 8, 3, Infinity]), [1.5, 2, 4, 10])!;
    expect(w.reference_dt).toBe(1);
    expect(w.zero_cells).toBe(0);
    // ×1.5: the cells 1 and 1.2 must go, then the limit is 2; ×2 the same; ×4: four cells go (1, 1.2, 2, 3)
    expect(w.gains).toEqual([
      { gain: 1.5, cells: 2, dt: 2 },
      { gain: 2, cells: 2, dt: 2 },
      { gain: 4, cells: 4, dt: 4 },
      { gain: 10, cells: null, dt: null },
    ]);
    // every rise here is above 2%, and ×10 is never reached: the whole staircase
    expect(w.curve).toEqual([[0, 1], [1, 1.2], [2, 2], [3, 3], [4, 4], [5, 8]]);
  });

  it('zero-step (degenerate) cells come first; gains are against the first positive step', () => {
    const w = remeshCurve(sortedOf([5, 0, 10, 0]), [2])!;
    expect(w.zero_cells).toBe(2);
    expect(w.reference_dt).toBe(5);
    expect(w.gains).toEqual([{ gain: 2, cells: 3, dt: 10 }]);
    expect(w.curve).toEqual([[0, 0], [2, 5], [3, 10]]);
    expect(remeshCurve(sortedOf([0, 0]))).toBeNull();
    expect(remeshCurve(new Float64Array(0))).toBeNull();
  });

  it('stops at the largest gain asked and keeps only rises of 2% or more', () => {
    // 1000 steps rising by 0.5% each: dt_k = 1.005^k; ×2 first at k = ⌈ln 2 / ln 1.005⌉ = 139
    const s = Float64Array.from({ length: 1000 }, (_, k) => 1.005 ** k);
    const w = remeshCurve(s, [2])!;
    expect(w.gains[0]!.cells).toBe(Math.ceil(Math.log(2) / Math.log(1.005)));
    const last = w.curve[w.curve.length - 1]!;
    expect(last[0]).toBe(w.gains[0]!.cells);
    for (let i = 1; i < w.curve.length - 1; i++) expect(w.curve[i]![1] / w.curve[i - 1]![1]).toBeGreaterThanOrEqual(CURVE_STEP);
    expect(w.curve.length).toBeLessThan(40); // about log(2)/log(1.02) = 35 points, not 139
  });

  it('property: every breakpoint and table row is the limit of the remaining cells (brute force)', () => {
    fc.assert(fc.property(
      fc.array(fc.oneof(fc.constant(0), fc.double({ min: 1e-3, max: 1e3, noNaN: true }), fc.constant(Infinity)), { minLength: 1, maxLength: 60 }),
      fc.array(fc.double({ min: 1.01, max: 50, noNaN: true }), { minLength: 1, maxLength: 4 }),
      (dts, gains) => {
        const w = remeshCurve(sortedOf(dts), gains);
        const positive = dts.filter((x) => x > 0 && x < Infinity);
        if (positive.length === 0) { expect(w).toBeNull(); return; }
        // limit once the k worst are gone, by brute force: drop the k smallest of a fresh copy each time
        const limitAfter = (k: number) => Math.min(...dts.slice().sort((a, b) => a - b).slice(k));
        const ref = Math.min(...positive);
        expect(w!.reference_dt).toBe(ref);
        for (const [k, dt] of w!.curve) expect(dt).toBe(limitAfter(k));
        for (const row of w!.gains) {
          if (row.cells === null) { expect(Math.max(...positive)).toBeLessThan(row.gain * ref); continue; }
          expect(row.dt).toBe(limitAfter(row.cells));
          expect(row.dt!).toBeGreaterThanOrEqual(row.gain * ref);
          expect(limitAfter(row.cells - 1)).toBeLessThan(row.gain * ref);
        }
      },
    ), { numRuns: 200 });
  });

  it('lowerBound finds the first value at or above', () => {
    const s = Float64Array.of(1, 2, 2, 3);
    expect([0.5, 1, 2, 2.5, 3, 4].map((v) => lowerBound(s, v))).toEqual([0, 0, 1, 3, 3, 4]);
  });
});
