/** Test helpers for the stability tests: Runge–Kutta stepping coded directly from a tableau. */
import type { Tableau } from '../../src/stability/tableau.js';

/**
 * One step of the tableau on y' = z·y from y = 1 with dt = 1, in complex arithmetic, stage by
 * stage: the amplification factor R(z) without going through the stability polynomial.
 */
export function amplification(t: Tableau, zr: number, zi: number): [number, number] {
  const s = t.b.length;
  const kr = new Float64Array(s);
  const ki = new Float64Array(s);
  let yr = 1;
  let yi = 0;
  for (let i = 0; i < s; i++) {
    let sr = 1;
    let si = 0;
    for (let j = 0; j < i; j++) {
      sr += t.A[i]![j]! * kr[j]!;
      si += t.A[i]![j]! * ki[j]!;
    }
    kr[i] = zr * sr - zi * si;
    ki[i] = zr * si + zi * sr;
    yr += t.b[i]! * kr[i]!;
    yi += t.b[i]! * ki[i]!;
  }
  return [yr, yi];
}

/** One explicit Runge–Kutta step of du/dt = L(u) for a real state vector, in place. */
export function rkStep(t: Tableau, L: (u: Float64Array, out: Float64Array) => void, u: Float64Array, dt: number): void {
  const s = t.b.length;
  const n = u.length;
  const k = Array.from({ length: s }, () => new Float64Array(n));
  const stage = new Float64Array(n);
  for (let i = 0; i < s; i++) {
    stage.set(u);
    for (let j = 0; j < i; j++) {
      const a = t.A[i]![j]! * dt;
      if (a !== 0) for (let q = 0; q < n; q++) stage[q]! += a * k[j]![q]!;
    }
    L(stage, k[i]!);
  }
  for (let i = 0; i < s; i++) {
    const w = t.b[i]! * dt;
    for (let q = 0; q < n; q++) u[q]! += w * k[i]![q]!;
  }
}

export function norm2(u: Float64Array): number {
  let s = 0;
  for (let q = 0; q < u.length; q++) s += u[q]! * u[q]!;
  return Math.sqrt(s);
}
