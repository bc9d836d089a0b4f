import { describe, expect, test } from 'vitest';
import { builtInTableau, parseTableau, TIME_INTEGRATORS, validateTableau, type Tableau } from '../../src/stability/tableau.js';
import { abs2, imaginaryAxisGrowth, stabilityPolynomial } from '../../src/stability/polynomial.js';
import { UsageError } from '../../src/mesh/errors.js';
import { amplification } from './support.js';

const tab = (name: string): Tableau => builtInTableau(name)!;

/** Butcher's order conditions up to order 4 (common practice: Butcher, Numerical Methods for ODEs, 2008, §3). */
function orderResiduals(t: Tableau): number[] {
  const s = t.b.length;
  const { A, b, c } = t;
  const Ac = (i: number) => A[i]!.reduce((acc, a, j) => acc + a * c[j]!, 0);
  const Ac2 = (i: number) => A[i]!.reduce((acc, a, j) => acc + a * c[j]! ** 2, 0);
  const AAc = (i: number) => A[i]!.reduce((acc, a, j) => acc + a * Ac(j), 0);
  const sum = (f: (i: number) => number) => Array.from({ length: s }, (_, i) => f(i)).reduce((x, y) => x + y, 0);
  return [
    sum((i) => b[i]!) - 1,
    sum((i) => b[i]! * c[i]!) - 1 / 2,
    sum((i) => b[i]! * c[i]! ** 2) - 1 / 3,
    sum((i) => b[i]! * Ac(i)) - 1 / 6,
    sum((i) => b[i]! * c[i]! ** 3) - 1 / 4,
    sum((i) => b[i]! * c[i]! * Ac(i)) - 1 / 8,
    sum((i) => b[i]! * Ac2(i)) - 1 / 12,
    sum((i) => b[i]! * AAc(i)) - 1 / 24,
  ];
}

const ORDER: Record<string, number> = { euler: 1, heun: 2, 'ssp-rk2': 2, 'ssp-rk3': 3, rk4: 4, 'ssp-rk54': 4, lsrk54: 4 };
const CONDITIONS_UP_TO = [0, 1, 2, 4, 8];

describe('built-in tableaux', () => {
  test('the list names every built-in, and names are case-insensitive', () => {
    expect(TIME_INTEGRATORS.sort()).toEqual(Object.keys(ORDER).sort());
    expect(builtInTableau(' RK4 ')).toEqual(tab('rk4'));
    expect(builtInTableau('rk5')).toBeUndefined();
  });

  test.each(Object.entries(ORDER))('%s is explicit, consistent and satisfies the order-%i conditions', (name, p) => {
    const t = tab(name);
    expect(() => validateTableau(t, name)).not.toThrow();
    const res = orderResiduals(t);
    // The Shu–Osher and 2N-storage conversions are checked here: published to 12–15 digits.
    for (let q = 0; q < CONDITIONS_UP_TO[p]!; q++) expect(Math.abs(res[q]!)).toBeLessThan(1e-11);
    if (p < 4) expect(Math.max(...res.slice(CONDITIONS_UP_TO[p]!, CONDITIONS_UP_TO[p + 1]!).map(Math.abs))).toBeGreaterThan(1e-3);
  });

  test('the 2N-storage conversion gives the nodes c printed by Carpenter & Kennedy (NASA TM-109112, 1994; values from memory)', () => {
    const c = tab('lsrk54').c;
    const published = [0, 1432997174477 / 9575080441755, 2526269341429 / 6820363962896, 2006345519317 / 3224310063776, 2802321613138 / 2924317926251];
    published.forEach((v, i) => expect(c[i]).toBeCloseTo(v, 11));
  });
});

describe('stability polynomial', () => {
  test('ν-stage methods of order ν ≤ 4 give the truncated exponential Σ z^k/k! (common practice)', () => {
    for (const [name, p] of [['euler', 1], ['heun', 2], ['ssp-rk2', 2], ['ssp-rk3', 3], ['rk4', 4]] as const) {
      const r = stabilityPolynomial(tab(name));
      expect(r.length).toBe(p + 1);
      let f = 1;
      r.forEach((v, k) => {
        if (k > 0) f *= k;
        expect(v).toBeCloseTo(1 / f, 14);
      });
    }
  });

  test('the five-stage fourth-order methods agree with e^z to z⁴ and have a fifth-degree term', () => {
    for (const name of ['ssp-rk54', 'lsrk54']) {
      const r = stabilityPolynomial(tab(name));
      expect(r.length).toBe(6);
      [1, 1, 1 / 2, 1 / 6, 1 / 24].forEach((v, k) => expect(r[k]).toBeCloseTo(v, 11));
      expect(r[5]).toBeGreaterThan(0);
      expect(r[5]).toBeLessThan(1 / 120);
    }
  });

  test('|R(z)| matches the tableau stepped on y’ = zy stage by stage', () => {
    const zs = [[-1, 0], [0, 1.5], [-2.3, 1.1], [0.4, -2], [-3, -3]];
    for (const name of TIME_INTEGRATORS) {
      const t = tab(name);
      const r = stabilityPolynomial(t);
      for (const [x, y] of zs) {
        const [ar, ai] = amplification(t, x!, y!);
        expect(Math.sqrt(abs2(r, x!, y!))).toBeCloseTo(Math.hypot(ar, ai), 12);
      }
    }
  });

  test('growth along the imaginary axis near 0: Euler y², Heun y⁴/4 (γ > 0); RK3 and RK4 inside (γ < 0)', () => {
    // |1 + iy|² = 1 + y²; |1 + iy − y²/2|² = 1 + y⁴/4; RK3: 1 − y⁴/12 + …; RK4: 1 − y⁶/72 + … (common practice)
    expect(imaginaryAxisGrowth(stabilityPolynomial(tab('euler')))).toEqual({ m: 1, gamma: 1 });
    expect(imaginaryAxisGrowth(stabilityPolynomial(tab('heun')))).toEqual({ m: 2, gamma: 0.25 });
    const rk3 = imaginaryAxisGrowth(stabilityPolynomial(tab('ssp-rk3')));
    expect(rk3.m).toBe(2);
    expect(rk3.gamma).toBeCloseTo(-1 / 12, 14);
    const rk4 = imaginaryAxisGrowth(stabilityPolynomial(tab('rk4')));
    expect(rk4.m).toBe(3);
    expect(rk4.gamma).toBeCloseTo(-1 / 72, 14);
  });
});

describe('parseTableau', () => {
  const rk4Json = JSON.stringify({ A: [[0, 0, 0, 0], ['1/2', 0, 0, 0], [0, 0.5, 0, 0], [0, 0, 1, 0]], b: ['1/6', '1/3', '1/3', '1/6'], c: [0, 0.5, 0.5, 1] });

  test('a JSON tableau with fractions reproduces the built-in RK4; "c" may be omitted', () => {
    const t = parseTableau(rk4Json, 'rk4.json');
    expect(Array.from(stabilityPolynomial(t))).toEqual(Array.from(stabilityPolynomial(tab('rk4'))));
    const noC = parseTableau(JSON.stringify({ A: [[0, 0], [1, 0]], b: [0.5, 0.5] }), 'heun.json');
    expect(noC.c).toEqual([0, 1]);
  });

  const bad: [string, unknown, RegExp][] = [
    ['implicit (diagonal entry)', { A: [[0.5, 0], [0.5, 0]], b: [0.5, 0.5], c: [0.5, 0.5] }, /A\[1\]\[1\].*explicit/],
    ['upper triangular entry', { A: [[0, 1], [1, 0]], b: [0.5, 0.5], c: [1, 1] }, /A\[1\]\[2\].*explicit/],
    ['inconsistent c', { A: [[0, 0], [1, 0]], b: [0.5, 0.5], c: [0, 0.9] }, /c\[2\] = 0\.9.*adds up to 1/],
    ['weights not summing to 1', { A: [[0, 0], [1, 0]], b: [0.5, 0.4], c: [0, 1] }, /add up to 0\.9/],
    ['non-square A', { A: [[0, 0], [1]], b: [0.5, 0.5], c: [0, 1] }, /square/],
    ['b of the wrong size', { A: [[0, 0], [1, 0]], b: [1], c: [0, 1] }, /"b" has 1 entries/],
    ['a non-numeric entry', { A: [[0, 0], ['x', 0]], b: [0.5, 0.5] }, /A\[2\]\[1\].*number or a fraction/],
    ['missing A', { b: [1] }, /"A"/],
    ['an empty tableau', { A: [], b: [] }, /empty/],
  ];
  test.each(bad)('rejects %s with a UsageError naming the file', (_, doc, message) => {
    const run = () => parseTableau(JSON.stringify(doc), 'mine.json');
    expect(run).toThrow(UsageError);
    expect(run).toThrow(message);
    expect(run).toThrow(/^mine\.json: /);
  });

  test('rejects text that is not JSON, or JSON that is not an object', () => {
    expect(() => parseTableau('{"A": [[0]', 'x.json')).toThrow(/x\.json: not valid JSON/);
    expect(() => parseTableau('[1, 2]', 'x.json')).toThrow(/x\.json: expected a JSON object/);
  });
});
