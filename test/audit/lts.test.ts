/** Local time stepping: levels, the neighbour rule, the speed-up. */
import { describe, expect, it } from 'vitest';
import { buildEdges } from '../../src/geometry/edges.js';
import { levelCounts, ltsLevels, ltsSpeedup, neighbourRule } from '../../src/audit/lts.js';
import type { Mesh } from '../../src/mesh/model.js';
import { gridMesh, rng } from '../helpers/meshes.js';

/** Cell neighbours by brute force: two cells that share two nodes share an edge. */
function neighboursOf(m: Mesh): number[][] {
  const nodes = (c: number) => Array.from(m.cellNodes.subarray(m.cellOffsets[c]!, m.cellOffsets[c + 1]!));
  const out: number[][] = [];
  for (let a = 0; a < m.nCells; a++) {
    out.push([]);
    const na = nodes(a);
    for (let b = 0; b < m.nCells; b++) if (b !== a && nodes(b).filter((p) => na.includes(p)).length === 2) out[a]!.push(b);
  }
  return out;
}

/** The neighbour rule by plain sweeps until nothing changes (the definition, not the BFS). */
function sweepRule(levels: number[], nb: number[][]): number[] {
  const l = levels.slice();
  for (let changed = true; changed;) {
    changed = false;
    for (let c = 0; c < l.length; c++) for (const d of nb[c]!) if (l[c]! > l[d]! + 1) { l[c] = l[d]! + 1; changed = true; }
  }
  return l;
}

describe('local time stepping', () => {
  // a strip of six unit squares, cells 0..5 left to right
  const strip = gridMesh(6, 1, 1);
  const dt = Float64Array.of(1, 16, 16, 16, 2, 40);

  it('levels ⌊log₂(dt/dt_min)⌋ capped at L, then lowered so that neighbours differ by at most one', () => {
    const raw = ltsLevels(dt, 1, 4);
    // log₂: 0, 4, 4, 4, 1, 5.32 → capped at 4
    expect(Array.from(raw)).toEqual([0, 4, 4, 4, 1, 4]);
    const ruled = neighbourRule(raw, strip, buildEdges(strip), 4);
    // from cell 0 (level 0): 1, 2, …; from cell 4 (level 1): cells 3 and 5 at most 2
    expect(Array.from(ruled.levels)).toEqual([0, 1, 2, 2, 1, 2]);
    expect(ruled.lowered).toBe(4);
    expect(Array.from(raw)).toEqual([0, 4, 4, 4, 1, 4]); // the input is left alone
  });

  it('the speed-up N / Σ N_ℓ·2^(−ℓ) before and after the rule (hand values)', () => {
    const raw = ltsLevels(dt, 1, 4);
    const after = neighbourRule(raw, strip, buildEdges(strip), 4).levels;
    expect(levelCounts(raw, 4)).toEqual([1, 1, 0, 0, 4]);
    expect(levelCounts(after, 4)).toEqual([1, 2, 3, 0, 0]);
    // before: 6 / (1 + 1/2 + 4/16) = 6 / 1.75; after: 6 / (1 + 2/2 + 3/4) = 6 / 2.75
    expect(ltsSpeedup(levelCounts(raw, 4))).toBeCloseTo(6 / 1.75, 14);
    expect(ltsSpeedup(levelCounts(after, 4))).toBeCloseTo(6 / 2.75, 14);
    expect(ltsSpeedup([0, 0])).toBe(1);
  });

  it('a step exactly 2^ℓ·dt_min is on level ℓ; a hair below it is one level down; unlimited cells go to L', () => {
    const base = 0.1;
    const d = Float64Array.of(0.1, 0.2, 0.4, 0.8, 0.8 * (1 - 1e-15), 0.3, Infinity, 1e300);
    expect(Array.from(ltsLevels(d, base, 6))).toEqual([0, 1, 2, 3, 2, 1, 6, 6]);
    expect(Array.from(ltsLevels(d, base, 0))).toEqual([0, 0, 0, 0, 0, 0, 0, 0]);
  });

  it('on random triangle meshes the BFS equals plain sweeps to the fixed point', () => {
    const rand = rng(7);
    for (let t = 0; t < 5; t++) {
      const m = gridMesh(7, 5, 1, true);
      const L = 1 + Math.floor(rand() * 6);
      const raw = Uint8Array.from({ length: m.nCells }, () => Math.floor(rand() * (L + 1)));
      const nb = neighboursOf(m);
      const ruled = neighbourRule(raw, m, buildEdges(m), L);
      const expected = sweepRule(Array.from(raw), nb);
      expect(Array.from(ruled.levels)).toEqual(expected);
      expect(ruled.lowered).toBe(expected.filter((l, i) => l !== raw[i]).length);
    }
  });
});
