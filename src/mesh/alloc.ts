/**
 * Where big per-point and per-cell arrays are allocated. By default on ordinary memory; once
 * `allocateShared(true)` is called (the command line does it when it runs worker threads), on
 * SharedArrayBuffer, so that threads read the mesh and the per-cell results without a copy.
 * Values and behaviour are the same either way.
 */

let sharedMemory = false;

/** Allocate the arrays below on shared memory (true) or ordinary memory (false). */
export function allocateShared(on: boolean): void {
  sharedMemory = on && typeof SharedArrayBuffer !== 'undefined';
}

export function float64s(n: number): Float64Array {
  return sharedMemory ? new Float64Array(new SharedArrayBuffer(8 * n)) : new Float64Array(n);
}

export function int32s(n: number): Int32Array {
  return sharedMemory ? new Int32Array(new SharedArrayBuffer(4 * n)) : new Int32Array(n);
}

export function uint8s(n: number): Uint8Array {
  return sharedMemory ? new Uint8Array(new SharedArrayBuffer(n)) : new Uint8Array(n);
}
