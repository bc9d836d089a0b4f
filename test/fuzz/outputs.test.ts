/**
 * Outputs never hurt the user: --cells and --vtu refuse to overwrite the input under any
 * spelling of its path (../, a symlink, a hard link), write through a temporary file so that a
 * failed audit leaves an existing output untouched, name a missing folder clearly; and the CSV
 * numbers read back bit for bit.
 */
import fc from 'fast-check';
import * as fs from 'node:fs';
import * as os from 'node:os';
import * as path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runAudit } from '../../src/audit/audit.js';
import { cellsCsv, CSV_COLUMNS } from '../../src/io/csv.js';
import { meshOf, vectorField } from '../helpers/meshes.js';
import { ensureCli, steplens } from './cli.js';
import { fuzzMesh } from './meshes.js';

let tmp = '';
let input = '';
let original: Buffer;

/** Two triangles of an invented harbour basin with a point velocity (ASCII legacy VTK). */
const KESTREL = `# vtk DataFile Version 4.2
Kestrel Cove basin
ASCII
DATASET UNSTRUCTURED_GRID
POINTS 4 double
0 0 0  30 0 0  30 20 0  0 20 0
CELLS 2 8
3 0 1 2
3 0 2 3
CELL_TYPES 2
5 5
POINT_DATA 4
VECTORS velocity double
1 0 0  1.5 0 0  1 0.5 0  0.5 0 0
`;

beforeAll(() => {
  ensureCli();
  tmp = fs.mkdtempSync(path.join(os.tmpdir(), 'steplens-outputs-'));
  fs.mkdirSync(path.join(tmp, 'basin'));
  input = path.join(tmp, 'basin', 'kestrel.vtk');
  fs.writeFileSync(input, KESTREL);
  original = fs.readFileSync(input);
});

afterAll(() => {
  if (tmp) fs.rmSync(tmp, { recursive: true, force: true });
});

/** Files in the folder that look like our temporary outputs. */
function leftovers(dir: string): string[] {
  return fs.readdirSync(dir).filter((f) => f.endsWith('.tmp'));
}

function expectOneLine(err: string): string {
  const lines = err.trimEnd().split('\n');
  expect(lines).toHaveLength(1);
  return lines[0]!;
}

describe('the input is never overwritten', () => {
  it('through ./x/../ spellings, relative and absolute', async () => {
    for (const [flag, out] of [['--cells', './basin/../basin/kestrel.vtk'], ['--vtu', path.join(tmp, 'basin', '.', 'kestrel.vtk')]]) {
      const r = await steplens(['audit', 'basin/kestrel.vtk', flag!, out!], tmp);
      expect(r.code, r.err).toBe(2);
      expect(expectOneLine(r.err)).toMatch(/refusing to overwrite the input file/);
      expect(fs.readFileSync(input).equals(original)).toBe(true);
    }
  });

  it('through a symlink to it, and when the input itself is given through a symlink', async () => {
    const link = path.join(tmp, 'link.vtk');
    fs.symlinkSync(input, link);
    const r = await steplens(['audit', input, '--vtu', link], tmp);
    expect(r.code, r.err).toBe(2);
    expect(r.err).toMatch(/refusing to overwrite the input file/);
    const back = await steplens(['audit', link, '--cells', input], tmp);
    expect(back.code, back.err).toBe(2);
    expect(fs.readFileSync(input).equals(original)).toBe(true);
    expect(fs.lstatSync(link).isSymbolicLink()).toBe(true);
  });

  it('through a hard link', async () => {
    const hard = path.join(tmp, 'hard.vtk');
    fs.linkSync(input, hard);
    const r = await steplens(['audit', input, '--cells', hard], tmp);
    expect(r.code, r.err).toBe(2);
    expect(fs.readFileSync(input).equals(original)).toBe(true);
  });

  // Fails until src/cli/audit-command.ts counts every file readMesh loaded as an input (see the
  // issue 7 report): today only FILE is protected, and its Triangle sibling is overwritten.
  it('[cli fix needed] the .ele read beside a .node input is an input too', async () => {
    const node = path.join(tmp, 'pair.node');
    const ele = path.join(tmp, 'pair.ele');
    fs.writeFileSync(node, '4 2 2 0\n1 0 0 1 0\n2 30 0 1 0\n3 30 20 1 0\n4 0 20 1 0\n');
    fs.writeFileSync(ele, '2 3 0\n1 1 2 3\n2 1 3 4\n');
    const before = fs.readFileSync(ele);
    for (const [flag, out, entry] of [['--cells', ele, node], ['--vtu', node, ele]]) {
      const saved = fs.readFileSync(out!);
      const r = await steplens(['audit', entry!, flag!, out!], tmp);
      expect(fs.readFileSync(out!).equals(saved), `${flag} ${out} overwrote an input`).toBe(true);
      expect(r.code, r.err).toBe(2);
    }
    expect(fs.readFileSync(ele).equals(before)).toBe(true);
  });
});

describe('a failed audit leaves existing outputs alone', () => {
  it('a broken input, a wrong array name: the old table and mesh stay as they were, no temporary file is left', async () => {
    const out = path.join(tmp, 'out');
    fs.mkdirSync(out);
    const csv = path.join(out, 'cells.csv');
    const vtu = path.join(out, 'cells.vtu');
    fs.writeFileSync(csv, 'the previous table\n');
    fs.writeFileSync(vtu, 'the previous mesh\n');
    const broken = path.join(tmp, 'broken.vtk');
    fs.writeFileSync(broken, KESTREL.replace('CELLS 2 8', 'CELLS 2 9'));
    for (const args of [[broken], [input, '--velocity', 'current'], [input, '--model', 'shallow-water']]) {
      const r = await steplens(['audit', ...args, '--cells', csv, '--vtu', vtu], tmp);
      expect(r.code, r.err).toBe(2);
      expectOneLine(r.err);
      expect(fs.readFileSync(csv, 'utf8')).toBe('the previous table\n');
      expect(fs.readFileSync(vtu, 'utf8')).toBe('the previous mesh\n');
      expect(leftovers(out)).toEqual([]);
    }
    // and a successful run replaces both, leaving nothing else behind
    const ok = await steplens(['audit', input, '--cells', csv, '--vtu', vtu], tmp);
    expect(ok.code, ok.err).toBe(0);
    expect(fs.readFileSync(csv, 'utf8').split('\n')[0]).toBe(CSV_COLUMNS.join(','));
    expect(fs.readFileSync(vtu, 'latin1')).toMatch(/^<\?xml/);
    expect(fs.readdirSync(out).sort()).toEqual(['cells.csv', 'cells.vtu']);
  });

  it('a missing output folder is one clear line, and nothing is written', async () => {
    const r = await steplens(['audit', input, '--cells', path.join(tmp, 'no-such-folder', 'cells.csv')], tmp);
    expect(r.code, r.err).toBe(2);
    expect(expectOneLine(r.err)).toMatch(/no-such-folder.*does not exist/);
    expect(fs.existsSync(path.join(tmp, 'no-such-folder'))).toBe(false);
  });
});

/** CSV text back to numbers: inf, -inf, nan as written by the table; an empty field is null. */
function parseField(s: string): number | null {
  if (s === '') return null;
  if (s === 'inf') return Infinity;
  if (s === '-inf') return -Infinity;
  if (s === 'nan') return NaN;
  const v = Number(s);
  if (Number.isNaN(v)) throw new Error(`not a number: "${s}"`);
  return v;
}

describe('CSV numbers read back bit for bit', () => {
  const COLUMN_ARRAYS: [string, (r: ReturnType<typeof runAudit>) => Float64Array][] = [
    ['area', (r) => r.geom.area], ['perimeter', (r) => r.geom.perimeter], ['inradius', (r) => r.geom.inradius],
    ['circumradius', (r) => r.geom.circumradius], ['speed', (r) => r.speed], ['dt', (r) => r.dt],
    ['radius_ratio', (r) => r.geom.radiusRatio], ['min_angle', (r) => r.geom.minAngle], ['max_angle', (r) => r.geom.maxAngle],
    ['aspect_ratio', (r) => r.geom.aspectRatio], ['scaled_jacobian', (r) => r.geom.scaledJacobian], ['condition', (r) => r.geom.condition],
    ['edge_ratio', (r) => r.geom.edgeRatio], ['centroid_x', (r) => r.geom.centroidX], ['centroid_y', (r) => r.geom.centroidY],
  ];
  /** Every double, and the awkward ones often: ±0, subnormals, extremes, non-finite. */
  const anyDouble = fc.oneof(
    fc.double(),
    fc.constantFrom(0, -0, 5e-324, -5e-324, 2.2250738585072014e-308, 1.7976931348623157e308, 0.1, 1 / 3, 9007199254740993, Infinity, -Infinity, NaN),
  );

  it('every column of random audits, plus extra columns of arbitrary doubles', () => {
    let rows = 0;
    fc.assert(fc.property(fuzzMesh, fc.array(fc.double({ min: -50, max: 50, noNaN: true }), { minLength: 2, maxLength: 2 }), fc.array(anyDouble, { minLength: 16, maxLength: 16 }), (m, u, extraValues) => {
      const mesh = meshOf(m.points, m.cells, [vectorField('velocity', Array.from({ length: m.points.length }, (_, i) => u[i % 2]!))]);
      let r;
      try {
        r = runAudit(mesh);
      } catch {
        return; // a typed refusal is the degenerate tests' business; here only tables matter
      }
      const extra = [{ name: 'anything', values: Float64Array.from({ length: mesh.nCells }, (_, i) => extraValues[i % 16]!) }];
      const lines = cellsCsv(r, extra, 'all').split('\n');
      expect(lines.pop()).toBe('');
      const header = lines.shift()!.split(',');
      expect(lines).toHaveLength(mesh.nCells);
      lines.forEach((line, i) => {
        const f = line.split(',');
        expect(f.length).toBe(header.length);
        expect(Number(f[0])).toBe(i);
        for (const [name, get] of [...COLUMN_ARRAYS, ['anything', () => extra[0]!.values] as const]) {
          const text = f[header.indexOf(name)]!;
          if (name === 'circumradius' && f[1] === 'quad') { expect(text).toBe(''); continue; }
          const want: number = get(r)[i]!;
          if (!Object.is(parseField(text), want)) expect.fail(`row ${i} ${name}: "${text}" reads back as ${parseField(text)}, the result is ${want}`);
        }
        rows++;
      });
    }), { numRuns: 200, seed: 4242 });
    expect(rows).toBeGreaterThan(600);
    console.log(`outputs: ${rows} CSV rows read back bit for bit`);
  });
});
