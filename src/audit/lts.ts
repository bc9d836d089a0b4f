/**
 * Local time stepping: level ℓ_i = ⌊log₂(dt_i / dt_min)⌋, capped at the highest level L; a cell
 * on level ℓ steps with dt_min·2^ℓ. Cells that share an edge may differ by at most one level
 * (the usual neighbour rule), enforced by lowering levels only.
 */
import type { EdgeTopology } from '../geometry/edges.js';
import type { Mesh } from '../mesh/model.js';

/** Default highest level when local time stepping is asked without --lts-levels. */
export const DEFAULT_LTS_LEVELS = 4;
/** Highest level accepted (2^30 between the finest and the coarsest step is far past any use). */
export const MAX_LTS_LEVEL = 30;

/** Raw levels from the per-cell steps (unlimited cells go to L). `base` must be positive: the global limit. */
export function ltsLevels(dt: Float64Array, base: number, maxLevel: number): Uint8Array {
  const n = dt.length;
  const out = new Uint8Array(n);
  const step = new Float64Array(maxLevel + 2);
  for (let l = 0; l <= maxLevel + 1; l++) step[l] = base * 2 ** l;
  for (let i = 0; i < n; i++) {
    const d = dt[i]!;
    if (!(d < Infinity)) { out[i] = maxLevel; continue; }
    let l = Math.floor(Math.log2(d / base));
    if (!(l >= 0)) l = 0;
    if (l > maxLevel) l = maxLevel;
    // log2 may be off by one next to a power of two: settle on base·2^ℓ ≤ d < base·2^(ℓ+1)
    while (l > 0 && step[l]! > d) l--;
    while (l < maxLevel && step[l + 1]! <= d) l++;
    out[i] = l;
  }
  return out;
}

/**
 * Lowers levels until cells sharing an edge differ by at most one: the result is, per cell, the
 * minimum of its own level and (neighbour's level + 1), at the fixed point. Processed as a
 * breadth-first search from the low levels, each cell lowered at most once: O(cells + edges).
 * Returns the new levels and how many cells were lowered.
 */
export function neighbourRule(levels: Uint8Array, mesh: Mesh, edges: EdgeTopology, maxLevel: number): { levels: Uint8Array; lowered: number } {
  const n = levels.length;
  const out = levels.slice();
  const start = new Int32Array(maxLevel + 2);
  for (let c = 0; c < n; c++) start[out[c]! + 1]!++;
  for (let l = 0; l <= maxLevel; l++) start[l + 1]! += start[l]!;
  const byLevel = new Int32Array(n);
  const fill = start.slice(0, maxLevel + 1);
  for (let c = 0; c < n; c++) byLevel[fill[out[c]!]!++] = c;
  const queue = new Int32Array(n);
  let head = 0, tail = 0;
  const off = mesh.cellOffsets, halfEdge = edges.halfEdgeEdge, edgeCells = edges.edgeCells;
  for (let l = 0; l < maxLevel; l++) {
    const loweredHere = tail;
    for (let pass = 0; pass < 2; pass++) {
      const from = pass === 0 ? start[l]! : head, to = pass === 0 ? start[l + 1]! : loweredHere;
      for (let j = from; j < to; j++) {
        const c = pass === 0 ? byLevel[j]! : queue[j]!;
        if (out[c] !== l) continue; // lowered earlier and visited on its own level
        for (let k = off[c]!; k < off[c + 1]!; k++) {
          const e = halfEdge[k]!;
          const a = edgeCells[2 * e]!;
          const nb = a === c ? edgeCells[2 * e + 1]! : a;
          if (nb >= 0 && out[nb]! > l + 1) {
            out[nb] = l + 1;
            queue[tail++] = nb;
          }
        }
      }
    }
    head = loweredHere;
  }
  return { levels: out, lowered: tail };
}

/** Cells per level 0..maxLevel. */
export function levelCounts(levels: Uint8Array, maxLevel: number): number[] {
  const counts = new Array<number>(maxLevel + 1).fill(0);
  for (let i = 0; i < levels.length; i++) counts[levels[i]!]!++;
  return counts;
}

/** Work of global stepping over work of local stepping: N / Σ_ℓ N_ℓ·2^(−ℓ). */
export function ltsSpeedup(counts: readonly number[]): number {
  let n = 0, work = 0;
  counts.forEach((c, l) => { n += c; work += c * 2 ** -l; });
  return work > 0 ? n / work : 1;
}
