/**
 * Byte scanner for ASCII mesh formats: numbers and tokens are read straight from the bytes,
 * with no per-line strings and no split/regex per value. Line numbers are computed only when
 * an error needs one.
 */
import { decimalToDouble } from './decimal.js';
import { MeshInputError } from './errors.js';

const POW10 = [1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15,
  1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22];

const latin1 = new TextDecoder('latin1');

export function isSpace(c: number): boolean {
  return c === 32 || c === 10 || c === 13 || c === 9 || c === 12 || c === 11;
}

/** 1-based line number of a byte offset. */
export function lineAt(bytes: Uint8Array, offset: number): number {
  let line = 1;
  const end = Math.min(offset, bytes.length);
  for (let i = 0; i < end; i++) if (bytes[i] === 10) line++;
  return line;
}

export class Scanner {
  readonly bytes: Uint8Array;
  readonly file: string;
  pos: number;
  readonly end: number;
  /** Byte offset the scanner's positions are relative to in the whole file (for messages). */
  readonly base: number;
  /** Full file bytes for line numbers, when `bytes` is a slice. */
  private readonly whole: Uint8Array;

  constructor(bytes: Uint8Array, file: string, start = 0, end = bytes.length, whole?: Uint8Array, base = 0) {
    this.bytes = bytes;
    this.file = file;
    this.pos = start;
    this.end = end;
    this.whole = whole ?? bytes;
    this.base = base;
  }

  /** An error located at a byte offset (default: the current position), reported as a line number. */
  error(detail: string, at = this.pos): MeshInputError {
    return new MeshInputError(detail, { file: this.file, line: lineAt(this.whole, this.base + at) });
  }

  atEnd(): boolean {
    this.skipSpace();
    return this.pos >= this.end;
  }

  skipSpace(): void {
    const b = this.bytes;
    let p = this.pos;
    const e = this.end;
    while (p < e) {
      const c = b[p]!;
      if (c === 32 || c === 10 || c === 13 || c === 9 || c === 12 || c === 11) p++;
      else break;
    }
    this.pos = p;
  }

  /** Skip spaces and tabs only (stay on the line). */
  skipInline(): void {
    const b = this.bytes;
    let p = this.pos;
    while (p < this.end && (b[p] === 32 || b[p] === 9 || b[p] === 13)) p++;
    this.pos = p;
  }

  /** Move past the next newline (or to the end). */
  skipLine(): void {
    const b = this.bytes;
    let p = this.pos;
    while (p < this.end && b[p] !== 10) p++;
    this.pos = p < this.end ? p + 1 : p;
  }

  /** True when only spaces remain before the end of the current line. */
  atLineEnd(): boolean {
    this.skipInline();
    return this.pos >= this.end || this.bytes[this.pos] === 10;
  }

  /** The next whitespace-delimited token as a string (for keywords; not for bulk numbers). */
  token(): string {
    this.skipSpace();
    const b = this.bytes;
    const s = this.pos;
    let p = s;
    while (p < this.end && !isSpace(b[p]!)) p++;
    this.pos = p;
    return latin1.decode(b.subarray(s, p));
  }

  /** Rest of the current line, trimmed, and move past it. */
  line(): string {
    const b = this.bytes;
    const s = this.pos;
    let p = s;
    while (p < this.end && b[p] !== 10) p++;
    this.pos = p < this.end ? p + 1 : p;
    return latin1.decode(b.subarray(s, p)).trim();
  }

  /**
   * The next number. Throws a located error naming `what` at a non-number or at the end.
   * Exact: the fast paths are taken only where they are exact (Clinger's for up to 15 digits and
   * |exponent| ≤ 22; double-double arithmetic for up to 19 digits), otherwise Number() on the token.
   */
  number(what = 'a number'): number {
    this.skipSpace();
    const b = this.bytes;
    const e = this.end;
    const s = this.pos;
    if (s >= e) throw this.error(`unexpected end of file: expected ${what}`, s);
    let p = s;
    let neg = false;
    let c = b[p]!;
    if (c === 45) { neg = true; p++; } else if (c === 43) p++;
    // significant digits: the first 15 in mant, up to 4 more in low (nLow of them)
    let mant = 0;
    let low = 0;
    let nLow = 0;
    let digits = 0;
    let scale = 0;
    let any = false;
    let slow = false;
    while (p < e) {
      const d = b[p]! - 48;
      if (d >= 0 && d <= 9) {
        if (digits < 15) { mant = mant * 10 + d; if (mant !== 0) digits++; } else if (digits < 19) { low = low * 10 + d; nLow++; digits++; } else { scale++; slow = true; }
        any = true;
        p++;
      } else break;
    }
    if (p < e && b[p] === 46) {
      p++;
      while (p < e) {
        const d = b[p]! - 48;
        if (d >= 0 && d <= 9) {
          if (digits < 15) { mant = mant * 10 + d; if (mant !== 0) digits++; scale--; } else if (digits < 19) { low = low * 10 + d; nLow++; digits++; scale--; } else slow = true;
          any = true;
          p++;
        } else break;
      }
    }
    if (any && p < e) {
      c = b[p]!;
      if (c === 101 || c === 69 || c === 100 || c === 68) {
        if (c === 100 || c === 68) slow = true; // Fortran exponent letter
        let q = p + 1;
        let eneg = false;
        if (q < e && (b[q] === 45 || b[q] === 43)) { eneg = b[q] === 45; q++; }
        let ex = 0;
        let exDigits = 0;
        while (q < e) {
          const d = b[q]! - 48;
          if (d >= 0 && d <= 9) { if (ex < 100000) ex = ex * 10 + d; exDigits++; q++; } else break;
        }
        if (exDigits > 0) {
          scale += eneg ? -ex : ex;
          p = q;
        }
      }
    }
    if (!any || (p < e && !isSpace(b[p]!) && b[p] !== 44)) {
      // not a plain decimal: nan / inf / Infinity, or garbage
      let q = s;
      while (q < e && !isSpace(b[q]!)) q++;
      const tok = latin1.decode(b.subarray(s, q));
      const v = parseSpecial(tok);
      if (v === undefined) throw this.error(`expected ${what}, found "${tok.length > 40 ? tok.slice(0, 40) + '…' : tok}"`, s);
      this.pos = q;
      return v;
    }
    this.pos = p;
    if (!slow && nLow === 0 && scale >= -22 && scale <= 22) {
      const v = scale < 0 ? mant / POW10[-scale]! : mant * POW10[scale]!;
      return neg ? -v : v;
    }
    if (!slow) {
      // up to 19 digits at any scale, exact in double-double arithmetic unless too close to call
      const v = decimalToDouble(mant, low, nLow, scale);
      if (v === v) return neg ? -v : v;
    }
    // exact but slower: the token as a string (Fortran 'd' exponents become 'e')
    let txt = '';
    for (let q = s; q < p; q++) {
      const ch = b[q]!;
      txt += String.fromCharCode(ch === 100 || ch === 68 ? 101 : ch);
    }
    return Number(txt);
  }

  /** The next number, which must be an integer in [lo, hi]. */
  int(what: string, lo = -Number.MAX_SAFE_INTEGER, hi = Number.MAX_SAFE_INTEGER): number {
    const at = (this.skipSpace(), this.pos);
    const v = this.number(what);
    if (!Number.isInteger(v) || v < lo || v > hi) {
      throw this.error(`expected ${what} (an integer in ${lo}..${hi}), found ${v}`, at);
    }
    return v;
  }

  /** Fill `out[0..n)` with numbers. */
  numbers(out: { [i: number]: number; length: number }, n: number, what: string): void {
    for (let i = 0; i < n; i++) out[i] = this.number(what);
  }
}

function parseSpecial(tok: string): number | undefined {
  const t = tok.toLowerCase().replace(/,$/, '');
  if (t === 'nan' || t === '-nan' || t === '+nan' || t === 'nan(ind)' || t === '-nan(ind)') return NaN;
  if (t === 'inf' || t === '+inf' || t === 'infinity' || t === '+infinity' || t === '1.#inf') return Infinity;
  if (t === '-inf' || t === '-infinity' || t === '-1.#inf') return -Infinity;
  // exact forms the fast path leaves out (hex floats are not mesh-file syntax); the pattern has
  // one way to match each digit, so a long run of digits before garbage fails in linear time
  if (/^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eEdD][+-]?\d+)?$/.test(t)) return Number(t.replace(/[dD]/, 'e'));
  return undefined;
}
