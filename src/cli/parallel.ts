/**
 * Work spread over worker threads (Node only):
 * - the per-cell geometry: the mesh's arrays are shared once (SharedArrayBuffer) and every
 *   thread runs the same range kernel over its share of the cells, writing into shared result
 *   arrays, so the result equals the one-thread result bit for bit;
 * - the pieces of a partitioned file (.pvtu), read and decoded side by side, then joined in order.
 * This module is also its workers' entry point. The CSV rows are formatted by threads in
 * parallel-csv.ts.
 */
import { availableParallelism } from 'node:os';
import * as fs from 'node:fs';
import { isMainThread, parentPort, Worker, workerData } from 'node:worker_threads';
import { allocCore, coreRange, deferGeometry, markInverted, type CellGeometry, type CoreGeometry } from '../geometry/cells.js';
import type { CoordinateSystem } from '../geometry/geographic.js';
import { MeshInputError, SteplensError, UsageError, type ErrorLocation } from '../mesh/errors.js';
import { bareMesh, type Mesh } from '../mesh/model.js';
import { parseXmlHead } from '../mesh/vtkxml/xml.js';
import { joinPieces, missingPiece, pieceSources, PARALLEL_KINDS, type PieceSource } from '../mesh/vtkxml/pvtu.js';
import { lengthFactor } from '../physics/units.js';
import { sharedFloat64s, sharedUint8s } from '../mesh/alloc.js';
import { meshChecks, type MeshChecks } from '../audit/mesh-checks.js';
import { readMeshFile, type ReadFileOptions } from './large-vtu.js';

/** Fewer cells than this per thread: a worker's start-up costs more than it saves. */
export const MIN_CELLS_PER_THREAD = 100_000;

const WORKER_MARK = 'steplens-parallel';

export function defaultThreads(): number {
  return Math.max(1, availableParallelism());
}

/** The value of --threads: a positive integer, or the available cores when absent. */
export function threadsOption(value: unknown): number {
  if (value === undefined) return defaultThreads();
  const s = String(value).trim();
  const n = /^\d+$/.test(s) ? Number(s) : NaN;
  if (!(n >= 1 && n <= 1024)) throw new UsageError(`--threads must be a whole number from 1 to 1024, got "${s}"`);
  return n;
}

type Shareable = Float64Array | Int32Array | Uint8Array;

/** `a` on shared memory (one copy, unless it is shared already). */
export function shared<T extends Shareable>(a: T, make: (b: SharedArrayBuffer, n: number) => T): T {
  if (a.buffer instanceof SharedArrayBuffer) return a;
  const out = make(new SharedArrayBuffer(a.byteLength), a.length);
  (out as Shareable).set(a);
  return out;
}

/** Core geometry arrays (see coreRange) on shared memory (spare memory first: src/mesh/alloc.ts). */
function sharedCore(n: number): CoreGeometry {
  return allocCore(n, sharedFloat64s, sharedUint8s(n));
}

interface GeometryJob {
  kind: 'geometry';
  points: Float64Array;
  offsets: Int32Array;
  nodes: Int32Array;
  types: Uint8Array;
  core: CoreGeometry;
  from: number;
  to: number;
  coords: CoordinateSystem;
}

interface PieceJob {
  kind: 'piece';
  path: string;
  options: ReadFileOptions;
}

interface ChecksJob {
  kind: 'checks';
  points: Float64Array;
  offsets: Int32Array;
  nodes: Int32Array;
  nCells: number;
}

type Job = GeometryJob | PieceJob | ChecksJob;

interface WorkerReply {
  result?: unknown;
  error?: { kind: 'input' | 'usage' | 'other'; message: string; detail: string; location: ErrorLocation; stack?: string };
}

function runGeometryJob(job: GeometryJob): void {
  coreRange(bareMesh(job.points, job.offsets, job.nodes, job.types), job.core, job.from, job.to, job.coords);
}

function buffersOf(mesh: Mesh): ArrayBuffer[] {
  const set = new Set<ArrayBuffer>();
  const add = (a: ArrayBufferView): void => { if (a.buffer instanceof ArrayBuffer) set.add(a.buffer); };
  for (const a of [mesh.points, mesh.cellOffsets, mesh.cellNodes, mesh.cellTypes]) add(a);
  for (const d of [...mesh.pointData, ...mesh.cellData]) add(d.values);
  return [...set];
}

function serialiseError(e: unknown): WorkerReply['error'] {
  if (e instanceof SteplensError) return { kind: e.kind, message: e.message, detail: e.detail, location: { ...e.location }, ...(e.stack ? { stack: e.stack } : {}) };
  const err = e instanceof Error ? e : new Error(String(e));
  return { kind: 'other', message: err.message, detail: err.message, location: {}, ...(err.stack ? { stack: err.stack } : {}) };
}

function reviveError(e: NonNullable<WorkerReply['error']>): Error {
  const err = e.kind === 'input' ? new MeshInputError(e.detail, e.location) : e.kind === 'usage' ? new UsageError(e.detail) : new Error(e.message);
  if (e.stack && e.kind === 'other') err.stack = e.stack;
  return err;
}

/**
 * Worker threads kept for several batches of jobs; idle workers do not keep the process alive.
 * close() ends them.
 */
export class WorkerPool {
  private readonly workers: Worker[] = [];
  private broken = false;

  constructor(threads: number, url: URL = new URL(import.meta.url)) {
    for (let k = 0; k < Math.max(0, Math.floor(threads)); k++) {
      const w = new Worker(url, { workerData: WORKER_MARK });
      w.unref();
      this.workers.push(w);
    }
  }

  get size(): number {
    return this.workers.length;
  }

  /** Run `jobs`, each worker taking the next one when done; the results in job order. */
  run(jobs: Job[]): Promise<unknown[]> {
    if (this.broken) return Promise.reject(new Error('the worker pool stopped after an error'));
    if (this.workers.length === 0 && jobs.length > 0) return Promise.reject(new Error('the worker pool has no threads'));
    return new Promise((resolve, reject) => {
      const results: unknown[] = new Array(jobs.length);
      let next = 0;
      let done = 0;
      let over = jobs.length === 0;
      const cleanups: (() => void)[] = [];
      const finish = (error?: unknown): void => {
        over = true;
        for (const c of cleanups) c();
        if (error === undefined) resolve(results);
        else {
          this.broken = true;
          reject(error);
        }
      };
      if (over) { resolve(results); return; }
      for (const w of this.workers) {
        let current = -1;
        const feed = (): void => {
          if (over || next >= jobs.length) return;
          current = next++;
          w.postMessage(jobs[current]);
        };
        const onMessage = (reply: WorkerReply): void => {
          if (over) return;
          if (reply.error) { finish(reviveError(reply.error)); return; }
          results[current] = reply.result;
          if (++done === jobs.length) finish();
          else feed();
        };
        const onError = (e: unknown): void => { if (!over) finish(e); };
        const onExit = (code: number): void => { if (!over) finish(new Error(`a worker thread stopped (exit code ${code})`)); };
        w.ref();
        w.on('message', onMessage);
        w.on('error', onError);
        w.on('exit', onExit);
        cleanups.push(() => {
          w.off('message', onMessage);
          w.off('error', onError);
          w.off('exit', onExit);
          w.unref();
        });
        feed();
      }
    });
  }

  async close(): Promise<void> {
    await Promise.all(this.workers.map((w) => w.terminate()));
  }
}

/** Run `jobs` on `pool`, or on a pool of `threads` made for them and closed after. */
async function runJobs(jobs: Job[], threads: number, url: URL | undefined, pool: WorkerPool | undefined): Promise<unknown[]> {
  if (pool) return pool.run(jobs);
  const own = new WorkerPool(Math.min(threads, jobs.length), url);
  try {
    return await own.run(jobs);
  } finally {
    await own.close();
  }
}

export interface ParallelGeometryOptions {
  coords?: CoordinateSystem;
  /** Unit of planar coordinates, as given to runAudit (the points are scaled the same way). */
  lengthUnit?: string;
  /** The worker script (default: this module; tests point it at the built file). */
  workerUrl?: URL;
  /** Shared result arrays to fill (from a previous call, for repeated passes). */
  into?: CellGeometry;
  /** Workers to use (kept between calls) instead of starting threads - 1 for this call. */
  pool?: WorkerPool;
}

/**
 * The geometry runAudit would compute for `mesh` (with the same coords and lengthUnit), over
 * `threads` threads: pass it as AuditOptions.geometry. The calling thread takes one share. Only
 * the core arrays (the step limit's) are computed here, on shared memory; the shape measures
 * follow on first use (deferGeometry), or block by block in the threaded CSV writer.
 */
export async function parallelGeometry(mesh: Mesh, threads: number, options: ParallelGeometryOptions = {}): Promise<CellGeometry> {
  const coords = options.coords ?? 'planar';
  const lf = coords === 'planar' ? lengthFactor(options.lengthUnit) : 1;
  let points = mesh.points;
  if (lf !== 1) {
    points = new Float64Array(new SharedArrayBuffer(mesh.points.byteLength));
    for (let i = 0; i < points.length; i++) points[i] = mesh.points[i]! * lf;
  }
  const n = mesh.nCells;
  const wanted = options.pool ? options.pool.size + 1 : Math.floor(threads);
  const t = Math.max(1, Math.min(wanted, Math.floor(n / MIN_CELLS_PER_THREAD)));
  const into = options.into;
  const reuse = into && into.flags.length === n && into.flags.buffer instanceof SharedArrayBuffer;
  const core: CoreGeometry = reuse
    ? { signedArea: into.signedArea, area: into.area, perimeter: into.perimeter, inradius: into.inradius, radiusRatio: into.radiusRatio, flags: into.flags, orientation: 1 }
    : sharedCore(n);
  const base = {
    kind: 'geometry' as const,
    points: t > 1 ? shared(points, (b, m) => new Float64Array(b, 0, m)) : points,
    offsets: t > 1 ? shared(mesh.cellOffsets, (b, m) => new Int32Array(b, 0, m)) : mesh.cellOffsets,
    nodes: t > 1 ? shared(mesh.cellNodes, (b, m) => new Int32Array(b, 0, m)) : mesh.cellNodes,
    types: t > 1 ? shared(mesh.cellTypes.subarray(0, n), (b, m) => new Uint8Array(b, 0, m)) : mesh.cellTypes.subarray(0, n),
    core,
    coords,
  };
  const jobs: GeometryJob[] = [];
  for (let k = 0; k < t; k++) jobs.push({ ...base, from: Math.floor((n * k) / t), to: Math.floor((n * (k + 1)) / t) });
  const others = t > 1 ? runJobs(jobs.slice(1), t - 1, options.workerUrl, options.pool) : Promise.resolve([]);
  runGeometryJob(jobs[0]!);
  await others;
  markInverted(core);
  const on: Mesh = { ...mesh, points: base.points, cellOffsets: base.offsets, cellNodes: base.nodes, cellTypes: base.types };
  return deferGeometry(on, core, coords);
}

/**
 * meshChecks(mesh) on a worker thread, so that this thread can go on with the audit meanwhile
 * (startAudit, then finishAudit with the result). The mesh's arrays are shared, not copied, when
 * they are on shared memory already (src/mesh/alloc.ts).
 */
export function meshChecksOnWorker(mesh: Mesh, options: { workerUrl?: URL } = {}): Promise<MeshChecks> {
  const job: ChecksJob = {
    kind: 'checks',
    points: shared(mesh.points, (b, m) => new Float64Array(b, 0, m)),
    offsets: shared(mesh.cellOffsets, (b, m) => new Int32Array(b, 0, m)),
    nodes: shared(mesh.cellNodes, (b, m) => new Int32Array(b, 0, m)),
    nCells: mesh.nCells,
  };
  return runJobs([job], 1, options.workerUrl, undefined).then((r) => r[0] as MeshChecks);
}

/** The pieces a .pvtu / .pvtp names, or null when `file` is not a partitioned VTK XML file. */
export function partitionedPieces(file: string, bytes: Uint8Array): { kind: string; pieces: PieceSource[] } | null {
  let p = 0;
  while (p < bytes.length && p < 1024 && bytes[p] !== 60) p++;
  if (bytes[p] !== 60) return null;
  const { root } = parseXmlHead(bytes, file);
  if (root.name !== 'VTKFile' || PARALLEL_KINDS[root.attrs.get('type') ?? ''] === undefined) return null;
  return pieceSources(root, file);
}

export interface ParallelReadOptions extends ReadFileOptions {
  workerUrl?: URL;
  pool?: WorkerPool;
}

/**
 * Like readMeshFile, with the pieces of a partitioned file read by up to `threads` workers.
 * Other files (and one-piece or one-thread cases) are read on this thread.
 */
export async function readMeshParallel(file: string, threads: number, options: ParallelReadOptions = {}): Promise<Mesh> {
  const readOptions: ReadFileOptions = options.bufferLimit !== undefined ? { bufferLimit: options.bufferLimit } : {};
  let head: Uint8Array | null = null;
  if (threads > 1 && /\.p(vtu|vtp)$/i.test(file) && fs.existsSync(file) && fs.statSync(file).size < 64 * 2 ** 20) head = fs.readFileSync(file);
  const parts = head ? partitionedPieces(file, head) : null;
  if (!parts || parts.pieces.length < 2) return readMeshFile(file, { ...readOptions, threads, ...(options.onFile ? { onFile: options.onFile } : {}) });
  for (const p of parts.pieces) if (!fs.existsSync(p.path)) throw missingPiece(p, file);
  options.onFile?.(file);
  for (const p of parts.pieces) options.onFile?.(p.path);
  const jobs: PieceJob[] = parts.pieces.map((p) => ({ kind: 'piece', path: p.path, options: readOptions }));
  const meshes = (await runJobs(jobs, threads, options.workerUrl, options.pool)) as Mesh[];
  return joinPieces(meshes, parts.pieces, parts.kind, file).mesh;
}

// the workers' entry point: the last statement, once every constant above is set
if (!isMainThread && workerData === WORKER_MARK && parentPort) {
  const port = parentPort;
  port.on('message', (job: Job) => {
    try {
      if (job.kind === 'geometry') {
        runGeometryJob(job);
        port.postMessage({});
      } else if (job.kind === 'checks') {
        port.postMessage({ result: meshChecks(bareMesh(job.points, job.offsets, job.nodes, new Uint8Array(0), job.nCells)) });
      } else {
        const mesh = readMeshFile(job.path, job.options);
        port.postMessage({ result: mesh }, buffersOf(mesh));
      }
    } catch (e) {
      port.postMessage({ error: serialiseError(e) });
    }
  });
}
