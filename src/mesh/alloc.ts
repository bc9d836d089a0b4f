/**
 * Where big per-point and per-cell arrays are allocated. By default on ordinary memory; once
 * `allocateShared(true)` is called (the command line does it when it runs worker threads), on
 * SharedArrayBuffer, so that threads read the mesh and the per-cell results without a copy.
 * Values and behaviour are the same either way.
 *
 * Recycling: first touching fresh memory costs more than most per-cell work, so the raw bytes
 * a reader read and then converted (64-bit ids narrowed, 3-D points made 2-D) are not left to
 * the garbage collector when the command line says they are spent (`recycleSpent`, given every
 * array the mesh still holds): later shared arrays are carved out of them, zero-filled first.
 */

let sharedMemory = false;

/** Shared buffers a reader filled, that may be spent once the mesh is built. */
let candidates: SharedArrayBuffer[] = [];
/** Spent buffers and how far each is handed out. */
const spare: { buf: SharedArrayBuffer; at: number }[] = [];

/** Allocate the arrays below on shared memory (true) or ordinary memory (false); forgets spare memory. */
export function allocateShared(on: boolean): void {
  sharedMemory = on && typeof SharedArrayBuffer !== 'undefined';
  candidates = [];
  spare.length = 0;
}

export function float64s(n: number): Float64Array {
  return sharedMemory ? sharedFloat64s(n) : new Float64Array(n);
}

export function int32s(n: number): Int32Array {
  return sharedMemory ? sharedArray(Int32Array, n) : new Int32Array(n);
}

export function uint8s(n: number): Uint8Array {
  return sharedMemory ? sharedUint8s(n) : new Uint8Array(n);
}

/** A Float64Array on shared memory (spare memory first), whatever allocateShared says. */
export function sharedFloat64s(n: number): Float64Array {
  return sharedArray(Float64Array, n);
}

/** A Uint8Array on shared memory (spare memory first), whatever allocateShared says. */
export function sharedUint8s(n: number): Uint8Array {
  return sharedArray(Uint8Array, n);
}

interface SharedArrayType<T> {
  new (buffer: SharedArrayBuffer, byteOffset: number, length: number): T;
  readonly BYTES_PER_ELEMENT: number;
}

/** n elements carved out of spare memory (8-byte aligned, zero-filled), else on a fresh shared buffer. */
function sharedArray<T>(Type: SharedArrayType<T>, n: number): T {
  const bytes = Type.BYTES_PER_ELEMENT * n;
  for (const s of spare) {
    const at = Math.ceil(s.at / 8) * 8;
    if (at + bytes > s.buf.byteLength) continue;
    s.at = at + bytes;
    new Uint8Array(s.buf, at, bytes).fill(0);
    return new Type(s.buf, at, n);
  }
  return new Type(new SharedArrayBuffer(bytes), 0, n);
}

/**
 * A buffer for raw file bytes: shared, and a candidate for recycling, under allocateShared(true)
 * when large; else ordinary memory.
 */
export function readBuffer(n: number): Uint8Array {
  if (!sharedMemory || n < 2 ** 20) return new Uint8Array(n);
  const b = new SharedArrayBuffer(n);
  candidates.push(b);
  return new Uint8Array(b);
}

/**
 * Hand the read buffers that none of `live` (every typed array still in use: the mesh's points,
 * cells and data arrays) lies on to later shared allocations. Returns the bytes made spare.
 */
/** Every typed array a mesh holds (what recycleSpent must keep). */
export function meshArrays(mesh: { points: ArrayBufferView; cellOffsets: ArrayBufferView; cellNodes: ArrayBufferView; cellTypes: ArrayBufferView; pointData: { values: ArrayBufferView }[]; cellData: { values: ArrayBufferView }[] }): ArrayBufferView[] {
  return [mesh.points, mesh.cellOffsets, mesh.cellNodes, mesh.cellTypes, ...mesh.pointData.map((a) => a.values), ...mesh.cellData.map((a) => a.values)];
}

export function recycleSpent(live: ArrayBufferView[]): number {
  const used = new Set<ArrayBufferLike>(live.map((a) => a.buffer));
  let bytes = 0;
  for (const b of candidates) {
    if (used.has(b)) continue;
    spare.push({ buf: b, at: 0 });
    bytes += b.byteLength;
  }
  candidates = [];
  return bytes;
}
