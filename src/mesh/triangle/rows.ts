/**
 * Row reader for Triangle's .node and .ele files: one record per line, `#` starts a comment
 * anywhere on a line, blank lines anywhere, records numbered consecutively from 0 or 1.
 */
import { MAX_COORDINATE, usableCoordinate } from '../cells.js';
import { Scanner } from '../scan.js';

export class Rows {
  readonly sc: Scanner;
  /** The first record's index (0 or 1), known after the first record. */
  base = 0;

  constructor(bytes: Uint8Array, file: string) {
    const start = bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf ? 3 : 0;
    this.sc = new Scanner(bytes, file, start);
  }

  /** Move to the first value of the next line that has one; false at the end of the file. */
  next(): boolean {
    const sc = this.sc;
    for (;;) {
      sc.skipSpace();
      if (sc.pos >= sc.end) return false;
      if (sc.bytes[sc.pos] !== 35) return true;
      sc.skipLine();
    }
  }

  /** True when the current line has no more values. */
  ended(): boolean {
    const sc = this.sc;
    sc.skipInline();
    return sc.pos >= sc.end || sc.bytes[sc.pos] === 10 || sc.bytes[sc.pos] === 35;
  }

  value(what: string): number {
    if (this.ended()) throw this.sc.error(`the line ends before ${what}`);
    return this.sc.number(what);
  }

  /** A coordinate: finite and within ±MAX_COORDINATE. */
  coordinate(what: string): number {
    const at = this.sc.pos;
    const v = this.value(what);
    if (!usableCoordinate(v)) throw this.sc.error(`${what} is ${v}${Number.isFinite(v) ? `, beyond ±${MAX_COORDINATE}` : ''}`, at);
    return v;
  }

  int(what: string, lo?: number, hi?: number): number {
    if (this.ended()) throw this.sc.error(`the line ends before ${what}`);
    return this.sc.int(what, lo, hi);
  }

  /** An optional header value: `fallback` when the line has ended. */
  optionalInt(what: string, fallback: number, lo: number, hi: number): number {
    return this.ended() ? fallback : this.sc.int(what, lo, hi);
  }

  /** The current line must hold nothing more. */
  end(layout: string): void {
    if (!this.ended()) throw this.sc.error(`more values on this line than the header announces (${layout})`);
  }

  /** Fail before allocating when `n` records of `values` numbers cannot fit in the bytes left. */
  need(n: number, values: number, what: string): void {
    const left = this.sc.end - this.sc.pos;
    if (n * values * 2 - 1 > left) {
      throw this.sc.error(`the header announces ${n} ${what}, more than the ${left} bytes left in the file can hold`);
    }
  }

  /**
   * Start record `i` of `n`: move to its line and check its index, which must be 0 or 1 for
   * the first record and then run on by one.
   */
  record(i: number, n: number, what: string): number {
    if (!this.next()) throw this.sc.error(`the file ends after ${i} of the ${n} ${what} the header announces`);
    const at = this.sc.pos;
    const idx = this.int(`the index of a ${what.slice(0, -1)}`);
    if (i === 0) {
      if (idx !== 0 && idx !== 1) throw this.sc.error(`the first ${what.slice(0, -1)} has index ${idx}; numbering must start at 0 or 1`, at);
      this.base = idx;
    } else if (idx !== this.base + i) {
      const why = idx < this.base + i ? 'duplicated or out of order' : 'an index was skipped';
      throw this.sc.error(`${what.slice(0, -1)} index ${idx} where ${this.base + i} was expected (${why})`, at);
    }
    return idx;
  }

  /** Nothing but comments may follow the last record. */
  finish(n: number, what: string): void {
    if (this.next()) throw this.sc.error(`more lines than the ${n} ${what} the header announces`);
  }
}
