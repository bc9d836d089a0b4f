/** Stability intervals of classical Runge–Kutta methods against published values. */
import { describe, expect, test } from 'vitest';
import { analyseScheme } from '../../src/stability/index.js';

describe('real and imaginary stability intervals', () => {
  test('forward Euler: real interval 2, imaginary 0 (common practice: |1 + z| ≤ 1 is the unit disc at −1)', () => {
    const r = analyseScheme('euler', 'upwind1');
    expect(r.realInterval).toBeCloseTo(2, 10);
    expect(r.imagInterval).toBe(0);
  });

  test('Heun / SSP-RK2: real interval 2, imaginary 0 (common practice: |1 + iy − y²/2|² = 1 + y⁴/4)', () => {
    for (const name of ['heun', 'ssp-rk2']) {
      const r = analyseScheme(name, 'upwind1');
      expect(r.realInterval).toBeCloseTo(2, 10);
      expect(r.imagInterval).toBe(0);
    }
  });

  test('SSP-RK3: real 2.5127453 (Lambert, Numerical Methods for Ordinary Differential Systems, 1991; from memory), imaginary √3', () => {
    const r = analyseScheme('ssp-rk3', 'upwind1');
    expect(r.realInterval).toBeCloseTo(2.5127453, 6);
    // |R(iy)|² = 1 − y⁴/12 + y⁶/36 = 1 at y² = 3 (from memory, same source)
    expect(r.imagInterval).toBeCloseTo(Math.sqrt(3), 10);
  });

  test('classical RK4: real 2.7852936 (Lambert 1991; from memory), imaginary 2√2 (textbook)', () => {
    const r = analyseScheme('rk4', 'upwind1');
    expect(r.realInterval).toBeCloseTo(2.7852936, 6);
    expect(r.imagInterval).toBeCloseTo(2 * Math.SQRT2, 10);
  });
});

describe('diffusion number and central differences', () => {
  test('FTCS diffusion: ν·dt/dx² ≤ 1/2 (Press et al., Numerical Recipes, 2nd ed., §19.2)', () => {
    expect(analyseScheme('euler', 'central2').diffusion).toBeCloseTo(0.5, 10);
  });

  test('forward Euler with central differences has no stable step (Press et al. 1992, §19.1: FTCS advection is unstable)', () => {
    const r = analyseScheme('euler', 'central2');
    expect(r.courant).toBe(0);
    expect(r.status).not.toBe('stable');
  });

  test('RK4 with central differences: C = 2√2 (textbook: imaginary interval over max |sin θ| = 1)', () => {
    const r = analyseScheme('rk4', 'central2');
    expect(r.status).toBe('stable');
    expect(r.courant).toBeCloseTo(2 * Math.SQRT2, 9);
  });
});
