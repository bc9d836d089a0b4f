/**
 * Shared by every reader: keep the 2-D cells of a file (in file order), reduce higher-order
 * cells to their corners, skip vertices and lines, and reject 3-D cells with a clear message.
 * Cell types come in VTK numbering; readers of other formats map their ids first.
 */
import { float64s, int32s, uint8s } from './alloc.js';
import { MeshInputError, type ErrorLocation } from './errors.js';
import { QUAD, TRIANGLE, type DataArray, type FieldValues, type Mesh } from './model.js';

const VTK_NAMES: Record<number, string> = {
  1: 'vertex', 2: 'poly-vertex', 3: 'line', 4: 'poly-line', 5: 'triangle', 6: 'triangle strip',
  7: 'polygon', 8: 'pixel', 9: 'quad', 10: 'tetrahedra', 11: 'voxels', 12: 'hexahedra',
  13: 'wedges', 14: 'pyramids', 15: 'pentagonal prisms', 16: 'hexagonal prisms',
  21: 'quadratic edges', 22: 'quadratic triangles', 23: 'quadratic quads', 24: 'quadratic tetrahedra',
  25: 'quadratic hexahedra', 26: 'quadratic wedges', 27: 'quadratic pyramids', 28: 'biquadratic quads',
  29: 'triquadratic hexahedra', 30: 'quadratic-linear quads', 31: 'quadratic-linear wedges',
  32: 'biquadratic-quadratic wedges', 33: 'biquadratic-quadratic hexahedra', 34: 'biquadratic triangles',
  35: 'cubic lines', 36: 'quadratic polygons', 37: 'triquadratic pyramids', 42: 'polyhedra',
  68: 'Lagrange curves', 69: 'Lagrange triangles', 70: 'Lagrange quads', 71: 'Lagrange tetrahedra',
  72: 'Lagrange hexahedra', 73: 'Lagrange wedges', 74: 'Lagrange pyramids', 75: 'Bezier curves',
  76: 'Bezier triangles', 77: 'Bezier quads', 78: 'Bezier tetrahedra', 79: 'Bezier hexahedra',
  80: 'Bezier wedges', 81: 'Bezier pyramids',
};

/** What a VTK cell type id becomes: 0 = skip (0-D/1-D), 3 = triangle, 4 = quad, -1 = 3-D, -2 = unsupported. */
function classify(t: number): number {
  switch (t) {
    case 1: case 2: case 3: case 4: case 21: case 35: case 68: case 75:
      return 0;
    case 5: case 22: case 34: case 69: case 76:
      return 3;
    case 9: case 8: case 23: case 28: case 30: case 70: case 77:
      return 4;
    case 7:
      return 7; // polygon: decided by its node count
    case 10: case 11: case 12: case 13: case 14: case 15: case 16: case 24: case 25: case 26:
    case 27: case 29: case 31: case 32: case 33: case 37: case 42: case 71: case 72: case 73:
    case 74: case 78: case 79: case 80: case 81:
      return -1;
    default:
      return -2;
  }
}

export function vtkCellTypeName(t: number): string {
  return VTK_NAMES[t] ?? `cell type ${t}`;
}

export interface RawCells {
  /** VTK cell type id per cell. */
  types: ArrayLike<number>;
  /** Start of each cell in connectivity, length nCells + 1 (last = connectivity length). */
  offsets: ArrayLike<number>;
  connectivity: ArrayLike<number>;
}

export interface KeptCells {
  cellTypes: Uint8Array;
  cellOffsets: Int32Array;
  cellNodes: Int32Array;
  /** Indices (into the file's cells) of the kept cells, or null when every cell was kept. */
  kept: Int32Array | null;
  nRawCells: number;
  warnings: string[];
}

/**
 * Keep the 2-D cells. `nPoints` bounds node indices; `loc` names the file in errors.
 * `describeCell(i)` may give a better location for cell i (line number); optional.
 */
export function keepSurfaceCells(
  raw: RawCells,
  nPoints: number,
  loc: ErrorLocation,
  describeCell?: (i: number) => ErrorLocation,
): KeptCells {
  const n = raw.types.length;
  const { types, offsets, connectivity } = raw;
  if (offsets.length !== n + 1) {
    throw new MeshInputError(`cell offsets hold ${offsets.length - 1} cells but ${n} cell types are given`, loc);
  }
  let nKeep = 0;
  let nNodes = 0;
  let nHigher = 0;
  let nSkipped = 0;
  // every cell a plain triangle (5) or quad (9) with exactly its nodes: the arrays can be kept as they are
  // (only arrays that own their whole buffer: never a view into the file's bytes, which callers may reuse or transfer)
  let plain = types instanceof Uint8Array && offsets instanceof Int32Array && connectivity instanceof Int32Array && offsets[0] === 0 &&
    ownsBuffer(types) && ownsBuffer(offsets) && ownsBuffer(connectivity);
  const count3d = new Map<number, number>();
  for (let i = 0; i < n; i++) {
    const t = types[i]!;
    const c = classify(t);
    const start = offsets[i]!;
    const end = offsets[i + 1]!;
    const len = end - start;
    if (!(len >= 0) || end > connectivity.length || start < 0) {
      throw new MeshInputError(`cell ${i} has an invalid extent [${start}, ${end}) in a connectivity of ${connectivity.length} entries`, describeCell ? describeCell(i) : loc);
    }
    if (c === 0) { nSkipped++; continue; }
    if (c === -1) { count3d.set(t, (count3d.get(t) ?? 0) + 1); continue; }
    if (c === -2) throw new MeshInputError(`unknown cell type id ${t} (cell ${i})`, describeCell ? describeCell(i) : loc);
    let k: number;
    if (c === 7) {
      if (len === 3) k = 3;
      else if (len === 4) k = 4;
      else throw new MeshInputError(`cell ${i} is a polygon with ${len} nodes; only triangles and quads are supported`, describeCell ? describeCell(i) : loc);
    } else {
      k = c;
      if (len < k) throw new MeshInputError(`cell ${i} (${vtkCellTypeName(t)}) has ${len} nodes, needs at least ${k}`, describeCell ? describeCell(i) : loc);
      if (len > k) nHigher++;
    }
    nKeep++;
    nNodes += k;
    if (plain && !((t === 5 && len === 3) || (t === 9 && len === 4))) plain = false;
  }
  if (count3d.size > 0) {
    const what = [...count3d.entries()].map(([t, m]) => `${m} ${vtkCellTypeName(t)}`).join(', ');
    throw new MeshInputError(`2-D meshes only: found ${what}`, loc);
  }
  if (plain && nKeep === n && nNodes === connectivity.length) {
    const conn = connectivity as Int32Array;
    for (let i = 0; i < n; i++) {
      for (let a = offsets[i]!, e = offsets[i + 1]!; a < e; a++) {
        const v = conn[a]!;
        if (!(v >= 0 && v < nPoints)) throw new MeshInputError(`cell ${i} uses node ${v}, outside 0..${nPoints - 1}`, describeCell ? describeCell(i) : loc);
      }
    }
    const warnings: string[] = [];
    return { cellTypes: types as Uint8Array, cellOffsets: offsets as Int32Array, cellNodes: conn, kept: null, nRawCells: n, warnings };
  }
  const cellTypes = uint8s(nKeep);
  const cellOffsets = int32s(nKeep + 1);
  const cellNodes = int32s(nNodes);
  const kept = nKeep === n ? null : new Int32Array(nKeep);
  let j = 0;
  let p = 0;
  for (let i = 0; i < n; i++) {
    const t = types[i]!;
    const c = classify(t);
    if (c === 0) continue;
    const start = offsets[i]!;
    const len = offsets[i + 1]! - start;
    const k = c === 7 ? len : c;
    cellTypes[j] = k === 3 ? TRIANGLE : QUAD;
    if (kept) kept[j] = i;
    for (let a = 0; a < k; a++) {
      // VTK pixels order their nodes 0,1,3,2
      const src = t === 8 ? start + (a === 2 ? 3 : a === 3 ? 2 : a) : start + a;
      const v = connectivity[src]!;
      if (!(v >= 0 && v < nPoints) || v !== Math.floor(v)) {
        throw new MeshInputError(`cell ${i} uses node ${v}, outside 0..${nPoints - 1}`, describeCell ? describeCell(i) : loc);
      }
      cellNodes[p++] = v;
    }
    j++;
    cellOffsets[j] = p;
  }
  const warnings: string[] = [];
  if (nHigher > 0) warnings.push(`${nHigher} higher-order cells reduced to their corner nodes`);
  void nSkipped;
  return { cellTypes, cellOffsets, cellNodes, kept, nRawCells: n, warnings };
}

function ownsBuffer(a: ArrayBufferView): boolean {
  return a.byteOffset === 0 && a.byteLength === a.buffer.byteLength;
}

/** Subset per-cell arrays (one tuple per file cell) to the kept cells. */
export function subsetCellData(arrays: DataArray[], kept: Int32Array | null): DataArray[] {
  if (!kept) return arrays;
  return arrays.map((a) => {
    const m = a.components;
    const out: FieldValues = a.values instanceof Float32Array ? new Float32Array(kept.length * m) : new Float64Array(kept.length * m);
    for (let j = 0; j < kept.length; j++) {
      const s = kept[j]! * m;
      for (let k = 0; k < m; k++) out[j * m + k] = a.values[s + k]!;
    }
    return { name: a.name, components: m, values: out };
  });
}

/**
 * Largest coordinate magnitude read. Cell geometry squares and multiplies coordinate
 * differences: below ±1e150 these stay under 4e300, far from the float64 limit (about 1.8e308),
 * while a point at 1e308 makes areas infinite and inscribed lengths NaN.
 */
export const MAX_COORDINATE = 1e150;

/** |v| ≤ MAX_COORDINATE (false for NaN and ±Infinity). */
export function usableCoordinate(v: number): boolean {
  return v <= MAX_COORDINATE && v >= -MAX_COORDINATE;
}

/** Why a point with an unusable coordinate is refused, e.g. `point 3 has a non-finite coordinate (NaN, 0)`. */
export function badPointMessage(point: string, ...coords: number[]): string {
  const list = coords.join(', ');
  return coords.every(Number.isFinite)
    ? `${point} has a coordinate beyond ±${MAX_COORDINATE} (${list}), too large for its cells' geometry to be computed`
    : `${point} has a non-finite coordinate (${list})`;
}

/**
 * x,y from coordinates with `dim` components per point (2 or 3). Adds a warning when z varies
 * (the mesh is projected onto the x-y plane).
 */
export function planarPoints(coords: ArrayLike<number>, nPoints: number, dim: number, warnings: string[], loc: ErrorLocation): Float64Array {
  if (coords.length < nPoints * dim) {
    throw new MeshInputError(`points array holds ${coords.length} values, ${nPoints * dim} expected`, loc);
  }
  const out = float64s(nPoints * 2);
  let zmin = Infinity;
  let zmax = -Infinity;
  for (let i = 0; i < nPoints; i++) {
    const x = coords[i * dim]!;
    const y = coords[i * dim + 1]!;
    if (!usableCoordinate(x) || !usableCoordinate(y)) throw new MeshInputError(badPointMessage(`point ${i}`, x, y), loc);
    out[2 * i] = x;
    out[2 * i + 1] = y;
    if (dim > 2) {
      const z = coords[i * dim + 2]!;
      if (z < zmin) zmin = z;
      if (z > zmax) zmax = z;
    }
  }
  if (dim > 2 && nPoints > 0) {
    if (!Number.isFinite(zmin) || !Number.isFinite(zmax)) {
      throw new MeshInputError('a point has a non-finite z coordinate', loc);
    }
    if (zmax > zmin) warnings.push(`z varies from ${zmin} to ${zmax}; the mesh is read as its projection on the x-y plane`);
  }
  return out;
}

/** Assemble a Mesh from kept cells and arrays, merging warnings. */
export function assembleMesh(args: {
  points: Float64Array;
  cells: KeptCells;
  pointData: DataArray[];
  cellData: DataArray[];
  format: string;
  warnings?: string[];
  time?: number;
}): Mesh {
  const mesh: Mesh = {
    points: args.points,
    nPoints: args.points.length / 2,
    cellOffsets: args.cells.cellOffsets,
    cellNodes: args.cells.cellNodes,
    cellTypes: args.cells.cellTypes,
    nCells: args.cells.cellTypes.length,
    pointData: args.pointData,
    cellData: subsetCellData(args.cellData, args.cells.kept),
    format: args.format,
    warnings: [...(args.warnings ?? []), ...args.cells.warnings],
  };
  if (args.time !== undefined) mesh.time = args.time;
  return mesh;
}
