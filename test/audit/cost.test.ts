/** Run cost: steps, cell updates and wall time over a duration (hand-computed). */
import { describe, expect, it } from 'vitest';
import { runCost } from '../../src/audit/cost.js';

describe('runCost', () => {
  it('global stepping, the intended step and local stepping over one hour', () => {
    // 10 cells, limit 0.5 s, levels 0/1/2 holding 2/3/5 cells, 1 µs per cell update
    const c = runCost(3600, 10, 0.5, 1e-6, 0.75, [2, 3, 5]);
    expect(c.global).toEqual({ dt: 0.5, steps: 7200, cell_updates: 72000, wall_time: 72000 * 1e-6 });
    // 0.75 s: ⌈3600 / 0.75⌉ = 4800 steps, above the limit
    expect(c.intended).toMatchObject({ dt: 0.75, steps: 4800, cell_updates: 48000, stable: false });
    // macro step 0.5·2² = 2 s, 1800 of them; per macro step 2·4 + 3·2 + 5·1 = 19 updates
    expect(c.lts).toMatchObject({ dt: 0.5, macro_dt: 2, macro_steps: 1800, steps: 7200, cell_updates: 1800 * 19 });
    expect(c.lts!.wall_time).toBeCloseTo(1800 * 19 * 1e-6, 15);
    expect(c.lts_saving).toBeCloseTo(72000 / 34200, 14);
  });

  it('a duration that is not a whole number of steps rounds up; no cost without --cell-step-cost', () => {
    const c = runCost(1, 4, 0.3, null, null, null);
    expect(c.global).toEqual({ dt: 0.3, steps: 4, cell_updates: 16, wall_time: null });
    expect(c.intended).toBeNull();
    expect(c.lts).toBeNull();
    expect(c.lts_saving).toBeNull();
  });

  it('no positive limit: no step count', () => {
    expect(runCost(10, 4, null, null, 0.1, [4]).global).toBeNull();
    expect(runCost(10, 4, 0, null, null, [4]).lts).toBeNull();
    expect(runCost(10, 4, null, null, 0.1, null).intended).toMatchObject({ steps: 100, stable: true });
  });
});
