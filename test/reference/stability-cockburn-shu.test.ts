/**
 * RKDG CFL numbers against Cockburn & Shu, "Runge–Kutta discontinuous Galerkin methods for
 * convection-dominated problems", J. Sci. Comput. 16(3):173–261 (2001), Table 2.2 (CFL numbers
 * for P^k DG with ν-stage order-ν Runge–Kutta, truncated to three decimals; "*" = not stable).
 * Values: those quoted in our brief, completed from public copies of the table in DG codes
 * (found with the search tool; two independent copies agree).
 * ν = 2 is SSP-RK2, ν = 3 SSP-RK3, ν = 4 classical RK4: every ν-stage order-ν method with ν ≤ 4
 * has R(z) = Σ_{j≤ν} z^j/j!, so the table applies to them. The ν = 1 row (forward Euler) is the
 * table's first column: 1 for k = 0, not stable for k ≥ 1.
 */
import { describe, expect, test } from 'vitest';
import { analyseScheme } from '../../src/stability/index.js';

const UNSTABLE = null;
const TABLE: Record<number, { time: string; cfl: (number | null)[] }> = {
  1: { time: 'euler', cfl: [1.0, UNSTABLE, UNSTABLE, UNSTABLE, UNSTABLE] },
  2: { time: 'ssp-rk2', cfl: [1.0, 0.333, UNSTABLE, UNSTABLE, UNSTABLE] },
  3: { time: 'ssp-rk3', cfl: [1.256, 0.409, 0.209, 0.13, 0.089, 0.066, 0.051] },
  4: { time: 'rk4', cfl: [1.392, 0.464, 0.235, 0.145, 0.1, 0.073, 0.056] },
};

const cases = Object.entries(TABLE).flatMap(([nu, row]) => row.cfl.map((cfl, k) => ({ nu: Number(nu), k, time: row.time, cfl })));

describe('Cockburn & Shu (2001), Table 2.2', () => {
  test.each(cases)('ν = $nu ($time), P$k: $cfl', ({ time, k, cfl }) => {
    const r = analyseScheme(time, `dg${k}`);
    if (cfl === UNSTABLE) {
      expect(r.courant).toBe(0);
      expect(r.status).toBe('weakly-unstable');
    } else {
      expect(r.status).toBe('stable');
      expect(Math.floor(1000 * r.courant) / 1000).toBeCloseTo(cfl, 10);
    }
  });
});
