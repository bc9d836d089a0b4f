/**
 * What remeshing would buy: the global limit once the k worst cells no longer limit the step.
 *
 * With the per-cell steps sorted ascending, s[0] ≤ s[1] ≤ …, the limit after the k worst cells
 * are fixed is s[k]. Cells with a zero step (degenerate) must be fixed in any case: gains are
 * measured against the first positive step, and k counts the zero-step cells too.
 */

/** Gains the table asks for by default. */
export const DEFAULT_GAINS: readonly number[] = [1.5, 2, 4, 10];
/** The curve keeps a breakpoint wherever the limit has risen by this factor since the last one. */
export const CURVE_STEP = 1.02;

export interface GainRow {
  gain: number;
  /** Cells that must no longer limit the step (null: not reachable while any cell limits it). */
  cells: number | null;
  /** The limit then. */
  dt: number | null;
}

export interface RemeshCurve {
  /** The limit with the zero-step cells fixed: the reference of every gain. */
  reference_dt: number;
  zero_cells: number;
  gains: GainRow[];
  /** [k, dt] breakpoints of k → s[k], up to the largest gain asked (or the last limiting cell). */
  curve: [number, number][];
}

/** First index with s[i] ≥ v in an ascending array (s.length when none). */
export function lowerBound(s: Float64Array, v: number, from = 0): number {
  let lo = from, hi = s.length;
  while (lo < hi) {
    const mid = lo + Math.floor((hi - lo) / 2);
    if (s[mid]! < v) lo = mid + 1; else hi = mid;
  }
  return lo;
}

/** `sorted`: the finite per-cell steps, ascending (unlimited cells left out). Null when no cell has a positive step. */
export function remeshCurve(sorted: Float64Array, gains: readonly number[] = DEFAULT_GAINS): RemeshCurve | null {
  const m = sorted.length;
  const z = lowerBound(sorted, Number.MIN_VALUE);
  if (z === m) return null;
  const ref = sorted[z]!;
  let maxGain = 1;
  const rows: GainRow[] = [];
  const tableK: number[] = [];
  for (const g of gains) {
    const k = lowerBound(sorted, g * ref, z);
    rows.push(k < m ? { gain: g, cells: k, dt: sorted[k]! } : { gain: g, cells: null, dt: null });
    if (k < m) tableK.push(k);
    if (g > maxGain) maxGain = g;
  }
  const curve: [number, number][] = [];
  if (z > 0) curve.push([0, 0]);
  curve.push([z, ref]);
  let last = ref;
  const stop = maxGain * ref;
  for (let k = z + 1; k < m && last < stop; k++) {
    const v = sorted[k]!;
    if (v >= last * CURVE_STEP || (v > last && tableK.includes(k))) {
      curve.push([k, v]);
      last = v;
    }
  }
  return { reference_dt: ref, zero_cells: z, gains: rows, curve };
}
