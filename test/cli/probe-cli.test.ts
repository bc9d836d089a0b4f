/** `steplens probe` run as a process on the demo channel. */
import { beforeAll, describe, expect, it } from 'vitest';
import * as path from 'node:path';
import { requireBuild, root, run } from './run.js';

const channel = path.join(root, 'meshes/channel.vtu');

beforeAll(requireBuild);

describe('steplens probe (process)', () => {
  it('--json: predicted limits equal the audit\'s, and measured ≥ face flux ≥ inscribed', () => {
    const r = run(['probe', channel, '--json', '--iterations', '100']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    const inscribed = JSON.parse(run(['audit', channel, '--json']).out).limit;
    const flux = JSON.parse(run(['audit', channel, '--json', '--length', 'flux']).out).limit;
    expect(j.predicted.inscribed).toEqual({ dt: inscribed.dt, cell: inscribed.cell });
    expect(j.predicted.flux).toEqual({ dt: flux.dt, cell: flux.cell });
    expect(j.predicted.flux.dt).toBeGreaterThanOrEqual(j.predicted.inscribed.dt);
    expect(j.measured.dt).toBeGreaterThanOrEqual(j.predicted.flux.dt * (1 - 1e-9));
    expect(j.measured).toMatchObject({ iterations: 100, burn_in: 25 });
    expect(j.measured.trials.length).toBeGreaterThan(2);
    expect(j.integrator).toEqual({ name: 'euler', r: [1, 1] });
    expect(j.boundary).toMatch(/zero-gradient/);
    expect(j.note).toMatch(/transient growth/);
  });

  it('human report with --time rk2; help explains what is measured', () => {
    const r = run(['probe', channel, '--time', 'rk2', '--iterations', '60']);
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/guaranteed \(inscribed length/);
    expect(r.out).toMatch(/face flux/);
    expect(r.out).toMatch(/measured \(power iteration\)/);
    expect(r.out).toMatch(/R\(z\) = 1 \+ z \+ 0\.5·z\^2/);
    const help = run(['probe', '--help']);
    expect(help.code).toBe(0);
    expect(help.out).toMatch(/non-normal/);
    expect(help.out).toMatch(/spectral radius/);
  });

  it('bad usage exits 2 with one line: another model, an unknown integrator, no file', () => {
    for (const args of [[channel, '--model', 'shallow-water'], [channel, '--time', 'leapfrog'], []]) {
      const r = run(['probe', ...args]);
      expect(r.code).toBe(2);
      expect(r.err.trim().split('\n')).toHaveLength(1);
    }
  });
});
