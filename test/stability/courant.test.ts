import { describe, expect, test } from 'vitest';
import { analyseScheme, courantLimit, SPACE_OPERATORS, TIME_INTEGRATORS } from '../../src/stability/index.js';
import { builtInTableau, type Tableau } from '../../src/stability/tableau.js';
import { spaceOperator, type SpaceOperator } from '../../src/stability/operators.js';
import { stabilityPolynomial } from '../../src/stability/polynomial.js';
import { UsageError } from '../../src/mesh/errors.js';
import { amplification } from './support.js';

/** max over a fine θ grid and all eigenvalues of |R(σλ)|, with R applied stage by stage. */
function worstGrowth(t: Tableau, op: SpaceOperator, sigma: number, samples = 3001, thetaMax = Math.PI): number {
  const re = new Float64Array(op.size);
  const im = new Float64Array(op.size);
  let worst = 0;
  for (let i = 0; i < samples; i++) {
    op.spectrum((thetaMax * i) / (samples - 1), re, im, 0);
    for (let j = 0; j < op.size; j++) {
      const [ar, ai] = amplification(t, sigma * re[j]!, sigma * im[j]!);
      worst = Math.max(worst, Math.hypot(ar, ai));
    }
  }
  return worst;
}

describe('analyseScheme', () => {
  test('names are case-insensitive; unknown names throw a UsageError listing the known ones', () => {
    const r = analyseScheme('RK4', 'Upwind1');
    expect(r.time).toBe('rk4');
    expect(r.space).toBe('upwind1');
    expect(() => analyseScheme('rk5', 'upwind1')).toThrow(UsageError);
    expect(() => analyseScheme('rk5', 'upwind1')).toThrow(new RegExp(`known: ${TIME_INTEGRATORS.join(', ')}`));
    expect(() => analyseScheme('rk4', 'spectral')).toThrow(/known: .*dg0, dg1/);
    expect(SPACE_OPERATORS).toContain('dg6');
  });

  test('forward Euler with first-order upwind: C = 1 (the CFL condition, common practice)', () => {
    const r = analyseScheme('euler', 'upwind1');
    expect(r.status).toBe('stable');
    expect(r.courant).toBeCloseTo(1, 10);
    expect(r.diffusion).toBeCloseTo(0.5, 10);
  });

  test('central differences in space take the imaginary interval: RK4 2√2, SSP-RK3 √3 (common practice)', () => {
    expect(analyseScheme('rk4', 'central2').courant).toBeCloseTo(2 * Math.SQRT2, 9);
    expect(analyseScheme('ssp-rk3', 'central2').courant).toBeCloseTo(Math.sqrt(3), 9);
    // central4: max |λ| = max (8 sin θ − sin 2θ)/6, reached where 8 cos θ = 2 cos 2θ, cos θ = 1 − √6/2
    const c = 1 - Math.sqrt(6) / 2;
    const s = Math.sqrt(1 - c * c);
    expect(analyseScheme('rk4', 'central4').courant).toBeCloseTo((2 * Math.SQRT2 * 6) / (8 * s - 2 * s * c), 8);
  });

  test.each([
    ['euler', 'central2'],
    ['heun', 'central4'],
    ['ssp-rk2', 'central6'],
    ['euler', 'upwind2'],
    ['euler', 'upwind3'],
    ['euler', 'dg1'],
    ['ssp-rk2', 'dg2'],
    ['heun', 'upwind5'],
  ])('%s with %s has no stable step: courant 0, weakly-unstable', (time, space) => {
    const r = analyseScheme(time, space);
    expect(r.courant).toBe(0);
    expect(r.status).toBe('weakly-unstable');
  });

  test('…and the instability is real: long waves grow at every σ tried, by O(σ^p) with p ≥ 2', () => {
    for (const [time, space] of [['euler', 'central2'], ['euler', 'upwind3'], ['heun', 'central4'], ['ssp-rk2', 'dg2']] as const) {
      const t = builtInTableau(time)!;
      const op = spaceOperator(space);
      const small = worstGrowth(t, op, 0.03, 5001, 0.5) - 1;
      const large = worstGrowth(t, op, 0.1, 5001, 0.5) - 1;
      expect(small).toBeGreaterThan(0);
      expect(large / small).toBeGreaterThan(0.9 * (0.1 / 0.03) ** 2);
    }
  });

  test('a spectrum reaching into Re λ > 0 (downwind differences) is unstable', () => {
    const downwind: SpaceOperator = {
      name: 'downwind1',
      size: 1,
      spectrum: (theta, re, im, o) => { re[o] = 1 - Math.cos(theta); im[o] = -Math.sin(theta); },
      smallTheta: { power: 2, dissipation: -0.5 },
    };
    expect(courantLimit(stabilityPolynomial(builtInTableau('rk4')!), downwind)).toMatchObject({ courant: 0, status: 'unstable' });
  });

  test('heun and ssp-rk2 are the same polynomial and give the same numbers', () => {
    for (const space of ['upwind3', 'dg1']) {
      const a = analyseScheme('heun', space);
      const b = analyseScheme('ssp-rk2', space);
      expect(a.courant).toBeCloseTo(b.courant, 12);
    }
  });

  test('the limit is tight: stable at 0.999σ and growing at 1.001σ (checked stage by stage on 3001 θ)', () => {
    for (const [time, space] of [['rk4', 'upwind3'], ['ssp-rk3', 'dg2'], ['lsrk54', 'upwind5'], ['ssp-rk54', 'dg1'], ['heun', 'upwind2']] as const) {
      const r = analyseScheme(time, space);
      const t = builtInTableau(time)!;
      const op = spaceOperator(space);
      expect(worstGrowth(t, op, 0.999 * r.courant)).toBeLessThanOrEqual(1 + 1e-9);
      expect(worstGrowth(t, op, 1.001 * r.courant)).toBeGreaterThan(1 + 1e-7);
      expect(r.worstTheta).toBeGreaterThanOrEqual(0);
      expect(r.worstTheta).toBeLessThanOrEqual(Math.PI);
    }
  });

  test('a tableau object is accepted and matches the built-in; an invalid one is refused', () => {
    const t = builtInTableau('ssp-rk3')!;
    const r = analyseScheme(t, 'upwind3');
    expect(r.time).toBe('custom');
    expect(r.courant).toBeCloseTo(analyseScheme('ssp-rk3', 'upwind3').courant, 12);
    expect(() => analyseScheme({ A: [[1]], b: [1], c: [1] }, 'upwind1')).toThrow(/explicit/);
  });

  test('s forward-Euler substeps as one s-stage tableau: R = (1 + z/s)^s, so C = s with upwind1 (s = 8)', () => {
    const s = 8;
    const A = Array.from({ length: s }, (_, i) => Array.from({ length: s }, (_, j) => (j < i ? 1 / s : 0)));
    const t: Tableau = { A, b: new Array<number>(s).fill(1 / s), c: A.map((row) => row.reduce((x, y) => x + y, 0)) };
    const r = analyseScheme(t, 'upwind1');
    expect(r.courant).toBeCloseTo(s, 8);
    expect(r.realInterval).toBeCloseTo(2 * s, 8);
    expect(r.imagInterval).toBe(0);
    expect(analyseScheme(t, 'central2').status).toBe('weakly-unstable');
  });

  test('one pairing takes well under a second (DG degree 6 with a five-stage method)', () => {
    analyseScheme('lsrk54', 'dg6');
    const times: number[] = [];
    for (let i = 0; i < 3; i++) {
      const t0 = performance.now();
      analyseScheme('lsrk54', 'dg6');
      times.push(performance.now() - t0);
    }
    expect(Math.min(...times)).toBeLessThan(1000);
  });
});
