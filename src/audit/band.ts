/**
 * A Courant band [C_min, C]: schemes such as semi-Lagrangian or Eulerian–Lagrangian advection
 * lose accuracy where a particle moves much less than a cell per step, so they want X·λ/h ≥ C_min
 * as well as the stability bound X·λ/h ≤ C. Only moving cells (λ > 0) count.
 *
 * For a step X, cell i is inside the band when a_i ≤ X ≤ b_i with b_i = C·h_i/λ_i (its own stable
 * step) and a_i = (C_min/C)·b_i. The upper bound is stability and must hold for every cell, so X ≤
 * hi = min b_i (and ≤ the limit in force). The share applies to the lower bound: X ≥ lo, the
 * m-th smallest a_i with m = ⌈share·moving⌉. A range exists when lo ≤ hi; otherwise the cells with
 * a_i > hi (b_i > (C/C_min)·hi: much larger or slower than the cells that set the step) stay
 * below C_min at every stable step, and the mesh needs grading between them.
 */
import { centroidOf, type CellGeometry } from '../geometry/cells.js';
import { smallestK } from './stats.js';

export interface BandCell {
  cell: number;
  /** Courant number X·λ/h at the step the list refers to. */
  courant: number;
  inradius: number;
  speed: number;
  centroid: [number, number];
}

export interface CourantBelow {
  dt: number;
  courant_min: number;
  moving_cells: number;
  below: number;
  /** The lowest Courant numbers, ascending. */
  worst: BandCell[];
}

export interface BandSuggestion {
  courant_min: number;
  courant_max: number;
  share: number;
  moving_cells: number;
  /** Moving cells that must be inside the band. */
  needed: number;
  status: 'ok' | 'none' | 'no-limit' | 'degenerate';
  lo: number | null;
  hi: number | null;
  /** Moving cells below C_min at X = hi. */
  below_at_hi: number | null;
  /** When no range exists: the cells below C_min even at hi, largest step first. */
  blocking: { cells: number; allowed: number; worst: BandCell[] } | null;
}

function listCells(order: Int32Array, X: number, geom: CellGeometry, speed: Float64Array): BandCell[] {
  const out: BandCell[] = [];
  for (let k = 0; k < order.length; k++) {
    const c = order[k]!;
    const h = geom.inradius[c]!;
    out.push({ cell: c, courant: (X * speed[c]!) / h, inradius: h, speed: speed[c]!, centroid: centroidOf(geom, c) });
  }
  return out;
}

/** Flags (1) the moving cells whose Courant number at X is below C_min. */
export function courantBelow(courantAtDt: Float64Array, speed: Float64Array, X: number, cmin: number, geom: CellGeometry, top: number): { flags: Uint8Array; summary: CourantBelow } {
  const n = speed.length;
  const flags = new Uint8Array(n);
  const key = new Float64Array(n).fill(Infinity);
  let moving = 0, below = 0;
  for (let i = 0; i < n; i++) {
    if (!(speed[i]! > 0)) continue;
    moving++;
    const c = courantAtDt[i]!;
    if (c < cmin) { flags[i] = 1; below++; key[i] = c; }
  }
  const worst = listCells(smallestK(key, Math.min(top, below)), X, geom, speed);
  return { flags, summary: { dt: X, courant_min: cmin, moving_cells: moving, below, worst } };
}

/**
 * The step range keeping ⌈share·moving⌉ moving cells inside [cmin, cmax]. `dtOwn`: b_i = cmax·h/λ
 * per cell (Infinity where λ = 0, 0 for degenerate cells); `limit`: the global limit in force.
 */
export function suggestBand(dtOwn: Float64Array, speed: Float64Array, limit: number | null, cmax: number, cmin: number, share: number, geom: CellGeometry, top: number): BandSuggestion {
  const n = speed.length;
  let moving = 0;
  for (let i = 0; i < n; i++) if (speed[i]! > 0) moving++;
  const own = new Float64Array(moving);
  let hi = limit ?? Infinity;
  for (let i = 0, j = 0; i < n; i++) {
    if (!(speed[i]! > 0)) continue;
    own[j++] = dtOwn[i]!;
    if (dtOwn[i]! < hi) hi = dtOwn[i]!;
  }
  own.sort();
  const needed = Math.min(moving, Math.ceil(share * moving - 1e-9));
  const base: BandSuggestion = { courant_min: cmin, courant_max: cmax, share, moving_cells: moving, needed, status: 'ok', lo: null, hi: null, below_at_hi: null, blocking: null };
  if (moving === 0 || !(hi < Infinity)) return { ...base, status: 'no-limit' };
  if (!(hi > 0)) return { ...base, status: 'degenerate', hi: 0 };
  const ratio = cmin / cmax;
  const lo = needed > 0 ? ratio * own[needed - 1]! : 0;
  // a_i > hi ⇔ b_i > hi / ratio: the cells still below C_min at the largest stable step
  let belowHi = 0;
  for (let j = moving - 1; j >= 0 && ratio * own[j]! > hi; j--) belowHi++;
  if (lo <= hi) return { ...base, lo, hi, below_at_hi: belowHi };
  const key = new Float64Array(n).fill(Infinity);
  for (let i = 0; i < n; i++) if (speed[i]! > 0 && ratio * dtOwn[i]! > hi) key[i] = -dtOwn[i]!;
  const worst = listCells(smallestK(key, Math.min(top, belowHi)), hi, geom, speed);
  return { ...base, status: 'none', hi, below_at_hi: belowHi, blocking: { cells: belowHi, allowed: moving - needed, worst } };
}
