// The benchmark's smoke run (20k cells, one run each): the table prints with every column and a
// row per case. No timing is checked here: timings are the benchmark's to report, not a test's.
import { beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import * as fs from 'node:fs';
import * as path from 'node:path';
import { fileURLToPath } from 'node:url';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');

beforeAll(() => {
  if (!fs.existsSync(path.join(root, 'dist/cli/parallel.js'))) throw new Error('run `npm run build:cli` first (npm test does)');
});

describe('npm run bench -- --smoke --threads 2', () => {
  it('prints the table of files and the per-cell pass', () => {
    const r = spawnSync(process.execPath, [path.join(root, 'bench/run.mjs'), '--smoke', '--threads', '2'], { cwd: root, encoding: 'utf8', timeout: 120000 });
    expect(r.status, r.stderr).toBe(0);
    const lines = r.stdout.split('\n');
    const head = lines.find((l) => l.startsWith('file '));
    const measured = ['ratio', 'cpu ratio', 'cells/s', 'RSS MiB', 'RSS/budget'];
    const columns = head!.split(/\s{2,}/);
    expect(columns).toEqual(['file', 'MiB', 'cells', 'floor s', 'audit s', ...measured, 'no-table s', 'ratio']);
    for (const name of ['tri-20k.vtu', 'tri-20k.vtk']) {
      const row = lines.find((l) => l.startsWith(name + ' '))?.trim().split(/\s+/);
      expect(row, name).toHaveLength(columns.length);
      expect(Number(row![2])).toBe(20022); // a 141 × 71 grid of squares, two triangles each
      for (const k of [3, 4, 5, 6, 8]) expect(Number(row![k])).toBeGreaterThan(0);
    }
    expect(r.stdout).toMatch(/per-cell pass, 20,022 cells in memory/);
    for (const what of ['core geometry, 1 thread', 'core geometry, 2 threads', 'pass, 1 thread', 'pass, 2 threads', 'shape measures, 1 thread']) {
      expect(r.stdout).toMatch(new RegExp(`^${what}\\s+[\\d.]+\\s+[\\d,]+$`, 'm'));
    }
  });
});
