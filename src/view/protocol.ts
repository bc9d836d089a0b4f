/**
 * Messages between the app (main thread) and the worker that reads and audits meshes.
 * Big arrays travel as transferred buffers; the worker keeps the mesh and the audit result.
 */
import type { AuditOptions, AuditSummary } from '../audit/audit.js';
import type { FieldId } from './fields.js';

export interface FileBytes {
  name: string;
  bytes: ArrayBuffer;
}

export type MeshSource =
  | { kind: 'files'; files: FileBytes[]; primary: string }
  | { kind: 'url'; url: string };

export type Request =
  /**
   * Read a mesh from files the user gave, or from a same-origin URL the worker fetches itself.
   * `auto`: choose the physics from the file's arrays, keeping `options.file` and `options.top`.
   */
  | { kind: 'load'; seq: number; source: MeshSource; options: AuditOptions; auto: boolean; field: FieldId }
  | { kind: 'audit'; seq: number; options: AuditOptions; field: FieldId }
  | { kind: 'field'; seq: number; field: FieldId }
  | { kind: 'cell'; seq: number; cell: number }
  | { kind: 'export'; seq: number; what: 'csv' | 'json' }
  | { kind: 'index'; seq: number }
  | { kind: 'edges'; seq: number };

export interface ArrayInfo {
  name: string;
  components: number;
  where: 'point' | 'cell';
}

/** What the view needs of a mesh: drawing buffers, picking data and a description. */
export interface MeshPayload {
  name: string;
  format: string;
  nCells: number;
  nPoints: number;
  nTriangles: number;
  nQuads: number;
  warnings: string[];
  arrays: ArrayInfo[];
  /** Subtracted from every coordinate before the float32 upload. */
  centerX: number;
  centerY: number;
  /** Bounding box of the points used by cells, in file coordinates. */
  minX: number;
  minY: number;
  maxX: number;
  maxY: number;
  /** Unshared vertices (x, y relative to the centre), three per drawn triangle. */
  positions: Float32Array;
  /** Cell id of each vertex (exact in float32 below 2^24 cells). */
  cellIds: Float32Array;
  /** File coordinates and connectivity for picking (copies of the worker's mesh). */
  points: Float64Array;
  cellOffsets: Int32Array;
  cellNodes: Int32Array;
  cellTypes: Uint8Array;
  /** Cell centroids, x, y interleaved, file coordinates. */
  centroids: Float64Array;
}

/** One display field as float32 with sentinels: -1 = no limit (infinite), -2 = undefined. */
export interface FieldPayload {
  field: FieldId;
  values: Float32Array;
  /** Smallest and largest regular values (positive ones for log fields); NaN when there are none. */
  min: number;
  max: number;
}

export interface AuditPayload {
  summary: AuditSummary;
  options: AuditOptions;
  /** Allowed step per cell (Infinity = no limit, 0 = degenerate). */
  dt: Float64Array;
  hasCourant: boolean;
  field: FieldPayload;
}

export interface CellInfo {
  cell: number;
  type: 'triangle' | 'quad';
  nodes: number[];
  area: number;
  perimeter: number;
  h: number;
  speed: number;
  dt: number;
  courant: number | null;
  radiusRatio: number;
  minAngle: number;
  maxAngle: number;
  aspectRatio: number;
  cause: number;
  causeText: string;
  centroidX: number;
  centroidY: number;
}

export interface ErrorPayload {
  /** 'input' for a bad file, 'usage' for a bad setting, 'internal' for anything else. */
  kind: 'input' | 'usage' | 'internal';
  detail: string;
  message: string;
  file?: string;
  line?: number;
  byteOffset?: number;
  /** For internal errors: where it happened, to quote in a bug report. */
  stack?: string;
}

export type Reply =
  | { kind: 'progress'; seq: number; stage: string; fraction: number | null }
  /** `note`: what the automatic settings assumed, if anything worth saying. */
  | { kind: 'loaded'; seq: number; mesh: MeshPayload; audit: AuditPayload; note: string | null; ms: number; stages: Record<string, number> }
  | { kind: 'audited'; seq: number; audit: AuditPayload; ms: number }
  | { kind: 'field'; seq: number; field: FieldPayload }
  | { kind: 'cell'; seq: number; info: CellInfo }
  /** The file's bytes in parts (a big table never becomes one string or one copy). */
  | { kind: 'export'; seq: number; what: 'csv' | 'json'; parts: Uint8Array[] }
  /** Flatbush index of cell bounding boxes (file coordinates), item i = cell i. */
  | { kind: 'index'; seq: number; index: ArrayBuffer }
  | { kind: 'edges'; seq: number; positions: Float32Array; lengths: Float32Array }
  | { kind: 'error'; seq: number; error: ErrorPayload };
