/**
 * Large reads split over two threads (Node only). Reading a big array from the page cache is
 * mostly the cost of first touching the destination's pages; a helper thread reads the second
 * half of each large read into the same shared buffer while this thread reads the first, and
 * this thread waits on shared memory (Atomics.wait) for the helper, so readers stay synchronous.
 * File descriptors belong to the process, so the helper reads through the same one (pread).
 * This module is also the helper's entry point.
 */
import * as fs from 'node:fs';
import { isMainThread, parentPort, Worker, workerData } from 'node:worker_threads';

const WORKER_MARK = 'steplens-split-read';
/** Reads smaller than this stay on one thread. */
export const SPLIT_READ_MIN = 16 * 2 ** 20;
/** One readSync moves at most this much (Node refuses reads of 2 GiB and more). */
const READ_STEP = 2 ** 30;

interface HalfJob {
  fd: number;
  buffer: SharedArrayBuffer;
  byteOffset: number;
  length: number;
  position: number;
  /** [state (0 busy, 1 done), bytes read] */
  control: Int32Array;
}

/** Read up to `length` bytes at `position` into `out`; the bytes read (fewer at the end of the file). */
export function readFully(fd: number, out: Uint8Array, position: number): number {
  let done = 0;
  while (done < out.length) {
    const n = fs.readSync(fd, out, done, Math.min(READ_STEP, out.length - done), position + done);
    if (n === 0) break;
    done += n;
  }
  return done;
}

/** A helper thread for split reads; close() ends it (it never keeps the process alive). */
export class SplitReader {
  private readonly worker: Worker;
  private readonly control = new Int32Array(new SharedArrayBuffer(8));
  private failed = false;

  constructor(url: URL = new URL(import.meta.url)) {
    this.worker = new Worker(url, { workerData: WORKER_MARK });
    this.worker.unref();
    this.worker.on('error', () => { this.failed = true; });
  }

  /**
   * Read `out` (on shared memory) from `position`: the second half by the helper, the first here.
   * Returns the bytes read in order up to the first short read (out.length when the file holds them).
   */
  read(fd: number, out: Uint8Array, position: number): number {
    if (this.failed || !(out.buffer instanceof SharedArrayBuffer) || out.length < SPLIT_READ_MIN) return readFully(fd, out, position);
    const half = Math.floor(out.length / 2 / 4096) * 4096;
    const c = this.control;
    Atomics.store(c, 0, 0);
    const job: HalfJob = { fd, buffer: out.buffer, byteOffset: out.byteOffset + half, length: out.length - half, position: position + half, control: c };
    this.worker.postMessage(job);
    const first = readFully(fd, out.subarray(0, half), position);
    while (Atomics.load(c, 0) === 0) {
      if (this.failed) return first < half ? first : half + readFully(fd, out.subarray(half), position + half);
      Atomics.wait(c, 0, 0, 100);
    }
    const second = Atomics.load(c, 1);
    if (first < half) return first;
    // the helper met an error: read that half here, where the error reaches the caller
    return half + (second < 0 ? readFully(fd, out.subarray(half), position + half) : second);
  }

  async close(): Promise<void> {
    await this.worker.terminate();
  }
}

// the helper's entry point: the last statement
if (!isMainThread && workerData === WORKER_MARK && parentPort) {
  parentPort.on('message', (job: HalfJob) => {
    let n = 0;
    try {
      n = readFully(job.fd, new Uint8Array(job.buffer, job.byteOffset, job.length), job.position);
    } catch {
      n = -1;
    }
    Atomics.store(job.control, 1, n);
    Atomics.store(job.control, 0, 1);
    Atomics.notify(job.control, 0);
  });
}
