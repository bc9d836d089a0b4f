/**
 * The mesh model: a plain struct of typed arrays. No per-cell objects.
 *
 * Only 2-D cells are kept (linear triangles and quads), in the file's order of its 2-D cells.
 * Cell type ids follow VTK's numbering so that writers and readers agree on them.
 */
export const TRIANGLE = 5;
export const QUAD = 9;

export type CellTypeName = 'triangle' | 'quad';

export function cellTypeName(t: number): CellTypeName {
  return t === QUAD ? 'quad' : 'triangle';
}

/** Field values are stored as float64 or float32 (float32 is kept as read, never widened per value). */
export type FieldValues = Float64Array | Float32Array;

export interface DataArray {
  name: string;
  /** Number of components per tuple (1 for a scalar, 2 or 3 for a vector). */
  components: number;
  /** Tuples interleaved: values[i * components + k]. Length = tuples * components. */
  values: FieldValues;
}

export interface Mesh {
  /** x, y interleaved, float64, length 2 * nPoints. Every point in the file, used or not. */
  points: Float64Array;
  nPoints: number;
  /** Cell i uses cellNodes[cellOffsets[i] .. cellOffsets[i+1]). Length nCells + 1. */
  cellOffsets: Int32Array;
  /** 0-based point indices. */
  cellNodes: Int32Array;
  /** TRIANGLE or QUAD per cell. */
  cellTypes: Uint8Array;
  nCells: number;
  /** Arrays with one tuple per point. */
  pointData: DataArray[];
  /** Arrays with one tuple per kept 2-D cell (already subset to the kept cells, file order). */
  cellData: DataArray[];
  /** A time value stored in the file, if any (VTK TimeValue field, MSH data time). */
  time?: number;
  /** Format that was read, e.g. "vtu/appended-raw", "vtk-legacy/4.2-binary", "msh/4.1-ascii". */
  format: string;
  /** Non-fatal notes from the reader (higher-order cells reduced to corners, z ignored, ...). */
  warnings: string[];
}

/** A mesh of geometry only (no fields), from its arrays: what worker threads rebuild from shared memory. */
export function bareMesh(points: Float64Array, cellOffsets: Int32Array, cellNodes: Int32Array, cellTypes: Uint8Array, nCells = cellTypes.length): Mesh {
  return { points, nPoints: points.length / 2, cellOffsets, cellNodes, cellTypes, nCells, pointData: [], cellData: [], format: '', warnings: [] };
}

export function findArray(list: DataArray[], name: string): DataArray | undefined {
  for (const a of list) if (a.name === name) return a;
  return undefined;
}
