import { describe, expect, test } from 'vitest';
import fc from 'fast-check';
import { complexSqrt, eigenvalues, polynomialRoots, type ComplexValues } from '../../src/stability/eigen.js';
import { Rng } from '../../src/demo/random.js';

/** Greedy pairing of computed and expected eigenvalues; returns the largest distance. */
function mismatch(got: ComplexValues, want: [number, number][]): number {
  const used = new Set<number>();
  let worst = 0;
  for (const [wr, wi] of want) {
    let best = -1;
    let bd = Infinity;
    for (let j = 0; j < got.re.length; j++) {
      if (used.has(j)) continue;
      const d = Math.hypot(got.re[j]! - wr, got.im[j]! - wi);
      if (d < bd) { bd = d; best = j; }
    }
    used.add(best);
    worst = Math.max(worst, bd);
  }
  return worst;
}

/** Complex n×n product, row-major, separate real/imaginary parts. */
function mul(n: number, ar: Float64Array, ai: Float64Array, br: Float64Array, bi: Float64Array): [Float64Array, Float64Array] {
  const cr = new Float64Array(n * n);
  const ci = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      let sr = 0;
      let si = 0;
      for (let k = 0; k < n; k++) {
        sr += ar[i * n + k]! * br[k * n + j]! - ai[i * n + k]! * bi[k * n + j]!;
        si += ar[i * n + k]! * bi[k * n + j]! + ai[i * n + k]! * br[k * n + j]!;
      }
      cr[i * n + j] = sr;
      ci[i * n + j] = si;
    }
  }
  return [cr, ci];
}

describe('eigenvalues', () => {
  test('triangular matrices give their diagonal (common practice)', () => {
    const re = Float64Array.from([1, 5, -2, 0, 3, 7, 0, 0, -4]);
    const im = Float64Array.from([0.5, 1, 1, 0, -1, 2, 0, 0, 0]);
    expect(mismatch(eigenvalues(3, re, im), [[1, 0.5], [3, -1], [-4, 0]])).toBeLessThan(1e-12);
  });

  test('a plane rotation has eigenvalues ±i; a 1×1 matrix is its own eigenvalue', () => {
    expect(mismatch(eigenvalues(2, [0, -1, 1, 0], [0, 0, 0, 0]), [[0, 1], [0, -1]])).toBeLessThan(1e-14);
    expect(mismatch(eigenvalues(1, [2.5], [-1]), [[2.5, -1]])).toBe(0);
  });

  test('S·D·S⁻¹ with a unitary S built from a Householder reflection returns D (n = 3…12)', () => {
    const rng = new Rng(7);
    for (const n of [3, 5, 8, 12]) {
      const d: [number, number][] = Array.from({ length: n }, () => [4 * rng.next() - 2, 4 * rng.next() - 2]);
      // S = I − 2vv^H/(v^H v) is unitary and Hermitian, so S⁻¹ = S.
      const vr = Array.from({ length: n }, () => rng.next() - 0.5);
      const vi = Array.from({ length: n }, () => rng.next() - 0.5);
      const vv = vr.reduce((s, x, i) => s + x * x + vi[i]! * vi[i]!, 0);
      const sr = new Float64Array(n * n);
      const si = new Float64Array(n * n);
      for (let i = 0; i < n; i++) {
        for (let j = 0; j < n; j++) {
          sr[i * n + j] = (i === j ? 1 : 0) - (2 * (vr[i]! * vr[j]! + vi[i]! * vi[j]!)) / vv;
          si[i * n + j] = (-2 * (vi[i]! * vr[j]! - vr[i]! * vi[j]!)) / vv;
        }
      }
      const dr = new Float64Array(n * n);
      const di = new Float64Array(n * n);
      d.forEach(([a, b], i) => { dr[i * n + i] = a; di[i * n + i] = b; });
      const [tr, ti] = mul(n, sr, si, dr, di);
      const [ar, ai] = mul(n, tr, ti, sr, si);
      expect(mismatch(eigenvalues(n, ar, ai), d)).toBeLessThan(1e-11);
    }
  });

  test('a defective Jordan block is found to about the square root of machine precision', () => {
    expect(mismatch(eigenvalues(2, [2, 1, 0, 2], [0, 0, 0, 0]), [[2, 0], [2, 0]])).toBeLessThan(1e-7);
  });

  test('sum of eigenvalues = trace and sum of squares = trace(A²) for random complex matrices', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 9 }), fc.array(fc.double({ min: -10, max: 10, noNaN: true }), { minLength: 162, maxLength: 162 }), (n, vals) => {
        const ar = Float64Array.from(vals.slice(0, n * n));
        const ai = Float64Array.from(vals.slice(81, 81 + n * n));
        const ev = eigenvalues(n, ar, ai);
        const [a2r, a2i] = mul(n, ar, ai, ar, ai);
        let tr = 0, ti = 0, t2r = 0, t2i = 0, er = 0, ei = 0, e2r = 0, e2i = 0, size = 1;
        for (let i = 0; i < n; i++) {
          tr += ar[i * n + i]!; ti += ai[i * n + i]!;
          t2r += a2r[i * n + i]!; t2i += a2i[i * n + i]!;
          er += ev.re[i]!; ei += ev.im[i]!;
          e2r += ev.re[i]! ** 2 - ev.im[i]! ** 2; e2i += 2 * ev.re[i]! * ev.im[i]!;
        }
        for (let q = 0; q < n * n; q++) size += Math.abs(ar[q]!) + Math.abs(ai[q]!);
        expect(Math.hypot(er - tr, ei - ti)).toBeLessThan(1e-9 * size);
        expect(Math.hypot(e2r - t2r, e2i - t2i)).toBeLessThan(1e-9 * size * size);
      }),
      { numRuns: 200, seed: 11 },
    );
  });

  test('badly scaled matrices (subnormal and 1e-170 entries) still converge', () => {
    const tiny = eigenvalues(2, [0, 0, -1.0612523586993519e-170, -2.0043949433167635e-173], [0, 0, 0, 0]);
    expect(mismatch(tiny, [[0, 0], [-2.0043949433167635e-173, 0]])).toBeLessThan(1e-185);
    const re = new Float64Array(9);
    const im = new Float64Array(9);
    re[1] = -6.402484996047776e-5; re[3] = 3e-323; im[3] = 4e-323; im[6] = 0.020227560050568902;
    // Only the product a01·a10 (subnormal) couples the entries: all three eigenvalues are ~0.
    expect(mismatch(eigenvalues(3, re, im), [[0, 0], [0, 0], [0, 0]])).toBeLessThan(1e-15);
  });

  test('rejects non-finite entries and short arrays', () => {
    expect(() => eigenvalues(2, [1, NaN, 0, 1], [0, 0, 0, 0])).toThrow(/non-finite/);
    expect(() => eigenvalues(3, [1, 2], [0, 0])).toThrow(/shorter/);
  });
});

describe('polynomialRoots', () => {
  test('(z − 1)(z − 2)(z − 3i) = z³ − (3+3i)z² + (2+9i)z − 6i', () => {
    const roots = polynomialRoots([0, 2, -3, 1], [-6, 9, -3, 0]);
    expect(mismatch(roots, [[1, 0], [2, 0], [0, 3]])).toBeLessThan(1e-12);
  });

  test('z⁵ − 1: the fifth roots of unity; trailing zero coefficients are dropped', () => {
    const want: [number, number][] = Array.from({ length: 5 }, (_, k) => [Math.cos((2 * Math.PI * k) / 5), Math.sin((2 * Math.PI * k) / 5)]);
    expect(mismatch(polynomialRoots([-1, 0, 0, 0, 0, 1, 0], [0, 0, 0, 0, 0, 0, 0]), want)).toBeLessThan(1e-12);
    expect(polynomialRoots([3], [0]).re.length).toBe(0);
  });

  test('complexSqrt squares back (common practice)', () => {
    for (const [a, b] of [[4, 0], [-4, 0], [0, 2], [-3, -4], [1e-300, 0]] as const) {
      const [x, y] = complexSqrt(a, b);
      expect(x).toBeGreaterThanOrEqual(0);
      expect(x * x - y * y).toBeCloseTo(a, 12);
      expect(2 * x * y).toBeCloseTo(b, 12);
    }
  });
});
