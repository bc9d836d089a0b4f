/**
 * Base64 straight from and to bytes. The reader decodes group by group and accepts padding at
 * any group boundary, so a header encoded on its own followed by separately encoded data reads
 * the same as one stream holding both.
 */
import { MeshInputError } from '../errors.js';

const ALPHABET = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/';
const WHITE = -2;
const PAD = -3;

/** Byte → 6-bit value, or -1 (invalid), WHITE, PAD. */
const DECODE = new Int8Array(256).fill(-1);
for (let i = 0; i < 64; i++) DECODE[ALPHABET.charCodeAt(i)] = i;
for (const c of [32, 9, 10, 13, 12, 11]) DECODE[c] = WHITE;
DECODE[61] = PAD;

const ENCODE = new Uint8Array(64);
for (let i = 0; i < 64; i++) ENCODE[i] = ALPHABET.charCodeAt(i);

export class Base64Reader {
  readonly bytes: Uint8Array;
  readonly file: string;
  pos: number;
  readonly end: number;
  /** Bytes decoded from the last group but not yet handed out. */
  private readonly pend = new Uint8Array(3);
  private pendStart = 0;
  private pendEnd = 0;
  private readonly group = new Int32Array(4);

  constructor(bytes: Uint8Array, start: number, end: number, file: string) {
    this.bytes = bytes;
    this.pos = start;
    this.end = end;
    this.file = file;
  }

  /** An upper bound of the bytes still to be decoded (whitespace counted as data). */
  available(): number {
    return this.pendEnd - this.pendStart + Math.floor((this.end - this.pos) / 4) * 3;
  }

  /** Decode the next `n` bytes into a new array. */
  read(n: number, what: string): Uint8Array {
    if (n > this.available()) {
      throw new MeshInputError(`${what} needs ${n} bytes but the base64 text from here holds at most ${this.available()}`, { file: this.file, byteOffset: this.pos });
    }
    const out = new Uint8Array(n);
    this.fill(out, what);
    return out;
  }

  private fill(out: Uint8Array, what: string): void {
    const n = out.length;
    const b = this.bytes;
    let o = 0;
    while (o < n && this.pendStart < this.pendEnd) out[o++] = this.pend[this.pendStart++]!;
    let p = this.pos;
    const end = this.end;
    while (o < n) {
      while (n - o >= 3 && p + 4 <= end) {
        const v0 = DECODE[b[p]!]!;
        const v1 = DECODE[b[p + 1]!]!;
        const v2 = DECODE[b[p + 2]!]!;
        const v3 = DECODE[b[p + 3]!]!;
        if ((v0 | v1 | v2 | v3) < 0) break;
        out[o] = (v0 << 2) | (v1 >> 4);
        out[o + 1] = ((v1 & 15) << 4) | (v2 >> 2);
        out[o + 2] = ((v2 & 3) << 6) | v3;
        o += 3;
        p += 4;
      }
      if (o >= n) break;
      p = this.slowGroup(p, what);
      while (o < n && this.pendStart < this.pendEnd) out[o++] = this.pend[this.pendStart++]!;
    }
    this.pos = p;
  }

  /** Decode one group of four symbols (skipping whitespace, honouring padding) into `pend`. */
  private slowGroup(start: number, what: string): number {
    const b = this.bytes;
    const g = this.group;
    let p = start;
    let k = 0;
    let groupAt = -1;
    while (k < 4) {
      if (p >= this.end || b[p] === 60 /* < */) {
        throw new MeshInputError(`base64 text of ${what} ends early`, { file: this.file, byteOffset: p });
      }
      const c = b[p]!;
      const v = DECODE[c]!;
      if (v === WHITE) { p++; continue; }
      if (v === -1) {
        const shown = c >= 33 && c < 127 ? `'${String.fromCharCode(c)}'` : `byte 0x${c.toString(16).padStart(2, '0')}`;
        throw new MeshInputError(`bad base64 character ${shown} in ${what}`, { file: this.file, byteOffset: p });
      }
      if (k === 0) groupAt = p;
      if (v === PAD && k < 2) throw new MeshInputError(`misplaced base64 padding in ${what}`, { file: this.file, byteOffset: p });
      g[k++] = v;
      p++;
    }
    if (g[2] === PAD && g[3] !== PAD) throw new MeshInputError(`misplaced base64 padding in ${what}`, { file: this.file, byteOffset: groupAt });
    const count = g[2] === PAD ? 1 : g[3] === PAD ? 2 : 3;
    const pend = this.pend;
    pend[0] = (g[0]! << 2) | (g[1]! >> 4);
    if (count > 1) pend[1] = ((g[1]! & 15) << 4) | (g[2]! >> 2);
    if (count > 2) pend[2] = ((g[2]! & 3) << 6) | g[3]!;
    this.pendStart = 0;
    this.pendEnd = count;
    return p;
  }
}

export function base64Length(nBytes: number): number {
  return Math.ceil(nBytes / 3) * 4;
}

/**
 * Streaming base64 encoder into a caller's buffer: `push` parts, then `flush` to pad.
 * Parts pushed between flushes form one base64 stream.
 */
export class Base64Writer {
  readonly out: Uint8Array;
  pos: number;
  private carry = new Uint8Array(2);
  private nCarry = 0;

  constructor(out: Uint8Array, pos: number) {
    this.out = out;
    this.pos = pos;
  }

  push(src: Uint8Array): void {
    let i = 0;
    const n = src.length;
    while (this.nCarry > 0 && i < n) {
      if (this.nCarry === 2) {
        this.group(this.carry[0]!, this.carry[1]!, src[i++]!);
        this.nCarry = 0;
      } else {
        this.carry[this.nCarry++] = src[i++]!;
      }
    }
    for (; i + 3 <= n; i += 3) this.group(src[i]!, src[i + 1]!, src[i + 2]!);
    while (i < n) this.carry[this.nCarry++] = src[i++]!;
  }

  flush(): void {
    if (this.nCarry === 0) return;
    const a = this.carry[0]!;
    const b = this.nCarry === 2 ? this.carry[1]! : 0;
    const out = this.out;
    const p = this.pos;
    out[p] = ENCODE[a >> 2]!;
    out[p + 1] = ENCODE[((a & 3) << 4) | (b >> 4)]!;
    out[p + 2] = this.nCarry === 2 ? ENCODE[(b & 15) << 2]! : 61;
    out[p + 3] = 61;
    this.pos = p + 4;
    this.nCarry = 0;
  }

  private group(a: number, b: number, c: number): void {
    const out = this.out;
    const p = this.pos;
    out[p] = ENCODE[a >> 2]!;
    out[p + 1] = ENCODE[((a & 3) << 4) | (b >> 4)]!;
    out[p + 2] = ENCODE[((b & 15) << 2) | (c >> 6)]!;
    out[p + 3] = ENCODE[c & 63]!;
    this.pos = p + 4;
  }
}
