import { describe, expect, test } from 'vitest';
import { derivativeWeights, stencil, stencilDissipation, stencilSymbol, STENCIL_OFFSETS } from '../../src/stability/stencil.js';
import { dgDissipation, dgMatrix, dgSpectrum } from '../../src/stability/dg.js';
import { eigenvalues } from '../../src/stability/eigen.js';
import { SPACE_OPERATORS, spaceOperator } from '../../src/stability/operators.js';
import { UsageError } from '../../src/mesh/errors.js';

describe('finite-difference stencils', () => {
  // Textbook first-derivative weights (common practice; e.g. Fornberg, Math. Comp. 51, 1988, Table 1).
  const textbook: Record<string, number[]> = {
    upwind1: [-1, 1],
    central2: [-1 / 2, 1 / 2],
    upwind2: [1 / 2, -2, 3 / 2],
    upwind3: [1 / 6, -1, 1 / 2, 1 / 3],
    central4: [1 / 12, -2 / 3, 2 / 3, -1 / 12],
    upwind5: [-1 / 30, 1 / 4, -1, 1 / 3, 1 / 2, -1 / 20],
    central6: [-1 / 60, 3 / 20, -3 / 4, 3 / 4, -3 / 20, 1 / 60],
  };
  test.each(Object.keys(textbook))('%s has the textbook weights', (name) => {
    const w = stencil(name)!.weights;
    textbook[name]!.forEach((v, i) => expect(w[i]).toBeCloseTo(v, 14));
  });

  test('weights differentiate every polynomial of degree < number of points exactly', () => {
    for (const offsets of [[-3, -1, 0, 2, 5], [0, 1, 2, 3], [-2, 2]]) {
      const w = derivativeWeights(offsets);
      for (let p = 0; p < offsets.length; p++) {
        const d = w.reduce((acc, wj, j) => acc + wj * offsets[j]! ** p, 0);
        expect(d).toBeCloseTo(p === 1 ? 1 : 0, 12);
      }
    }
  });

  test('symbols: upwind1 gives e^{−iθ} − 1 and central2 gives −i sin θ (common practice)', () => {
    for (const theta of [0.3, 1, 2.5, Math.PI]) {
      const [ur, ui] = stencilSymbol(stencil('upwind1')!, theta);
      expect(ur).toBeCloseTo(Math.cos(theta) - 1, 14);
      expect(ui).toBeCloseTo(-Math.sin(theta), 14);
      const [cr, ci] = stencilSymbol(stencil('central2')!, theta);
      expect(cr).toBe(0);
      expect(ci).toBeCloseTo(-Math.sin(theta), 14);
    }
  });

  test('every stencil is consistent: λ(θ) = −iθ + O(θ^{q+1}) with q its order', () => {
    const order: Record<string, number> = { upwind1: 1, central2: 2, upwind2: 2, upwind3: 3, central4: 4, upwind5: 5, central6: 6 };
    for (const name of Object.keys(STENCIL_OFFSETS)) {
      const q = order[name]!;
      const errAt = (t: number) => {
        const [re, im] = stencilSymbol(stencil(name)!, t);
        return Math.hypot(re, im + t);
      };
      // Halving θ divides the error by about 2^{q+1}.
      const ratio = errAt(0.1) / errAt(0.05);
      expect(Math.log2(ratio)).toBeCloseTo(q + 1, 0);
    }
  });

  test('leading dissipation Re λ ≈ −Dθ^{2n} agrees with the symbol at small θ', () => {
    // upwind1: 1 − cos θ ≈ θ²/2; upwind2: (1 − cos θ)² ≈ θ⁴/4; upwind3: (1 − cos θ)²/3 ≈ θ⁴/12 (common practice)
    expect(stencilDissipation(stencil('upwind1')!)).toEqual({ power: 2, dissipation: expect.closeTo(1 / 2, 12) });
    expect(stencilDissipation(stencil('upwind2')!)).toEqual({ power: 4, dissipation: expect.closeTo(1 / 4, 12) });
    expect(stencilDissipation(stencil('upwind3')!)).toEqual({ power: 4, dissipation: expect.closeTo(1 / 12, 12) });
    for (const name of ['upwind1', 'upwind2', 'upwind3', 'upwind5']) {
      const s = stencil(name)!;
      const { power, dissipation } = stencilDissipation(s);
      const theta = 1e-2;
      expect(-stencilSymbol(s, theta)[0] / theta ** power / dissipation).toBeCloseTo(1, 3);
    }
    for (const name of ['central2', 'central4', 'central6']) expect(stencilDissipation(stencil(name)!)).toEqual({ power: Infinity, dissipation: 0 });
  });
});

/** Padé approximant P/Q of e^z of type (L, M) (common practice: Hairer & Wanner, Solving ODEs II, §IV.3). */
function pade(L: number, M: number): { P: number[]; Q: number[] } {
  const f = (n: number): number => (n <= 1 ? 1 : n * f(n - 1));
  const P = Array.from({ length: L + 1 }, (_, j) => (f(L + M - j) * f(L)) / (f(L + M) * f(j) * f(L - j)));
  const Q = Array.from({ length: M + 1 }, (_, j) => ((-1) ** j * f(L + M - j) * f(M)) / (f(L + M) * f(j) * f(M - j)));
  return { P, Q };
}

function polyAt(c: number[], zr: number, zi: number): [number, number] {
  let pr = 0;
  let pi = 0;
  for (let k = c.length - 1; k >= 0; k--) {
    const t = pr * zr - pi * zi + c[k]!;
    pi = pr * zi + pi * zr;
    pr = t;
  }
  return [pr, pi];
}

describe('DG with upwind flux', () => {
  test('degree 0 is the first-order upwind scheme', () => {
    const re = new Float64Array(1);
    const im = new Float64Array(1);
    for (const theta of [0.2, 1.3, Math.PI]) {
      dgSpectrum(0, theta, re, im, 0);
      expect(re[0]).toBeCloseTo(Math.cos(theta) - 1, 14);
      expect(im[0]).toBeCloseTo(-Math.sin(theta), 14);
    }
  });

  test('every eigenvalue satisfies the Padé dispersion relation P(−λ) = e^{iθ} Q(−λ), degrees 0…6', () => {
    // The cell update is DG time stepping of U' = −λU across the cell, whose outflow/inflow ratio is
    // the (k, k+1) Padé approximant of e^{−λ} (Lesaint & Raviart 1974, from memory).
    for (let k = 0; k <= 6; k++) {
      const { P, Q } = pade(k, k + 1);
      for (const theta of [0, 0.4, 1.7, 3]) {
        const M = dgMatrix(k, theta);
        const ev = eigenvalues(k + 1, M.re, M.im);
        for (let j = 0; j <= k; j++) {
          const [pr, pi] = polyAt(P, -ev.re[j]!, -ev.im[j]!);
          const [qr, qi] = polyAt(Q, -ev.re[j]!, -ev.im[j]!);
          const er = Math.cos(theta) * qr - Math.sin(theta) * qi;
          const ei = Math.cos(theta) * qi + Math.sin(theta) * qr;
          expect(Math.hypot(pr - er, pi - ei)).toBeLessThan(1e-9 * (Math.hypot(pr, pi) + Math.hypot(qr, qi)));
        }
      }
    }
  });

  test('θ = 0 keeps the cell mean (one zero eigenvalue); all others are damped', () => {
    for (let k = 0; k <= 6; k++) {
      const M = dgMatrix(k, 0);
      const ev = eigenvalues(k + 1, M.re, M.im);
      const mags = Array.from(ev.re, (r, j) => Math.hypot(r, ev.im[j]!)).sort((a, b) => a - b);
      expect(mags[0]).toBeLessThan(1e-10);
      for (let j = 0; j <= k; j++) if (Math.hypot(ev.re[j]!, ev.im[j]!) > 1e-10) expect(ev.re[j]).toBeLessThan(0);
    }
  });

  test('dissipation of the physical branch Re λ ≈ −Dθ^{2k+2} matches the spectrum (k = 0, 1, 2)', () => {
    for (const [k, theta] of [[0, 1e-3], [1, 0.02], [2, 0.1]] as const) {
      const { power, dissipation } = dgDissipation(k);
      expect(power).toBe(2 * k + 2);
      const re = new Float64Array(k + 1);
      const im = new Float64Array(k + 1);
      dgSpectrum(k, theta, re, im, 0);
      let j = 0;
      for (let q = 1; q <= k; q++) if (Math.hypot(re[q]!, im[q]!) < Math.hypot(re[j]!, im[j]!)) j = q;
      expect(-re[j]! / theta ** power / dissipation).toBeCloseTo(1, 2);
      expect(im[j]! / -theta).toBeCloseTo(1, 6);
    }
    // k = 1: e^z − P/Q ≈ z⁴/72 (common practice), so D = 1/72.
    expect(dgDissipation(1).dissipation).toBeCloseTo(1 / 72, 15);
  });
});

describe('operator registry', () => {
  test('lists the stencils and dg0 … dg6; names are case-insensitive', () => {
    expect(SPACE_OPERATORS).toEqual(['upwind1', 'central2', 'upwind2', 'upwind3', 'central4', 'upwind5', 'central6', 'dg0', 'dg1', 'dg2', 'dg3', 'dg4', 'dg5', 'dg6']);
    expect(spaceOperator('DG3').size).toBe(4);
    expect(spaceOperator(' Upwind3 ').name).toBe('upwind3');
  });

  test('unknown names throw a UsageError listing the known ones', () => {
    for (const bad of ['dg7', 'upwind4', '', 'weno5']) {
      expect(() => spaceOperator(bad)).toThrow(UsageError);
      expect(() => spaceOperator(bad)).toThrow(/known: upwind1, central2.*dg6/);
    }
  });
});
