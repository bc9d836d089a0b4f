// Worker threads run the built module (dist/, made by `npm run build:cli`): a worker cannot load
// TypeScript sources. Results must equal the one-thread results bit for bit.
import { beforeAll, describe, expect, it } from 'vitest';
import * as fs from 'node:fs';
import * as os from 'node:os';
import * as path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { runAudit, type AuditResult } from '../../src/audit/audit.js';
import { computeGeometry, CORE_FIELDS, SHAPE_FIELDS, type CellGeometry } from '../../src/geometry/cells.js';
import { cellsCsvBytes } from '../../src/io/csv.js';
import { writeVtu } from '../../src/io/vtu.js';
import type { Mesh } from '../../src/mesh/model.js';
import { readMesh } from '../../src/mesh/read.js';
import { gridMesh, rng } from '../helpers/meshes.js';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
const built = path.join(root, 'dist/cli/parallel.js');

interface ParallelModule {
  parallelGeometry(mesh: Mesh, threads: number, options?: { coords?: string; lengthUnit?: string; into?: CellGeometry }): Promise<CellGeometry>;
  readMeshParallel(file: string, threads: number): Promise<Mesh>;
  threadsOption(value: unknown): number;
  MIN_CELLS_PER_THREAD: number;
}

interface CsvModule {
  writeCellsCsv(fd: number, r: AuditResult, extra: { name: string; values: Float64Array | Int32Array }[], threads: number, options?: object, set?: 'standard' | 'all'): void;
}

let par: ParallelModule;
let csv: CsvModule;

beforeAll(async () => {
  if (!fs.existsSync(built)) throw new Error('run `npm run build:cli` first (npm test does)');
  par = (await import(pathToFileURL(built).href)) as ParallelModule;
  csv = (await import(pathToFileURL(path.join(root, 'dist/cli/parallel-csv.js')).href)) as CsvModule;
});

/** A jittered grid of triangles (and quads in the lower part), big enough to be split. */
function bigMesh(x0: number, y0: number, d: number): Mesh {
  const tri = gridMesh(400, 300, d, true, x0, y0);
  const next = rng(9);
  for (let i = 0; i < tri.points.length; i++) tri.points[i] = tri.points[i]! + (next() - 0.5) * 0.4 * d;
  // turn the first 20 000 triangle pairs into quads (same nodes, no diagonal)
  const nodes: number[] = [];
  const types: number[] = [];
  const offsets = [0];
  for (let i = 0; i < tri.nCells; i += 2) {
    const a = tri.cellNodes.subarray(3 * i, 3 * i + 3), b = tri.cellNodes.subarray(3 * i + 3, 3 * i + 6);
    if (i < 40_000) { nodes.push(a[0]!, a[1]!, a[2]!, b[2]!); types.push(9); offsets.push(nodes.length); continue; }
    nodes.push(...a); types.push(5); offsets.push(nodes.length);
    nodes.push(...b); types.push(5); offsets.push(nodes.length);
  }
  return { ...tri, cellNodes: Int32Array.from(nodes), cellOffsets: Int32Array.from(offsets), cellTypes: Uint8Array.from(types), nCells: types.length };
}

function bits(a: Float64Array | Uint8Array): Uint8Array {
  return new Uint8Array(a.buffer, a.byteOffset, a.byteLength);
}

function expectIdentical(a: CellGeometry, b: CellGeometry): void {
  expect(b.orientation).toBe(a.orientation);
  for (const key of [...CORE_FIELDS, ...SHAPE_FIELDS, 'flags'] as const) {
    expect(Buffer.compare(bits(a[key]), bits(b[key])), key).toBe(0);
  }
}

describe('parallel geometry', () => {
  it('equals the one-thread geometry bit for bit (planar, km input, geographic)', async () => {
    const m = bigMesh(4.2e5, 5.1e6, 2);
    expect(m.nCells).toBeGreaterThan(2 * par.MIN_CELLS_PER_THREAD);
    expectIdentical(computeGeometry(m), await par.parallelGeometry(m, 3));
    const scaled = { ...m, points: m.points.map((v) => v * 1000) };
    expectIdentical(computeGeometry(scaled), await par.parallelGeometry(m, 2, { lengthUnit: 'km' }));
    const geo = bigMesh(-3.5, 50.2, 1e-4);
    expectIdentical(computeGeometry(geo, undefined, 'geographic'), await par.parallelGeometry(geo, 2, { coords: 'geographic' }));
  });

  it('refills shared arrays it returned before; small meshes stay on one thread', async () => {
    const m = bigMesh(0, 0, 1);
    const first = await par.parallelGeometry(m, 2);
    const again = await par.parallelGeometry(m, 2, { into: first });
    expect(again.area).toBe(first.area);
    expect(again.flags).toBe(first.flags);
    expectIdentical(computeGeometry(m), again);
    const small = gridMesh(10, 10, 1, true);
    expectIdentical(computeGeometry(small), await par.parallelGeometry(small, 4));
  });

  it('--threads takes a whole number of threads', () => {
    expect(par.threadsOption('3')).toBe(3);
    expect(par.threadsOption(undefined)).toBeGreaterThanOrEqual(1);
    expect(() => par.threadsOption('0')).toThrow(/--threads must be a whole number/);
    expect(() => par.threadsOption('two')).toThrow(/--threads/);
  });
});

describe('CSV rows formatted by threads', () => {
  it('writes the bytes the one-thread writer gives', async () => {
    const m = bigMesh(4.2e5, 5.1e6, 2);
    const next = rng(4);
    m.pointData.push({ name: 'velocity', components: 2, values: new Float64Array(2 * m.nPoints).map(() => next() - 0.5) });
    const r = runAudit(m, { geometry: await par.parallelGeometry(m, 2), dt: 0.1 });
    const eager = runAudit(m, { dt: 0.1 });
    const extra = [{ name: 'level', values: new Int32Array(m.nCells).map((_, i) => i % 3) }];
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'steplens-csv-'));
    try {
      const file = path.join(dir, 'cells.csv');
      for (const set of ['standard', 'all'] as const) {
        const fd = fs.openSync(file, 'w');
        csv.writeCellsCsv(fd, r, extra, 3, {}, set);
        fs.closeSync(fd);
        // the threads computed the shape measures block by block, never all at once
        expect(r.geom.deferred?.computed).toBe(false);
        const one = Buffer.concat(Array.from(cellsCsvBytes(eager, extra, 2 ** 20, set), (c) => Buffer.from(c)));
        expect(Buffer.compare(fs.readFileSync(file), one), set).toBe(0);
      }
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });
});

describe('pieces read side by side', () => {
  it('a .pvtu read by workers equals the one-thread read; a missing or broken piece is named', async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'steplens-par-'));
    try {
      const pieces = [0, 1, 2].map((k) => {
        const g = gridMesh(20, 10, 1, k === 1, 20 * k, 0);
        const vel = new Float64Array(3 * g.nPoints).map((_, i) => (i % 3) + k);
        return { ...g, pointData: [{ name: 'velocity', components: 3, values: vel }] };
      });
      const index = (names: string[]) => `<VTKFile type="PUnstructuredGrid"><PUnstructuredGrid>${names.map((s) => `<Piece Source="${s}"/>`).join('')}</PUnstructuredGrid></VTKFile>`;
      pieces.forEach((p, k) => fs.writeFileSync(path.join(dir, `p${k}.vtu`), writeVtu(p, {}, { encoding: 'appended-raw' })));
      const file = path.join(dir, 'all.pvtu');
      fs.writeFileSync(file, index(['p0.vtu', 'p1.vtu', 'p2.vtu']));
      const load = (name: string) => (fs.existsSync(name) ? new Uint8Array(fs.readFileSync(name)) : null);
      const one = readMesh(new Uint8Array(fs.readFileSync(file)), file, { loadSibling: load });
      expect(await par.readMeshParallel(file, 2)).toEqual(one);
      expect(one.nCells).toBe(200 + 400 + 200);

      fs.writeFileSync(file, index(['p0.vtu', 'p9.vtu']));
      await expect(par.readMeshParallel(file, 2)).rejects.toThrow(/piece "p9\.vtu" was not found/);
      fs.writeFileSync(path.join(dir, 'p9.vtu'), '<VTKFile type="UnstructuredGrid"><UnstructuredGrid><Piece NumberOfPoints="2"');
      await expect(par.readMeshParallel(file, 2)).rejects.toMatchObject({ name: 'MeshInputError', location: { file: path.join(dir, 'p9.vtu') } });
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });
});
