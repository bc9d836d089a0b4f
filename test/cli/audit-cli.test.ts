/** The CLI run as a process: exit codes, JSON and CSV shape, --fail-below, bad input. */
import { describe, expect, it, beforeAll } from 'vitest';
import * as fs from 'node:fs';
import * as path from 'node:path';
import { cliTempDir, runCli as run } from '../helpers/cli.js';
import { gridMesh, rng } from '../helpers/meshes.js';
import { writeVtu } from '../../src/io/vtu.js';

let tmp = '';

beforeAll(() => {
  tmp = cliTempDir('steplens-cli-');
});

/** An ASCII legacy VTK file: two unit right triangles and a point velocity (hand-written). */
function smallVtk(u = '1 0 0'): string {
  return `# vtk DataFile Version 4.2
two triangles
ASCII
DATASET UNSTRUCTURED_GRID
POINTS 4 double
0 0 0  1 0 0  1 1 0  0 1 0
CELLS 2 8
3 0 1 2
3 0 2 3
CELL_TYPES 2
5 5
POINT_DATA 4
VECTORS velocity double
${u}  ${u}  ${u}  ${u}
`;
}

describe('steplens audit (process)', () => {
  it('--json: the summary contract on stdout, exit 0', () => {
    const f = path.join(tmp, 'two.vtk');
    fs.writeFileSync(f, smallVtk('2 0 0'));
    const r = run(['audit', f, '--json', '--top', '5']);
    expect(r.err).toBe('');
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    expect(j.mesh).toMatchObject({ cells: 2, points: 4, types: { triangle: 2, quad: 0 } });
    // h = 2A/P = 1/(2+√2) for a unit right triangle; λ = 2
    expect(j.limit.dt).toBeCloseTo(1 / (2 + Math.SQRT2) / 2, 14);
    expect(j.limit.cell).toBe(0);
    expect(j.limit.courant).toBe(1);
    expect(j.worst.map((w: { cell: number }) => w.cell)).toEqual([0, 1]);
    expect(j.units).toMatchObject({ length: 'm', time: 's', speed: 'm/s', coordinates: 'm' });
  });

  it('--cells and --vtu: the CSV contract and a VTU that reads back with the results', () => {
    const f = path.join(tmp, 'two.vtk');
    fs.writeFileSync(f, smallVtk());
    const csv = path.join(tmp, 'cells.csv');
    const vtu = path.join(tmp, 'out.vtu');
    const r = run(['audit', f, '--cells', csv, '--vtu', vtu, '--dt', '0.1']);
    expect(r.code).toBe(0);
    const lines = fs.readFileSync(csv, 'utf8').trimEnd().split('\n');
    const head = lines[0]!.split(',');
    for (const c of ['cell', 'type', 'area', 'perimeter', 'inradius', 'speed', 'dt', 'radius_ratio', 'min_angle', 'courant']) expect(head).toContain(c);
    expect(lines).toHaveLength(3);
    expect(lines[1]!.split(',')[head.indexOf('area')]).toBe('0.5');
    const back = run(['audit', vtu, '--json']);
    expect(back.code).toBe(0);
    expect(JSON.parse(back.out).limit.dt).toBeCloseTo(1 / (2 + Math.SQRT2), 14);
    expect(fs.readdirSync(tmp).filter((n) => n.endsWith('.tmp'))).toEqual([]);
  });

  it('--fail-below exits 3 under the limit and 0 above it', () => {
    const f = path.join(tmp, 'two.vtk');
    fs.writeFileSync(f, smallVtk());
    expect(run(['audit', f, '--fail-below', '1']).code).toBe(3);
    expect(run(['audit', f, '--fail-below', '0.1']).code).toBe(0);
  });

  it('bad usage and bad files exit 2 with one clear line naming the file', () => {
    const missing = run(['audit', path.join(tmp, 'nope.vtu')]);
    expect(missing.code).toBe(2);
    expect(missing.err).toMatch(/nope\.vtu: no such file/);
    const empty = path.join(tmp, 'empty.vtu');
    fs.writeFileSync(empty, '');
    const e = run(['audit', empty]);
    expect(e.code).toBe(2);
    expect(e.err.trim().split('\n')).toHaveLength(1);
    expect(e.err).toMatch(/empty\.vtu: the file is empty/);
    const f = path.join(tmp, 'two.vtk');
    fs.writeFileSync(f, smallVtk());
    const noVel = run(['audit', f, '--velocity', 'speed']);
    expect(noVel.code).toBe(2);
    expect(noVel.err).toMatch(/no array named "speed".*velocity \(point, 3\)/);
    expect(run(['audit', f, '--model', 'magic']).code).toBe(2);
    expect(run(['audit', f, '--bogus']).code).toBe(2);
    expect(run(['audit', f, '--cells', f]).err).toMatch(/refusing to overwrite the input/);
    expect(run(['audit', f, '--cells', path.join(tmp, 'no/such/dir/x.csv')]).err).toMatch(/does not exist/);
    const nan = path.join(tmp, 'nan.vtk');
    fs.writeFileSync(nan, smallVtk('nan 0 0'));
    const rn = run(['audit', nan]);
    expect(rn.code).toBe(2);
    expect(rn.err).toMatch(/nan\.vtk: array "velocity" holds NaN at tuple 0/);
    expect(rn.err).not.toMatch(/at .*\.js:/); // no stack trace without --debug
  });

  it('--time/--space take C from von Neumann analysis; --courant overrides; an unstable pairing is refused', () => {
    const f = path.join(tmp, 'two.vtk');
    fs.writeFileSync(f, smallVtk());
    const j = JSON.parse(run(['audit', f, '--json', '--time', 'rk4', '--space', 'central2']).out);
    // RK4 with second-order central differences: 2√2 (textbook: RK4's imaginary-axis interval)
    expect(j.limit.courant).toBeCloseTo(2 * Math.SQRT2, 9);
    expect(j.limit.courant_source).toMatch(/von Neumann analysis of rk4 × central2/);
    expect(j.limit.dt).toBeCloseTo((2 * Math.SQRT2) / (2 + Math.SQRT2), 9);
    const o = JSON.parse(run(['audit', f, '--json', '--time', 'rk4', '--space', 'central2', '--courant', '0.5']).out);
    expect(o.limit.courant).toBe(0.5);
    expect(o.limit.courant_source).toMatch(/--courant/);
    const bad = run(['audit', f, '--time', 'euler', '--space', 'central2']);
    expect(bad.code).toBe(2);
    expect(bad.err).toMatch(/euler × central2 is (weakly )?unstable/);
    expect(run(['audit', f, '--time', 'rk4']).err).toMatch(/--time and --space go together/);
  });

  it('a .pvtu: pieces read on 1 and 2 threads give the same bytes, and the report names the piece of the limit', () => {
    const dir = fs.mkdtempSync(path.join(tmp, 'pvtu-'));
    // writeVtu of two small grids with a uniform velocity; the second piece has the smaller cells
    const grid = (n: number, d: number, x0: number) => {
      const m = gridMesh(n, n, d, true, x0, 0);
      m.pointData.push({ name: 'velocity', components: 2, values: new Float64Array(2 * m.nPoints).fill(1) });
      return m;
    };
    fs.writeFileSync(path.join(dir, 'p0.vtu'), writeVtu(grid(4, 1, 0)));
    fs.writeFileSync(path.join(dir, 'p1.vtu'), writeVtu(grid(8, 0.5, 4)));
    const pvtu = `<?xml version="1.0"?>
<VTKFile type="PUnstructuredGrid" version="1.0" byte_order="LittleEndian" header_type="UInt32">
 <PUnstructuredGrid GhostLevel="0">
  <PPointData><PDataArray type="Float64" Name="velocity" NumberOfComponents="2"/></PPointData>
  <PPoints><PDataArray type="Float64" NumberOfComponents="3"/></PPoints>
  <Piece Source="p0.vtu"/>
  <Piece Source="p1.vtu"/>
 </PUnstructuredGrid>
</VTKFile>
`;
    const f = path.join(dir, 'run.pvtu');
    fs.writeFileSync(f, pvtu);
    const a = run(['audit', f, '--json', '--threads', '1', '--cells', path.join(dir, 'one.csv')]);
    const b = run(['audit', f, '--json', '--threads', '2', '--cells', path.join(dir, 'two.csv')]);
    expect(a.code, a.err).toBe(0);
    expect(b.code, b.err).toBe(0);
    expect(fs.readFileSync(path.join(dir, 'one.csv'))).toEqual(fs.readFileSync(path.join(dir, 'two.csv')));
    const j = JSON.parse(a.out);
    expect(j.mesh.cells).toBe(2 * 16 + 2 * 64);
    // cell order is piece order: the first 32 cells come from p0, the limit sits in p1
    expect(j.limit.cell).toBeGreaterThanOrEqual(32);
    expect(j.limit.piece.index).toBe(1);
    expect(j.limit.piece.file).toMatch(/p1\.vtu$/);
    fs.rmSync(path.join(dir, 'p1.vtu'));
    const missing = run(['audit', f]);
    expect(missing.code).toBe(2);
    expect(missing.err).toMatch(/p1\.vtu/);
  });

  it('a mesh big enough for threads: --threads 2 writes what --threads 1 writes (JSON, both CSV column sets)', () => {
    // 259 200 triangles with 64-bit ids, as common writers store them: the raw id bytes are
    // recycled for the geometry under --threads 2, which must not change a byte of the output
    const m = gridMesh(360, 360, 3, true, 4.2e5, 5.1e6);
    const next = rng(21);
    for (let i = 0; i < m.points.length; i++) m.points[i] = m.points[i]! + (next() - 0.5);
    const vel = new Float64Array(3 * m.nPoints).map((_, i) => (i % 3 === 2 ? 0 : next() - 0.3));
    const f = path.join(tmp, 'big.vtu');
    fs.writeFileSync(f, writeVtu({ ...m, pointData: [{ name: 'velocity', components: 3, values: vel }] }, {}, { encoding: 'appended-raw', intType: 'Int64' }));
    const out = (k: number, set: string) => path.join(tmp, `big-${k}-${set}.csv`);
    for (const set of ['standard', 'all']) {
      const a = run(['audit', f, '--json', '--threads', '1', '--cells', out(1, set), '--cell-columns', set]);
      const b = run(['audit', f, '--json', '--threads', '2', '--cells', out(2, set), '--cell-columns', set]);
      expect(a.code, a.err).toBe(0);
      expect(b.code, b.err).toBe(0);
      expect(b.out).toBe(a.out);
      expect(Buffer.compare(fs.readFileSync(out(1, set)), fs.readFileSync(out(2, set)))).toBe(0);
    }
    expect(fs.readFileSync(out(1, 'standard'), 'utf8').slice(0, 200).split('\n')[0]).toBe('cell,type,area,perimeter,inradius,speed,dt,radius_ratio,min_angle,centroid_x,centroid_y,flags,cause');
    expect(fs.readFileSync(out(1, 'all'), 'utf8').slice(0, 300).split('\n')[0]).toBe('cell,type,area,perimeter,inradius,circumradius,speed,dt,radius_ratio,min_angle,max_angle,aspect_ratio,scaled_jacobian,condition,edge_ratio,centroid_x,centroid_y,flags,cause');
    const bad = run(['audit', f, '--cells', out(3, 'x'), '--cell-columns', 'some']);
    expect(bad.code).toBe(2);
    expect(bad.err).toMatch(/--cell-columns must be standard or all, got "some"/);
  });

  it('--help and --version', () => {
    expect(run(['--version']).out.trim()).toMatch(/^\d+\.\d+\.\d+$/);
    expect(run(['audit', '--help']).out).toMatch(/--fail-below/);
  });
});
