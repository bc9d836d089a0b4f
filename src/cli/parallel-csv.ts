/**
 * The per-cell CSV table with its rows formatted by worker threads (Node only). Rows go in
 * blocks to shared slots; this thread writes the blocks in order as they are ready and waits on
 * shared memory (Atomics.wait) meanwhile, so the whole call is synchronous and fits a
 * synchronous writer. The bytes are those of cellsCsvBytes. This module is also its workers'
 * entry point.
 */
import * as fs from 'node:fs';
import { isMainThread, Worker, workerData } from 'node:worker_threads';
import type { AuditResult } from '../audit/audit.js';
import { csvTable, writeCsvRows, type CsvColumnSet, type CsvTable, type ExtraColumns } from '../io/csv.js';
import { MIN_CELLS_PER_THREAD, shared } from './parallel.js';

const WORKER_MARK = 'steplens-csv';

/** Rows per block of the threaded CSV writer. */
const CSV_BLOCK_ROWS = 4096;
// shared control words: the next block to claim, a failure flag, then per slot: its block, ready, length
const NEXT = 0;
const FAILED = 1;
const slotBlock = (s: number): number => 2 + 3 * s;
const slotReady = (s: number): number => 3 + 3 * s;
const slotLength = (s: number): number => 4 + 3 * s;

interface CsvJob {
  table: CsvTable;
  control: Int32Array;
  slots: SharedArrayBuffer;
  slotBytes: number;
  nSlots: number;
  nBlocks: number;
}

/** Format block `b` into its slot and mark it ready. */
function formatBlock(job: CsvJob, b: number): void {
  const s = b % job.nSlots;
  const out = new Uint8Array(job.slots, s * job.slotBytes, job.slotBytes);
  const from = b * CSV_BLOCK_ROWS;
  const to = Math.min(job.table.nCells, from + CSV_BLOCK_ROWS);
  const at = writeCsvRows(job.table, out, 0, from, to);
  if (at.row !== to) throw new Error(`CSV block ${b} overflowed its ${job.slotBytes} bytes`);
  Atomics.store(job.control, slotLength(s), at.pos);
  Atomics.store(job.control, slotReady(s), 1);
  Atomics.notify(job.control, slotReady(s));
}

/** A CSV worker: claim the next block, wait until its slot is free, format it; until none is left. */
function runCsvWorker(job: CsvJob): void {
  const c = job.control;
  try {
    for (;;) {
      const b = Atomics.add(c, NEXT, 1);
      if (b >= job.nBlocks) return;
      const s = b % job.nSlots;
      for (let v = Atomics.load(c, slotBlock(s)); v !== b; v = Atomics.load(c, slotBlock(s))) {
        if (Atomics.load(c, FAILED)) return;
        Atomics.wait(c, slotBlock(s), v, 100);
      }
      formatBlock(job, b);
    }
  } catch {
    Atomics.store(c, FAILED, 1);
    Atomics.notify(c, FAILED);
    for (let s = 0; s < job.nSlots; s++) Atomics.notify(c, slotReady(s));
  }
}

function isShared(a: ArrayBufferView): boolean {
  return a.buffer instanceof SharedArrayBuffer;
}

/** The table with every array on shared memory (the geometry columns must be shared already). */
function sharedTable(t: CsvTable): CsvTable {
  const f64 = (b: SharedArrayBuffer, m: number) => new Float64Array(b, 0, m);
  const i32 = (b: SharedArrayBuffer, m: number) => new Int32Array(b, 0, m);
  const u8 = (b: SharedArrayBuffer, m: number) => new Uint8Array(b, 0, m);
  return {
    ...t,
    types: shared(t.types.subarray(0, t.nCells), u8),
    columns: t.columns.map((a) => (typeof a === 'string' ? a : shared(a, f64))),
    shape: t.shape && { ...t.shape, points: shared(t.shape.points, f64), offsets: shared(t.shape.offsets, i32), nodes: shared(t.shape.nodes, i32) },
    flags: shared(t.flags, u8),
    cause: shared(t.cause, u8),
    extras: t.extras.map((a) => (a instanceof Int32Array ? shared(a, i32) : shared(a, f64))),
  };
}

export interface ParallelCsvOptions {
  workerUrl?: URL;
}

function writeAll(fd: number, b: Uint8Array): void {
  let off = 0;
  while (off < b.length) off += fs.writeSync(fd, b, off, b.length - off);
}

/**
 * The per-cell table (as cellsCsvBytes writes it, byte for byte) written to `fd`, its rows
 * formatted by `threads` worker threads in blocks and written here in order. Synchronous: this
 * thread waits on shared memory (Atomics.wait), so it fits a synchronous writer such as
 * writeOutput. Threads are used when the geometry came from parallelGeometry (its arrays are
 * shared: nothing big is copied) and the mesh is large; otherwise this thread writes alone.
 */
export function writeCellsCsv(fd: number, r: AuditResult, extra: ExtraColumns, threads: number, options: ParallelCsvOptions = {}, set: CsvColumnSet = 'standard'): void {
  const t = csvTable(r, extra, set);
  const enc = new TextEncoder();
  const nBlocks = Math.ceil(t.nCells / CSV_BLOCK_ROWS);
  const useThreads = threads > 1 && t.nCells >= 2 * MIN_CELLS_PER_THREAD && t.columns.every((a) => typeof a === 'string' || a === r.speed || a === r.dt || isShared(a));
  const slotBytes = CSV_BLOCK_ROWS * t.rowMax;
  if (!useThreads) {
    const buf = new Uint8Array(slotBytes);
    writeAll(fd, enc.encode(t.header));
    for (let row = 0; row < t.nCells;) {
      const at = writeCsvRows(t, buf, 0, row, t.nCells);
      writeAll(fd, buf.subarray(0, at.pos));
      row = at.row;
    }
    return;
  }
  const nSlots = 2 * threads;
  const job: CsvJob = {
    table: sharedTable(t),
    control: new Int32Array(new SharedArrayBuffer(4 * (2 + 3 * nSlots))),
    slots: new SharedArrayBuffer(nSlots * slotBytes),
    slotBytes, nSlots, nBlocks,
  };
  const c = job.control;
  for (let s = 0; s < nSlots; s++) c[slotBlock(s)] = s;
  const workers: Worker[] = [];
  for (let k = 0; k < threads; k++) workers.push(new Worker(options.workerUrl ?? new URL(import.meta.url), { workerData: { mark: WORKER_MARK, job } }));
  try {
    writeAll(fd, enc.encode(t.header));
    for (let b = 0; b < nBlocks; b++) {
      const s = b % nSlots;
      while (Atomics.load(c, slotReady(s)) === 0) {
        if (Atomics.load(c, FAILED)) throw new Error('a CSV worker thread failed');
        const next = Atomics.load(c, NEXT);
        // nobody has taken block b yet (workers still starting): format it here
        if (next <= b && Atomics.compareExchange(c, NEXT, next, next + 1) === next) formatBlock(job, next);
        else Atomics.wait(c, slotReady(s), 0, 50);
      }
      writeAll(fd, new Uint8Array(job.slots, s * slotBytes, Atomics.load(c, slotLength(s))));
      Atomics.store(c, slotReady(s), 0);
      Atomics.store(c, slotBlock(s), b + nSlots);
      Atomics.notify(c, slotBlock(s));
    }
  } catch (e) {
    Atomics.store(c, FAILED, 1);
    for (const w of workers) void w.terminate();
    throw e;
  }
}

// the workers' entry point: the last statement, once every constant above is set
const data = isMainThread ? null : (workerData as { mark?: string; job?: CsvJob } | null);
if (data?.mark === WORKER_MARK && data.job) runCsvWorker(data.job);
