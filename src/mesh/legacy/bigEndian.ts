/**
 * Big-endian binary blocks to host-order typed arrays: one bulk copy (which also aligns the
 * data), then one swap pass over 16- or 32-bit words of the copy.
 */
import type { ValueType } from './types.js';
import { HOST_LITTLE_ENDIAN as HOST_LE } from '../host.js';

export type NumericArray =
  | Int8Array | Uint8Array | Int16Array | Uint16Array | Int32Array | Uint32Array | Float32Array | Float64Array;

const TWO32 = 4294967296;

function swap16(u: Uint16Array): void {
  for (let i = 0; i < u.length; i++) {
    const v = u[i]!;
    u[i] = ((v & 0xff) << 8) | (v >>> 8);
  }
}

function swap32(u: Uint32Array): void {
  for (let i = 0; i < u.length; i++) {
    const v = u[i]!;
    u[i] = ((v & 0xff) << 24) | ((v & 0xff00) << 8) | ((v >>> 8) & 0xff00) | (v >>> 24);
  }
}

/** Swap 8-byte values: each 32-bit word is reversed and the two words trade places. */
function swap64(u: Uint32Array): void {
  swap32(u);
  for (let i = 0; i + 1 < u.length; i += 2) {
    const a = u[i]!;
    u[i] = u[i + 1]!;
    u[i + 1] = a;
  }
}

/**
 * 64-bit integers to doubles, in place in the same buffer (each double overwrites the two
 * words it was computed from). Values beyond 2^53 lose their low bits.
 */
function int64ToDouble(buf: ArrayBuffer, count: number, signed: boolean): Float64Array {
  const u = new Uint32Array(buf, 0, count * 2);
  const s = new Int32Array(buf, 0, count * 2);
  const out = new Float64Array(buf, 0, count);
  const lo = HOST_LE ? 0 : 1;
  const hi = 1 - lo;
  for (let i = 0; i < count; i++) {
    const high = signed ? s[2 * i + hi]! : u[2 * i + hi]!;
    out[i] = high * TWO32 + u[2 * i + lo]!;
  }
  return out;
}

/**
 * `count` big-endian values of type `t` starting at byte `start` of `bytes`, as a fresh
 * host-order array. 64-bit integers come back as a Float64Array of their values.
 * The caller has checked that the bytes exist; bit and string types are not handled here.
 */
export function decodeBigEndian(bytes: Uint8Array, start: number, count: number, t: ValueType): NumericArray {
  const size = t.size;
  const buf = bytes.slice(start, start + count * size).buffer;
  if (size === 1) return t.kind === 'int' ? new Int8Array(buf) : new Uint8Array(buf);
  if (size === 2) {
    if (HOST_LE) swap16(new Uint16Array(buf));
    return t.kind === 'int' ? new Int16Array(buf) : new Uint16Array(buf);
  }
  if (size === 4) {
    if (HOST_LE) swap32(new Uint32Array(buf));
    if (t.kind === 'float') return new Float32Array(buf);
    return t.kind === 'int' ? new Int32Array(buf) : new Uint32Array(buf);
  }
  if (HOST_LE) swap64(new Uint32Array(buf));
  if (t.kind === 'float') return new Float64Array(buf);
  return int64ToDouble(buf, count, t.kind === 'int');
}
