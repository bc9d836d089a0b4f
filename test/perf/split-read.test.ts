// Large reads split over two threads must give the bytes a plain read gives, report short reads
// where the file ends, and leave the mesh as the one-thread reader makes it. The helper thread
// runs the built module (dist/), as every worker does.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as fs from 'node:fs';
import * as os from 'node:os';
import * as path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { writeVtu } from '../../src/io/vtu.js';
import type { Mesh } from '../../src/mesh/model.js';
import { gridMesh } from '../helpers/meshes.js';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');

interface SplitModule {
  SPLIT_READ_MIN: number;
  SplitReader: new () => { read(fd: number, out: Uint8Array, position: number): number; close(): Promise<void> };
}
interface LargeModule {
  readMeshFile(file: string, options?: { threads?: number }): Mesh;
}
interface AllocModule {
  allocateShared(on: boolean): void;
}

let split: SplitModule;
let large: LargeModule;
let alloc: AllocModule;
let dir = '';

beforeAll(async () => {
  const built = path.join(root, 'dist/cli/split-read.js');
  if (!fs.existsSync(built)) throw new Error('run `npm run build:cli` first (npm test does)');
  split = (await import(pathToFileURL(built).href)) as SplitModule;
  large = (await import(pathToFileURL(path.join(root, 'dist/cli/large-vtu.js')).href)) as LargeModule;
  alloc = (await import(pathToFileURL(path.join(root, 'dist/mesh/alloc.js')).href)) as AllocModule;
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'steplens-split-'));
});

afterAll(() => {
  alloc.allocateShared(false);
  fs.rmSync(dir, { recursive: true, force: true });
});

describe('reads split over two threads', () => {
  it('give the bytes of a plain read, from any offset; a read past the end stops where the file ends', async () => {
    const n = 2 * split.SPLIT_READ_MIN + 12_345;
    const bytes = new Uint8Array(n);
    for (let i = 0; i < n; i++) bytes[i] = Math.imul(i, 2654435761) >>> 24;
    const file = path.join(dir, 'blob.bin');
    fs.writeFileSync(file, bytes);
    const reader = new split.SplitReader();
    const fd = fs.openSync(file, 'r');
    try {
      const out = new Uint8Array(new SharedArrayBuffer(n - 777));
      expect(reader.read(fd, out, 777)).toBe(n - 777);
      expect(Buffer.compare(Buffer.from(out), Buffer.from(bytes.subarray(777)))).toBe(0);
      // past the end: the bytes there are, in order
      const over = new Uint8Array(new SharedArrayBuffer(split.SPLIT_READ_MIN + 4096));
      expect(reader.read(fd, over, n - split.SPLIT_READ_MIN)).toBe(split.SPLIT_READ_MIN);
      expect(Buffer.compare(Buffer.from(over.subarray(0, split.SPLIT_READ_MIN)), Buffer.from(bytes.subarray(n - split.SPLIT_READ_MIN)))).toBe(0);
      // a read whose first half is already short
      const early = new Uint8Array(new SharedArrayBuffer(2 * split.SPLIT_READ_MIN));
      expect(reader.read(fd, early, n - 1000)).toBe(1000);
    } finally {
      fs.closeSync(fd);
      await reader.close();
    }
  });

  it('a mesh file read with two threads equals the one-thread read', () => {
    // about 70 MB of appended raw data with 64-bit ids: big enough for split reads
    const m = gridMesh(900, 700, 2, true, 4.2e5, 5.1e6);
    const vel = new Float64Array(3 * m.nPoints).map((_, i) => (i % 3 === 2 ? 0 : Math.sin(i)));
    const file = path.join(dir, 'big.vtu');
    fs.writeFileSync(file, writeVtu({ ...m, pointData: [{ name: 'velocity', components: 3, values: vel }] }, {}, { encoding: 'appended-raw', intType: 'Int64' }));
    expect(fs.statSync(file).size).toBeGreaterThan(4 * split.SPLIT_READ_MIN);
    const one = large.readMeshFile(file);
    alloc.allocateShared(true);
    const two = large.readMeshFile(file, { threads: 2 });
    alloc.allocateShared(false);
    expect(two.points.buffer).toBeInstanceOf(SharedArrayBuffer);
    expect(Buffer.compare(Buffer.from(two.points.buffer, two.points.byteOffset, two.points.byteLength), Buffer.from(one.points.buffer, one.points.byteOffset, one.points.byteLength))).toBe(0);
    expect(Array.from(two.cellNodes.subarray(0, 600))).toEqual(Array.from(one.cellNodes.subarray(0, 600)));
    expect(Buffer.compare(Buffer.from(two.cellNodes.buffer, two.cellNodes.byteOffset, two.cellNodes.byteLength), Buffer.from(one.cellNodes.buffer, one.cellNodes.byteOffset, one.cellNodes.byteLength))).toBe(0);
    const v1 = one.pointData[0]!.values, v2 = two.pointData[0]!.values;
    expect(Buffer.compare(Buffer.from(v2.buffer, v2.byteOffset, v2.byteLength), Buffer.from(v1.buffer, v1.byteOffset, v1.byteLength))).toBe(0);
  });
});
