/**
 * The bytes of a legacy VTK file seen as keyword lines followed by values. One source serves
 * both encodings: ASCII values come from the shared Scanner, binary (big-endian) blocks are
 * decoded in bulk. Keyword lines are text in both, and binary blocks are never read as text:
 * they start right after their keyword line's newline and are skipped by their known size.
 * Errors carry a line in ASCII files and a byte offset in binary ones.
 */
import { MeshInputError, type ErrorLocation } from '../errors.js';
import type { FieldValues } from '../model.js';
import { Scanner, isSpace, lineAt } from '../scan.js';
import { decodeBigEndian, type NumericArray } from './bigEndian.js';
import { valueType, type ValueType } from './types.js';

const INT32_MIN = -2147483648;
const INT32_MAX = 2147483647;
const MAX_KEYWORD = 64;
const latin1 = new TextDecoder('latin1');

/** A Scanner whose errors carry a byte offset (binary files have no meaningful lines). */
class ByteScanner extends Scanner {
  override error(detail: string, at = this.pos): MeshInputError {
    return new MeshInputError(detail, { file: this.file, byteOffset: this.base + at });
  }
}

/** A token fit for a message: printable and short. */
export function shown(tok: string): string {
  const s = tok.length > 40 ? tok.slice(0, 40) + '…' : tok;
  return s.replace(/[^\x20-\x7e…]/g, '?');
}

function isSpaceOrEnd(b: Uint8Array, p: number): boolean {
  return p >= b.length || isSpace(b[p]!);
}

export class LegacySource {
  readonly bytes: Uint8Array;
  readonly file: string;
  sc: Scanner;
  binary = false;
  /** Byte offset of the keyword last returned by `keyword()`. */
  keywordAt = 0;

  constructor(bytes: Uint8Array, file: string) {
    this.bytes = bytes;
    this.file = file;
    this.sc = new Scanner(bytes, file);
  }

  /** From here on values are binary and errors give byte offsets. */
  setBinary(): void {
    const pos = this.sc.pos;
    this.sc = new ByteScanner(this.bytes, this.file);
    this.sc.pos = pos;
    this.binary = true;
  }

  get pos(): number {
    return this.sc.pos;
  }

  fail(detail: string, at = this.sc.pos): MeshInputError {
    return this.sc.error(detail, at);
  }

  /**
   * The location of byte `at`. In ASCII files the line is counted only if an error reads it,
   * so that a successful read never pays for a pass over the file.
   */
  locate(at: number): ErrorLocation {
    if (this.binary) return { file: this.file, byteOffset: at };
    const bytes = this.bytes;
    let line: number | undefined;
    return {
      file: this.file,
      get line(): number {
        if (line === undefined) line = lineAt(bytes, at);
        return line;
      },
    };
  }

  /** The location of value `k` of a block that starts at byte `start` (values of `size` bytes in binary). */
  valueLocation(start: number, k: number, size: number): ErrorLocation {
    if (this.binary) return { file: this.file, byteOffset: start + k * size };
    const b = this.bytes;
    const e = this.sc.end;
    let p = start;
    for (let i = 0; ; i++) {
      while (p < e && isSpace(b[p]!)) p++;
      if (i === k || p >= e) break;
      while (p < e && !isSpace(b[p]!)) p++;
    }
    return { file: this.file, line: lineAt(b, p) };
  }

  /** The next keyword in upper case ('' at the end of the file); METADATA blocks are skipped. */
  keyword(): string {
    for (;;) {
      const kw = this.word();
      if (kw !== 'METADATA') return kw;
      this.skipMetadata();
    }
  }

  private word(): string {
    const sc = this.sc;
    const b = this.bytes;
    sc.skipSpace();
    const s = sc.pos;
    this.keywordAt = s;
    let p = s;
    while (p < sc.end && !isSpace(b[p]!) && p - s < MAX_KEYWORD) p++;
    sc.pos = p;
    return latin1.decode(b.subarray(s, p)).toUpperCase();
  }

  /** A metadata block (component names, information keys) ends with an empty line. */
  skipMetadata(): void {
    const b = this.bytes;
    const e = this.sc.end;
    this.sc.skipLine();
    let p = this.sc.pos;
    while (p < e) {
      let q = p;
      while (q < e && (b[q] === 32 || b[q] === 9 || b[q] === 13)) q++;
      if (q >= e || b[q] === 10) {
        p = q < e ? q + 1 : q;
        break;
      }
      while (q < e && b[q] !== 10) q++;
      p = q < e ? q + 1 : q;
    }
    this.sc.pos = p;
  }

  /** If `word` (any case) comes next, move past it and return true; otherwise stay put. */
  accept(word: string): boolean {
    const sc = this.sc;
    const s = sc.pos;
    sc.skipSpace();
    const p = sc.pos;
    const b = this.bytes;
    let ok = p + word.length <= sc.end && isSpaceOrEnd(b, p + word.length);
    for (let i = 0; ok && i < word.length; i++) {
      const c = b[p + i]!;
      ok = (c >= 97 && c <= 122 ? c - 32 : c) === word.charCodeAt(i);
    }
    sc.pos = ok ? p + word.length : s;
    return ok;
  }

  /** The next token on the keyword line, or '' at the line's end. */
  lineToken(): string {
    return this.sc.atLineEnd() ? '' : this.sc.token();
  }

  atLineEnd(): boolean {
    return this.sc.atLineEnd();
  }

  need(what: string, section: string): string {
    const tok = this.lineToken();
    if (tok === '') throw this.fail(`${section}: missing ${what}`);
    return tok;
  }

  /** A non-negative integer on the keyword line. */
  count(what: string, section: string): number {
    this.sc.skipInline();
    const at = this.sc.pos;
    const tok = this.need(what, section);
    const v = /^\+?\d{1,16}$/.test(tok) ? Number(tok) : NaN;
    if (!(v <= Number.MAX_SAFE_INTEGER)) {
      throw this.fail(`${section}: ${what} must be a non-negative integer, found "${shown(tok)}"`, at);
    }
    return v;
  }

  type(section: string): ValueType {
    this.sc.skipInline();
    const at = this.sc.pos;
    const tok = this.need('a value type', section);
    const t = valueType(tok);
    if (!t) throw this.fail(`${section}: unknown value type "${shown(tok)}"`, at);
    return t;
  }

  /**
   * End a keyword line. Binary data starts right after its newline, so nothing else may
   * stand on the line; ASCII values are read wherever they are.
   */
  endLine(section: string): void {
    if (!this.binary) return;
    if (!this.sc.atLineEnd()) throw this.fail(`${section}: unexpected "${shown(this.sc.token())}" on the keyword line`);
    this.sc.skipLine();
  }

  /** Fail unless `n` values of `t` can still fit in the bytes left; called before allocating. */
  room(n: number, t: ValueType, section: string): void {
    if (n === 0) return;
    const left = this.sc.end - this.sc.pos;
    let need: number;
    if (!this.binary) need = 2 * n - 1; // a digit and a separator per value
    else if (t.kind === 'bit') need = Math.ceil(n / 8);
    else need = n * Math.max(t.size, 1);
    if (need > left) {
      const what = this.binary ? `${need} bytes` : `at least ${need} bytes`;
      throw this.fail(`${section}: ${n} ${t.name} values need ${what} but only ${left} remain (truncated file or wrong count)`);
    }
  }

  /** `n` numbers of an array: float stays Float32Array, every other type becomes Float64Array. */
  readData(n: number, t: ValueType, section: string): FieldValues {
    this.numeric(t, section);
    this.room(n, t, section);
    if (this.binary) {
      const a = this.decode(n, t);
      return a instanceof Float32Array || a instanceof Float64Array ? a : new Float64Array(a);
    }
    const out = t.kind === 'float' && t.size === 4 ? new Float32Array(n) : new Float64Array(n);
    this.asciiNumbers(out, n, section);
    return out;
  }

  /** `n` integers that must fit 32 bits (cell offsets, node indices, cell types). */
  readInts(n: number, t: ValueType, section: string): Int32Array {
    this.numeric(t, section);
    this.room(n, t, section);
    if (this.binary) {
      const start = this.sc.pos;
      const a = this.decode(n, t);
      if (a instanceof Int32Array) return a;
      const out = new Int32Array(n);
      for (let i = 0; i < n; i++) {
        const v = a[i]!;
        if (!(v >= INT32_MIN && v <= INT32_MAX && v === Math.floor(v))) {
          throw this.fail(`${section}: value ${v} is not a 32-bit integer`, start + i * t.size);
        }
        out[i] = v;
      }
      return out;
    }
    return this.asciiInts(n, section);
  }

  /** Move past `n` values of `t` without keeping them. */
  skip(n: number, t: ValueType, section: string): void {
    if (t.kind === 'string') {
      this.skipStrings(n, section);
      return;
    }
    this.room(n, t, section);
    if (this.binary) {
      this.sc.pos += t.kind === 'bit' ? Math.ceil(n / 8) : n * t.size;
      return;
    }
    this.asciiNumbers(null, n, section);
  }

  /** ASCII integers: plain digits are parsed here, anything else by the Scanner (with its checks). */
  private asciiInts(n: number, section: string): Int32Array {
    const out = new Int32Array(n);
    const sc = this.sc;
    const b = this.bytes;
    const e = sc.end;
    let p = sc.pos;
    let i = 0;
    try {
      for (; i < n; i++) {
        while (p < e && isSpace(b[p]!)) p++;
        // up to 9 digits always fit 32 bits
        let q = p;
        const neg = q < e && b[q] === 45;
        if (neg) q++;
        const d0 = q;
        let v = 0;
        while (q < e && q - d0 < 10) {
          const c = b[q]! - 48;
          if (c < 0 || c > 9) break;
          v = v * 10 + c;
          q++;
        }
        if (q > d0 && q - d0 < 10 && (q >= e || isSpace(b[q]!))) {
          out[i] = neg ? -v : v;
          p = q;
        } else {
          sc.pos = p;
          out[i] = sc.int('an integer', INT32_MIN, INT32_MAX);
          p = sc.pos;
        }
      }
    } catch (err) {
      throw this.inContext(err, section, i, n);
    }
    sc.pos = p;
    return out;
  }

  /** `n` ASCII numbers into `out`, or only checked and passed when `out` is null. */
  private asciiNumbers(out: FieldValues | null, n: number, section: string): void {
    const sc = this.sc;
    let i = 0;
    try {
      if (out) for (; i < n; i++) out[i] = sc.number('a number');
      else for (; i < n; i++) sc.number('a number');
    } catch (e) {
      throw this.inContext(e, section, i, n);
    }
  }

  private numeric(t: ValueType, section: string): void {
    if (t.kind === 'bit' || t.kind === 'string') throw this.fail(`${section}: ${t.name} values cannot be read as numbers`);
  }

  private decode(n: number, t: ValueType): NumericArray {
    const start = this.sc.pos;
    const a = decodeBigEndian(this.bytes, start, n, t);
    this.sc.pos = start + n * t.size;
    return a;
  }

  private inContext(e: unknown, section: string, i: number, n: number): unknown {
    if (!(e instanceof MeshInputError)) return e;
    return new MeshInputError(`${section}: value ${i + 1} of ${n}: ${e.detail}`, e.location);
  }

  /**
   * String values: one per line in ASCII files; in binary files each has a big-endian length
   * whose top two bits give its own size (11: 1 byte, 10: 2, 01: 4, 00: 8) (from memory).
   */
  private skipStrings(n: number, section: string): void {
    const sc = this.sc;
    const b = this.bytes;
    const e = sc.end;
    if (!this.binary) sc.skipLine();
    for (let i = 0; i < n; i++) {
      const at = sc.pos;
      if (at >= e) throw this.fail(`${section}: the file ends after ${i} of ${n} strings`);
      if (!this.binary) {
        sc.skipLine();
        continue;
      }
      const tag = b[at]! >>> 6;
      const head = tag === 3 ? 1 : tag === 2 ? 2 : tag === 1 ? 4 : 8;
      if (at + head > e) throw this.fail(`${section}: string ${i + 1} of ${n} is cut off`, at);
      let len = b[at]! & 0x3f;
      for (let k = 1; k < head; k++) len = len * 256 + b[at + k]!;
      if (len > e - at - head) throw this.fail(`${section}: string ${i + 1} of ${n} is cut off`, at);
      sc.pos = at + head + len;
    }
  }
}
