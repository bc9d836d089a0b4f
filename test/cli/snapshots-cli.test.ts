/** `steplens audit` over several snapshots, run as a process on harbour snapshots written here. */
import { beforeAll, describe, expect, it } from 'vitest';
import * as fs from 'node:fs';
import * as os from 'node:os';
import * as path from 'node:path';
import { readMesh } from '../../src/mesh/read.js';
import { writeVtu } from '../../src/io/vtu.js';
import { requireBuild, root, run } from './run.js';

let tmp = '';
const harbour = path.join(root, 'meshes/harbour.vtu');

/** The harbour with its velocity scaled by f, stored with time t (or none). */
function writeSnapshot(file: string, f: number, t: number | null): void {
  const m = readMesh(new Uint8Array(fs.readFileSync(harbour)), harbour);
  const pointData = m.pointData.map((a) => (a.name === 'velocity' ? { ...a, values: a.values.map((v) => v * f) } : a));
  fs.writeFileSync(file, writeVtu({ ...m, pointData }, t === null ? {} : { time: t }));
}

beforeAll(() => {
  requireBuild();
  tmp = fs.mkdtempSync(path.join(os.tmpdir(), 'steplens-snap-'));
  // names deliberately out of time order: the stored time decides
  const run1 = path.join(tmp, 'timed');
  fs.mkdirSync(run1);
  writeSnapshot(path.join(run1, 'tide_a.vtu'), 1.5, 1200);
  writeSnapshot(path.join(run1, 'tide_b.vtu'), 1, 0);
  writeSnapshot(path.join(run1, 'tide_c.vtu'), 2, 600);
  const run2 = path.join(tmp, 'untimed');
  fs.mkdirSync(run2);
  writeSnapshot(path.join(run2, 'snap_10.vtu'), 3, null);
  writeSnapshot(path.join(run2, 'snap_2.vtu'), 2, null);
  writeSnapshot(path.join(run2, 'snap_1.vtu'), 1, null);
});

describe('steplens audit over snapshots (process)', () => {
  it('a folder, ordered by stored time: per-snapshot limits scale as 1/f, the envelope, the schedule, the CSV', () => {
    // advection: dt = h/|u|, so scaling the velocity by f divides every step by f (common practice)
    const single = run(['audit', harbour, '--json']);
    expect(single.code).toBe(0);
    const base = JSON.parse(single.out).limit;
    const csv = path.join(tmp, 'envelope.csv');
    const r = run(['audit', path.join(tmp, 'timed'), '--json', '--safety', '0.8', '--cells', csv]);
    expect(r.err).toBe('');
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    expect(j.ordered_by).toBe('time');
    expect(j.snapshots.map((s: { file: string }) => path.basename(s.file))).toEqual(['tide_b.vtu', 'tide_c.vtu', 'tide_a.vtu']);
    expect(j.snapshots.map((s: { time: number }) => s.time)).toEqual([0, 600, 1200]);
    const factors = [1, 2, 1.5];
    j.snapshots.forEach((s: { limit: { dt: number; cell: number } }, k: number) => {
      expect(s.limit.dt).toBeCloseTo(base.dt / factors[k]!, 12);
      expect(s.limit.cell).toBe(base.cell);
    });
    expect(j.envelope).toMatchObject({ cell: base.cell, snapshot: 1, time: 600 });
    expect(j.envelope.dt).toBeCloseTo(base.dt / 2, 12);
    expect(j.limiting_cells).toEqual([{ cell: base.cell, snapshots: [0, 1, 2], times: [0, 600, 1200] }]);
    // each interval: 0.8 × min(limits at its ends) = 0.8 × base/2
    expect(j.schedule.safety).toBe(0.8);
    for (const it of j.schedule.intervals) {
      expect(it.dt).toBeCloseTo((0.8 * base.dt) / 2, 12);
      expect(it.steps).toBe(Math.ceil(600 / it.dt));
      expect(it.dt_even * it.steps).toBeCloseTo(600, 9);
    }
    expect(j.schedule.assumption).toMatch(/vary slowly/);
    const lines = fs.readFileSync(csv, 'utf8').trimEnd().split('\n');
    const head = lines[0]!.split(',');
    expect(head).toContain('dt_envelope');
    expect(head).toContain('snapshot_of_min');
    expect(lines).toHaveLength(j.mesh.cells + 1);
    const row = lines[1 + base.cell]!.split(',');
    expect(Number(row[head.indexOf('dt_envelope')])).toBeCloseTo(base.dt / 2, 12);
    expect(Number(row[head.indexOf('dt')])).toBe(Number(row[head.indexOf('dt_envelope')]));
    expect(row[head.indexOf('snapshot_of_min')]).toBe('1');
  });

  it('a glob without stored times: natural name order (_2 before _10); the human report has the table and the assumption', () => {
    const r = run(['audit', path.join(tmp, 'untimed', 'snap_*.vtu'), '--json']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    expect(j.ordered_by).toBe('name');
    expect(j.snapshots.map((s: { file: string }) => path.basename(s.file))).toEqual(['snap_1.vtu', 'snap_2.vtu', 'snap_10.vtu']);
    expect(j.schedule.intervals[0]).toMatchObject({ from: null, to: null, steps: null });
    const human = run(['audit', path.join(tmp, 'untimed', 'snap_?.vtu'), path.join(tmp, 'untimed', 'snap_10.vtu')]);
    expect(human.code).toBe(0);
    expect(human.out).toMatch(/3 snapshots, ordered by file name/);
    expect(human.out).toMatch(/ENVELOPE/);
    expect(human.out).toMatch(/flow is assumed to vary slowly/);
    expect(human.out).toMatch(/necessary, not sufficient/);
  });

  it('a different mesh among the snapshots: exit 2 naming the file and what differs', () => {
    const r = run(['audit', path.join(tmp, 'timed', 'tide_a.vtu'), path.join(root, 'meshes/channel.vtu')]);
    expect(r.code).toBe(2);
    // ordered by file name: channel.vtu is the reference wherever the two files sit
    expect(r.err).toMatch(/tide_a\.vtu: not the same mesh as .*channel\.vtu: \d+ points instead of \d+/);
  });

  it('--fail-below applies to the envelope; a glob that matches nothing and single-file options are usage errors', () => {
    expect(run(['audit', path.join(tmp, 'timed'), '--fail-below', '1']).code).toBe(3);
    const none = run(['audit', path.join(tmp, 'timed', 'nothing_*.vtu')]);
    expect(none.code).toBe(2);
    expect(none.err).toMatch(/no file matches/);
    const single = run(['audit', path.join(tmp, 'timed'), '--lts']);
    expect(single.code).toBe(2);
    expect(single.err).toMatch(/--lts applies to one mesh file/);
  });
});
