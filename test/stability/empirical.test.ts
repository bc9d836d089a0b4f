/**
 * The computed limits against actual runs: periodic 1-D advection u_t + u_x = 0 (Δx = 1) from a
 * random state, stepped at 0.98σ and 1.02σ. Below the limit the discrete L2 norm stays bounded;
 * above it the fastest-growing Fourier mode takes over.
 */
import { describe, expect, test } from 'vitest';
import { analyseScheme } from '../../src/stability/index.js';
import { builtInTableau, type Tableau } from '../../src/stability/tableau.js';
import { Rng } from '../../src/demo/random.js';
import { rkStep } from './support.js';
import { eigenvalues } from '../../src/stability/eigen.js';
import { dgSpectrum } from '../../src/stability/dg.js';

const CELLS = 64;

/** Runs `steps` steps and returns the largest norm ratio seen and the final one. */
function run(t: Tableau, L: (u: Float64Array, out: Float64Array) => void, u: Float64Array, dt: number, steps: number, norm: (u: Float64Array) => number) {
  const n0 = norm(u);
  let peak = 1;
  for (let s = 0; s < steps; s++) {
    rkStep(t, L, u, dt);
    peak = Math.max(peak, norm(u) / n0);
  }
  return { peak, final: norm(u) / n0 };
}

function randomState(n: number, seed: number): Float64Array {
  const rng = new Rng(seed);
  return Float64Array.from({ length: n }, () => 2 * rng.next() - 1);
}

/** First-order upwind: du_j/dt = −(u_j − u_{j−1}). */
function upwind1(u: Float64Array, out: Float64Array): void {
  const n = u.length;
  for (let j = 0; j < n; j++) out[j] = -(u[j]! - u[(j + n - 1) % n]!);
}

const G = 1 / Math.sqrt(3);

/**
 * DG with linear Legendre modes per cell, state [c0, c1] interleaved, upwind flux; the volume
 * integral ∫ u P_m' dξ by two-point Gauss quadrature. Cell x ∈ [j, j+1], ξ = 2(x − j) − 1, so the
 * mass matrix is diag(1, 1/3).
 */
function dgP1(u: Float64Array, out: Float64Array): void {
  const n = u.length / 2;
  for (let j = 0; j < n; j++) {
    const c0 = u[2 * j]!;
    const c1 = u[2 * j + 1]!;
    const p = (j + n - 1) % n;
    const inflow = u[2 * p]! + u[2 * p + 1]!;
    const outflow = c0 + c1;
    const volume1 = (c0 - c1 * G) + (c0 + c1 * G); // Σ_q u(ξ_q)·P1'(ξ_q), P1' = 1, weights 1
    out[2 * j] = -outflow + inflow;
    out[2 * j + 1] = 3 * (volume1 - outflow - inflow);
  }
}

const l2 = (u: Float64Array) => Math.hypot(...u);
const dgNorm = (u: Float64Array) => {
  let s = 0;
  for (let j = 0; j < u.length; j += 2) s += u[j]! ** 2 + u[j + 1]! ** 2 / 3;
  return Math.sqrt(s);
};

describe('time-stepping at the computed limit', () => {
  test('RK4 + first-order upwind: bounded at 0.98σ, growing at 1.02σ', () => {
    const sigma = analyseScheme('rk4', 'upwind1').courant;
    const t = builtInTableau('rk4')!;
    const below = run(t, upwind1, randomState(CELLS, 1), 0.98 * sigma, 2000, l2);
    const above = run(t, upwind1, randomState(CELLS, 1), 1.02 * sigma, 2000, l2);
    expect(below.peak).toBeLessThanOrEqual(1 + 1e-12);
    expect(above.final).toBeGreaterThan(1e6);
  });

  test('DG P1 + SSP-RK2 (coded directly): bounded at 0.98σ, growing at 1.02σ', () => {
    const sigma = analyseScheme('ssp-rk2', 'dg1').courant;
    const t = builtInTableau('ssp-rk2')!;
    const below = run(t, dgP1, randomState(2 * CELLS, 2), 0.98 * sigma, 3000, dgNorm);
    const above = run(t, dgP1, randomState(2 * CELLS, 2), 1.02 * sigma, 3000, dgNorm);
    expect(below.peak).toBeLessThan(1.5);
    expect(below.final).toBeLessThan(1);
    expect(above.final).toBeGreaterThan(1e6);
  });

  test('the directly coded DG P1 operator on 64 cells has the spectrum the analysis uses', () => {
    // Assemble the 128×128 matrix column by column and compare its eigenvalues with the
    // per-wave-number 2×2 spectra at θ_k = 2πk/64.
    const n = 2 * CELLS;
    const a = new Float64Array(n * n);
    const e = new Float64Array(n);
    const col = new Float64Array(n);
    for (let q = 0; q < n; q++) {
      e.fill(0);
      e[q] = 1;
      dgP1(e, col);
      for (let p = 0; p < n; p++) a[p * n + q] = col[p]!;
    }
    const got = eigenvalues(n, a, new Float64Array(n * n));
    const want: [number, number][] = [];
    const re = new Float64Array(2);
    const im = new Float64Array(2);
    for (let k = 0; k < CELLS; k++) {
      dgSpectrum(1, (2 * Math.PI * k) / CELLS, re, im, 0);
      want.push([re[0]!, im[0]!], [re[1]!, im[1]!]);
    }
    const used = new Uint8Array(n);
    for (const [wr, wi] of want) {
      let best = -1;
      let bd = Infinity;
      for (let j = 0; j < n; j++) {
        const d = Math.hypot(got.re[j]! - wr, got.im[j]! - wi);
        if (!used[j] && d < bd) { bd = d; best = j; }
      }
      used[best] = 1;
      expect(bd).toBeLessThan(1e-8);
    }
  });
});
