/**
 * Wicker & Skamarock, "Time-splitting methods for elastic models using forward time schemes",
 * Mon. Wea. Rev. 130:2088–2097 (2002), Table 1: largest stable Courant numbers of their three-stage
 * RK3 (R(z) = 1 + z + z²/2 + z³/6, the polynomial of SSP-RK3) with 3rd- to 6th-order advection.
 * Their values were found by experiment and sit up to ~1 % below the exact limits.
 */
import { expect, test } from 'vitest';
import { analyseScheme } from '../../src/stability/index.js';

const TABLE_1: [string, number][] = [
  ['upwind3', 1.61],
  ['central4', 1.26],
  ['upwind5', 1.42],
  ['central6', 1.08],
];

test.each(TABLE_1)('RK3 with %s: %f', (space, published) => {
  const r = analyseScheme('ssp-rk3', space);
  expect(r.status).toBe('stable');
  expect(Math.abs(r.courant - published)).toBeLessThanOrEqual(0.02);
  expect(r.courant).toBeGreaterThanOrEqual(published - 0.005);
});
