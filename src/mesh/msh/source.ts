/**
 * One value source for both MSH encodings, so that each section is parsed by one function.
 * ASCII values come from the shared Scanner; binary values are decoded from the same bytes,
 * scalars through a DataView and arrays through typed-array views (or one copy when the
 * bytes are unaligned or in the other byte order).
 */
import { MeshInputError } from '../errors.js';
import { Scanner } from '../scan.js';
import { HOST_LITTLE_ENDIAN as HOST_LE } from '../host.js';

const TWO32 = 4294967296;
/** Largest high word of a 64-bit unsigned value that still fits a double exactly (2^53). */
const MAX_HIGH = 0x1fffff;

/** A Scanner whose errors carry a byte offset instead of a line (for binary files). */
export class ByteScanner extends Scanner {
  override error(detail: string, at = this.pos): MeshInputError {
    return new MeshInputError(detail, { file: this.file, byteOffset: this.base + at });
  }
}

export interface Source {
  readonly binary: boolean;
  readonly sc: Scanner;
  /** Records read per chunk by bulk readers (1 in ASCII, so that errors point at the line). */
  readonly chunk: number;
  /** int: int32 in binary. */
  int(what: string): number;
  /** size_t in binary (4 or 8 bytes): a non-negative integer. */
  size(what: string): number;
  f64(what: string): number;
  f64s(out: Float64Array, off: number, n: number, what: string): void;
  sizes(out: Float64Array, off: number, n: number, what: string): void;
  ints(out: Float64Array, off: number, n: number, what: string): void;
  skip(nInts: number, nSizes: number, nDoubles: number, what: string): void;
  /**
   * Fail unless `count` items of `ints` int, `sizes` size_t and `doubles` double values each can
   * still fit in the bytes left (ASCII: each value takes at least two bytes).
   */
  need(count: number, ints: number, sizes: number, doubles: number, what: string): void;
  /** Bytes one record of the given shape takes in binary (0 in ASCII, where it varies). */
  recordBytes(ints: number, sizes: number, doubles: number): number;
  /**
   * Where record `index` of a chunk read from `start` lies, for messages: its byte offset in
   * binary; in ASCII (one record per chunk) the current position, still on the record's line.
   */
  at(start: number, index: number, recordBytes: number): number;
  /** The position of the next value (ASCII: after skipping white space), for messages. */
  mark(): number;
}

function tooFew(sc: Scanner, count: number, what: string): MeshInputError {
  return sc.error(`${what}: ${count} announced, more than the ${sc.end - sc.pos} bytes left in the file can hold`);
}

export class AsciiSource implements Source {
  readonly binary = false;
  readonly chunk = 1;
  constructor(readonly sc: Scanner) {}

  int(what: string): number {
    return this.sc.int(what, -2147483648, 2147483647);
  }

  size(what: string): number {
    return this.sc.int(what, 0);
  }

  f64(what: string): number {
    return this.sc.number(what);
  }

  f64s(out: Float64Array, off: number, n: number, what: string): void {
    const sc = this.sc;
    for (let i = 0; i < n; i++) out[off + i] = sc.number(what);
  }

  sizes(out: Float64Array, off: number, n: number, what: string): void {
    const sc = this.sc;
    for (let i = 0; i < n; i++) out[off + i] = sc.int(what, 0);
  }

  ints(out: Float64Array, off: number, n: number, what: string): void {
    for (let i = 0; i < n; i++) out[off + i] = this.int(what);
  }

  skip(nInts: number, nSizes: number, nDoubles: number, what: string): void {
    for (let i = 0; i < nInts; i++) this.int(what);
    for (let i = 0; i < nSizes; i++) this.size(what);
    for (let i = 0; i < nDoubles; i++) this.sc.number(what);
  }

  need(count: number, ints: number, sizes: number, doubles: number, what: string): void {
    const values = count * (ints + sizes + doubles);
    if (values * 2 - 1 > this.sc.end - this.sc.pos) throw tooFew(this.sc, count, what);
  }

  recordBytes(): number {
    return 0;
  }

  at(): number {
    return this.sc.pos;
  }

  mark(): number {
    this.sc.skipSpace();
    return this.sc.pos;
  }
}

/** Reverse the byte order of each `width`-byte unit in place. */
function swapUnits(b: Uint8Array, width: number): void {
  for (let p = 0; p + width <= b.length; p += width) {
    for (let i = 0, j = width - 1; i < j; i++, j--) {
      const t = b[p + i]!;
      b[p + i] = b[p + j]!;
      b[p + j] = t;
    }
  }
}

export class BinarySource implements Source {
  readonly binary = true;
  readonly chunk = 8192;
  private readonly dv: DataView;
  private readonly bytes: Uint8Array;
  private scratch = new Uint8Array(0);

  /** `le`: the file's byte order; `sizeT`: 4 or 8 (MSH 4.1 data-size). */
  constructor(readonly sc: Scanner, readonly le: boolean, readonly sizeT: number) {
    this.bytes = sc.bytes;
    this.dv = new DataView(sc.bytes.buffer, sc.bytes.byteOffset, sc.bytes.byteLength);
  }

  /** Position of `n` bytes to read; fails at the end of the file. */
  private take(n: number, what: string): number {
    const p = this.sc.pos;
    if (p + n > this.sc.end) throw this.sc.error(`unexpected end of file: expected ${what}`);
    this.sc.pos = p + n;
    return p;
  }

  /**
   * The next `n` units of `width` bytes, in host byte order: a view of the file when aligned,
   * else a copy in a reused scratch buffer (valid until the next call).
   */
  private block(n: number, width: number, what: string): Uint8Array {
    const nb = n * width;
    const p = this.take(nb, what);
    if (this.le === HOST_LE && (this.bytes.byteOffset + p) % width === 0) return this.bytes.subarray(p, p + nb);
    if (this.scratch.length < nb) this.scratch = new Uint8Array(Math.max(nb, 2 * this.scratch.length));
    const copy = this.scratch.subarray(0, nb);
    copy.set(this.bytes.subarray(p, p + nb));
    if (this.le !== HOST_LE) swapUnits(copy, width);
    return copy;
  }

  int(what: string): number {
    return this.dv.getInt32(this.take(4, what), this.le);
  }

  size(what: string): number {
    const p = this.take(this.sizeT, what);
    if (this.sizeT === 4) return this.dv.getUint32(p, this.le);
    const lo = this.dv.getUint32(this.le ? p : p + 4, this.le);
    const hi = this.dv.getUint32(this.le ? p + 4 : p, this.le);
    if (hi > MAX_HIGH) throw this.sc.error(`${what} is larger than 2^53`, p);
    return lo + hi * TWO32;
  }

  f64(what: string): number {
    return this.dv.getFloat64(this.take(8, what), this.le);
  }

  f64s(out: Float64Array, off: number, n: number, what: string): void {
    const b = this.block(n, 8, what);
    out.set(new Float64Array(b.buffer, b.byteOffset, n), off);
  }

  ints(out: Float64Array, off: number, n: number, what: string): void {
    const b = this.block(n, 4, what);
    out.set(new Int32Array(b.buffer, b.byteOffset, n), off);
  }

  sizes(out: Float64Array, off: number, n: number, what: string): void {
    const start = this.sc.pos;
    const b = this.block(n, this.sizeT, what);
    if (this.sizeT === 4) {
      out.set(new Uint32Array(b.buffer, b.byteOffset, n), off);
      return;
    }
    const w = new Uint32Array(b.buffer, b.byteOffset, 2 * n);
    const lo = HOST_LE ? 0 : 1;
    for (let i = 0; i < n; i++) {
      const hi = w[2 * i + 1 - lo]!;
      if (hi > MAX_HIGH) throw this.sc.error(`${what} is larger than 2^53`, start + i * 8);
      out[off + i] = w[2 * i + lo]! + hi * TWO32;
    }
  }

  skip(nInts: number, nSizes: number, nDoubles: number, what: string): void {
    this.take(this.recordBytes(nInts, nSizes, nDoubles), what);
  }

  need(count: number, ints: number, sizes: number, doubles: number, what: string): void {
    if (count * this.recordBytes(ints, sizes, doubles) > this.sc.end - this.sc.pos) throw tooFew(this.sc, count, what);
  }

  recordBytes(ints: number, sizes: number, doubles: number): number {
    return 4 * ints + this.sizeT * sizes + 8 * doubles;
  }

  at(start: number, index: number, recordBytes: number): number {
    return start + index * recordBytes;
  }

  mark(): number {
    return this.sc.pos;
  }
}
