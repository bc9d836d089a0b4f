/** Small in-memory meshes for tests. */
import { QUAD, TRIANGLE, type DataArray, type Mesh } from '../../src/mesh/model.js';

export function meshOf(points: number[], cells: number[][], pointData: DataArray[] = [], cellData: DataArray[] = []): Mesh {
  const offsets = new Int32Array(cells.length + 1);
  const nodes: number[] = [];
  const types = new Uint8Array(cells.length);
  cells.forEach((c, i) => {
    nodes.push(...c);
    offsets[i + 1] = nodes.length;
    types[i] = c.length === 4 ? QUAD : TRIANGLE;
  });
  return {
    points: Float64Array.from(points),
    nPoints: points.length / 2,
    cellOffsets: offsets,
    cellNodes: Int32Array.from(nodes),
    cellTypes: types,
    nCells: cells.length,
    pointData,
    cellData,
    format: 'test',
    warnings: [],
  };
}

/** Structured nx × ny grid of squares of side d (quads, or each split into two triangles). */
export function gridMesh(nx: number, ny: number, d: number, split = false, x0 = 0, y0 = 0): Mesh {
  const pts: number[] = [];
  for (let j = 0; j <= ny; j++) for (let i = 0; i <= nx; i++) pts.push(x0 + i * d, y0 + j * d);
  const cells: number[][] = [];
  const id = (i: number, j: number) => j * (nx + 1) + i;
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      const a = id(i, j), b = id(i + 1, j), c = id(i + 1, j + 1), e = id(i, j + 1);
      if (split) { cells.push([a, b, c]); cells.push([a, c, e]); } else cells.push([a, b, c, e]);
    }
  }
  return meshOf(pts, cells);
}

export function vectorField(name: string, values: number[], components = 2): DataArray {
  return { name, components, values: Float64Array.from(values) };
}

export function scalarField(name: string, values: number[]): DataArray {
  return { name, components: 1, values: Float64Array.from(values) };
}

/** Deterministic PRNG (mulberry32) for tests. */
export function rng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
