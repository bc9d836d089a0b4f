/** The Courant band: cells below C_min at a step, and the step range inside [C_min, C]. */
import { describe, expect, it } from 'vitest';
import { runAudit } from '../../src/audit/audit.js';
import { courantBelow, suggestBand } from '../../src/audit/band.js';
import { gridMesh, vectorField } from '../helpers/meshes.js';

// five unit squares in a row: h = 2A/P = 0.5; speeds 0.5, 0.25, 1/6, 1/16 and one cell at rest,
// so with C = 1 the cells' own steps b = C·h/λ are 1, 2, 3, 8 and unlimited
function strip() {
  const m = gridMesh(5, 1, 1);
  m.cellData.push(vectorField('velocity', [0.5, 0, 0.25, 0, 1 / 6, 0, 1 / 16, 0, 0, 0]));
  return m;
}

describe('Courant band', () => {
  it('at X = 0.5 the Courant numbers are 0.5, 0.25, 1/6, 1/16: two moving cells below C_min = 0.25', () => {
    const r = runAudit(strip(), { dt: 0.5 });
    const { flags, summary } = courantBelow(r.courantAtDt!, r.speed, 0.5, 0.25, r.geom, 10);
    expect(Array.from(flags)).toEqual([0, 0, 1, 1, 0]); // the cell at rest is not flagged
    expect(summary).toMatchObject({ dt: 0.5, courant_min: 0.25, moving_cells: 4, below: 2 });
    expect(summary.worst.map((w) => w.cell)).toEqual([3, 2]);
    expect(summary.worst[0]!.courant).toBeCloseTo(1 / 16, 14);
    expect(summary.worst[0]!.centroid).toEqual([3.5, 0.5]);
  });

  it('every moving cell in [0.25, 1]: impossible, the cell with b = 8 > (1/0.25)·1 blocks it', () => {
    const r = runAudit(strip());
    const b = suggestBand(r.dtInscribed, r.speed, r.summary.limit.dt, 1, 0.25, 1, r.geom, 10);
    // lo = 0.25·max b = 2 > hi = min b = 1
    expect(b).toMatchObject({ status: 'none', moving_cells: 4, needed: 4, hi: 1, lo: null, below_at_hi: 1 });
    expect(b.blocking).toMatchObject({ cells: 1, allowed: 0 });
    expect(b.blocking!.worst.map((w) => w.cell)).toEqual([3]);
    expect(b.blocking!.worst[0]!.courant).toBeCloseTo(1 / 8, 14); // 1·(1/16)/0.5 at X = hi
  });

  it('three of four moving cells in the band: [0.25·3, 1] = [0.75, 1]', () => {
    const r = runAudit(strip());
    const b = suggestBand(r.dtInscribed, r.speed, r.summary.limit.dt, 1, 0.25, 0.75, r.geom, 10);
    expect(b.status).toBe('ok');
    expect(b.needed).toBe(3);
    expect(b.lo).toBeCloseTo(0.75, 14);
    expect(b.hi).toBeCloseTo(1, 14);
    expect(b.below_at_hi).toBe(1);
    expect(b.blocking).toBeNull();
    // a wider band (C_min = 0.125 = 1/8) holds every cell: lo = 8/8 = 1 = hi
    const all = suggestBand(r.dtInscribed, r.speed, r.summary.limit.dt, 1, 0.125, 1, r.geom, 10);
    expect(all).toMatchObject({ status: 'ok', below_at_hi: 0 });
    expect(all.lo).toBeCloseTo(1, 14);
  });

  it('the limit in force caps the range; no moving cell means no limit', () => {
    const r = runAudit(strip());
    expect(suggestBand(r.dtInscribed, r.speed, 0.9, 1, 0.125, 0.5, r.geom, 10)).toMatchObject({ status: 'ok', hi: 0.9 });
    const still = gridMesh(2, 1, 1);
    still.cellData.push(vectorField('velocity', [0, 0, 0, 0]));
    const s = runAudit(still);
    expect(suggestBand(s.dtInscribed, s.speed, s.summary.limit.dt, 1, 0.5, 1, s.geom, 10).status).toBe('no-limit');
  });
});
