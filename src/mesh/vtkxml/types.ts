/**
 * VTK XML numeric types and the conversion of their bytes to typed arrays: views where the
 * bytes are little-endian and aligned, else one copy (and one swap pass for big-endian).
 */
import { int32s } from '../alloc.js';
import type { FieldValues } from '../model.js';

export type NumType = 'Int8' | 'UInt8' | 'Int16' | 'UInt16' | 'Int32' | 'UInt32' | 'Int64' | 'UInt64' | 'Float32' | 'Float64';

const SIZES: Record<NumType, number> = {
  Int8: 1, UInt8: 1, Int16: 2, UInt16: 2, Int32: 4, UInt32: 4, Int64: 8, UInt64: 8, Float32: 4, Float64: 8,
};

/** Older spellings of the type names. */
const ALIASES: Record<string, NumType> = {
  Char: 'Int8', SignedChar: 'Int8', UnsignedChar: 'UInt8', Short: 'Int16', UnsignedShort: 'UInt16',
  Int: 'Int32', UnsignedInt: 'UInt32', Long: 'Int64', UnsignedLong: 'UInt64', LongLong: 'Int64',
  UnsignedLongLong: 'UInt64', IdType: 'Int64', Float: 'Float32', Double: 'Float64',
};

export function numType(name: string): NumType | null {
  if (Object.prototype.hasOwnProperty.call(SIZES, name)) return name as NumType;
  return ALIASES[name] ?? null;
}

export function typeSize(t: NumType): number {
  return SIZES[t];
}

/** Reverse the byte order of each `size`-byte element, in place. */
export function swapBytes(b: Uint8Array, size: number): void {
  const n = b.length - (b.length % size);
  if (size === 2) {
    for (let i = 0; i < n; i += 2) { const t = b[i]!; b[i] = b[i + 1]!; b[i + 1] = t; }
  } else if (size === 4) {
    for (let i = 0; i < n; i += 4) {
      let t = b[i]!; b[i] = b[i + 3]!; b[i + 3] = t;
      t = b[i + 1]!; b[i + 1] = b[i + 2]!; b[i + 2] = t;
    }
  } else if (size === 8) {
    for (let i = 0; i < n; i += 8) {
      for (let k = 0; k < 4; k++) { const t = b[i + k]!; b[i + k] = b[i + 7 - k]!; b[i + 7 - k] = t; }
    }
  }
}

/**
 * Little-endian bytes for `data`, aligned to `align` bytes (default: the value size): the bytes
 * themselves when possible, else one copy (swapped when the file is big-endian). `owned` bytes
 * may be swapped in place.
 */
function nativeBytes(data: Uint8Array, size: number, bigEndian: boolean, owned: boolean, align = size): Uint8Array {
  if (size === 1) return data;
  let b = data;
  if (bigEndian) {
    if (!owned || data.byteOffset % size !== 0) b = data.slice();
    swapBytes(b, size);
  } else if (data.byteOffset % align !== 0) {
    b = data.slice();
  }
  return b;
}

/** 64-bit integers are read as pairs of 32-bit words, so 4-byte alignment is enough for a view. */
function viewAlignment(t: NumType): number {
  return t === 'Int64' || t === 'UInt64' ? 4 : SIZES[t];
}

function view(b: Uint8Array, t: NumType): ArrayLike<number> {
  const n = b.length / SIZES[t];
  switch (t) {
    case 'Int8': return new Int8Array(b.buffer, b.byteOffset, n);
    case 'UInt8': return b;
    case 'Int16': return new Int16Array(b.buffer, b.byteOffset, n);
    case 'UInt16': return new Uint16Array(b.buffer, b.byteOffset, n);
    case 'Int32': case 'Int64': return new Int32Array(b.buffer, b.byteOffset, n * (t === 'Int64' ? 2 : 1));
    case 'UInt32': case 'UInt64': return new Uint32Array(b.buffer, b.byteOffset, n * (t === 'UInt64' ? 2 : 1));
    case 'Float32': return new Float32Array(b.buffer, b.byteOffset, n);
    case 'Float64': return new Float64Array(b.buffer, b.byteOffset, n);
  }
}

export const TWO32 = 4294967296;

/**
 * Field values from the bytes of an array: Float32 stays Float32Array, everything else becomes
 * Float64Array (a view when the bytes are Float64, little-endian and aligned).
 */
export function fieldValues(data: Uint8Array, t: NumType, bigEndian: boolean, owned: boolean): FieldValues {
  const v = view(nativeBytes(data, SIZES[t], bigEndian, owned, viewAlignment(t)), t);
  if (t === 'Float32') return v as Float32Array;
  if (t === 'Float64') return v as Float64Array;
  if (t === 'Int64' || t === 'UInt64') {
    const n = v.length / 2;
    const out = new Float64Array(n);
    const w = v as Int32Array | Uint32Array;
    // low words are unsigned in both cases; the high word carries the sign for Int64
    const lo = t === 'Int64' ? new Uint32Array(w.buffer, w.byteOffset, w.length) : (w as Uint32Array);
    for (let i = 0; i < n; i++) out[i] = w[2 * i + 1]! * TWO32 + lo[2 * i]!;
    return out;
  }
  return new Float64Array(v as Int8Array);
}

/**
 * Integer values (ids, offsets, type codes) from the bytes of an array. 8/16/32-bit integer and
 * float arrays come back as typed views of their own type; 64-bit integers are narrowed to
 * Int32Array, or `bad` is called with the index of the first value outside the 32-bit range.
 */
export function indexValues(data: Uint8Array, t: NumType, bigEndian: boolean, owned: boolean, bad: (i: number, value: number) => never): ArrayLike<number> {
  const v = view(nativeBytes(data, SIZES[t], bigEndian, owned, viewAlignment(t)), t);
  if (t !== 'Int64' && t !== 'UInt64') return v;
  const n = v.length / 2;
  const w = v as Int32Array | Uint32Array;
  const out = int32s(n);
  const signed = t === 'Int64';
  for (let i = 0; i < n; i++) {
    const lo = w[2 * i]!;
    const hi = w[2 * i + 1]!;
    // Int64 view: lo is the signed low word; fits when hi is its sign extension.
    // UInt64 view: lo is unsigned; fits when hi is 0 and lo < 2^31.
    const fits = signed ? hi === (lo < 0 ? -1 : 0) : hi === 0 && lo < 2147483648;
    if (!fits) {
      const loU = lo < 0 ? lo + TWO32 : lo;
      bad(i, hi * TWO32 + loU);
    }
    out[i] = lo;
  }
  return out;
}
