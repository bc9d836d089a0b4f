/**
 * Numbers written straight into a byte buffer as the same text ECMAScript's Number::toString
 * gives (shortest digits that read back to the same double, the closest of them), without
 * building a string per value. Non-finite values are written inf, -inf, nan (as `num` does).
 *
 * Method: x = f·2^e is scaled to V = x·10^K in [1e16, 1e17) with double-double arithmetic
 * (Dekker's exact product against a table of 10^K to about 2^-105), which pins V and the
 * rounding interval of x to about 1e-14. The shortest decimal in that interval is then found
 * with small integers. When any decision falls within 1e-7 of a boundary or a tie (where that
 * error could matter), String(x) decides instead, so the output never differs from it.
 */

import { POW10_MAX, POW10_MIN, pow10Table, productError } from '../mesh/decimal.js';
import { HI_WORD as HI, LO_WORD as LO } from '../mesh/host.js';

/**
 * Bytes a number may take: "-1.2345678901234567e-308" is 24. The writer may also use the bytes
 * after the number as scratch, up to this many from where it starts.
 */
export const MAX_NUMBER_BYTES = 28;

const f64 = new Float64Array(1);
const u32 = new Uint32Array(f64.buffer);

const TWO32 = 4294967296;
const TWO52 = 4503599627370496;
const TWO53 = 9007199254740992;
const EPS = 1e-7;

/** 2^i for i in [-64, 64]. */
const POW2 = new Float64Array(129);
for (let i = -64; i <= 64; i++) POW2[i + 64] = 2 ** i;

function writeAscii(out: Uint8Array, pos: number, s: string): number {
  for (let i = 0; i < s.length; i++) out[pos + i] = s.charCodeAt(i);
  return pos + s.length;
}

/** "00".."99" */
const PAIRS = new Uint8Array(200);
for (let i = 0; i < 100; i++) {
  PAIRS[2 * i] = 48 + Math.floor(i / 10);
  PAIRS[2 * i + 1] = 48 + (i % 10);
}

// Digits are made with int32 arithmetic ((x / c) | 0 compiles to a multiply, not a division)
// on values below 1e8, in independent steps rather than one chain of divisions by 10.

/** The two digits of 0 ≤ d < 100 at pos. */
function put2(out: Uint8Array, pos: number, d: number): void {
  out[pos] = PAIRS[2 * d]!;
  out[pos + 1] = PAIRS[2 * d + 1]!;
}

/** An integer 0 ≤ v < 1e8 as exactly 8 digits. */
function put8(out: Uint8Array, pos: number, v: number): void {
  const x = v | 0;
  const h = (x / 10000) | 0, l = x - h * 10000;
  const h1 = (h / 100) | 0, l1 = (l / 100) | 0;
  put2(out, pos, h1);
  put2(out, pos + 2, h - h1 * 100);
  put2(out, pos + 4, l1);
  put2(out, pos + 6, l - l1 * 100);
}

/** Digits of an integer 0 ≤ v < 1e8, no leading zeros. */
function writeSmall(out: Uint8Array, pos: number, v: number): number {
  const n = v < 1e4
    ? (v < 10 ? 1 : v < 100 ? 2 : v < 1e3 ? 3 : 4)
    : v < 1e6 ? (v < 1e5 ? 5 : 6) : v < 1e7 ? 7 : 8;
  let t = v | 0;
  let i = pos + n;
  while (i - pos >= 2) {
    const q = (t / 100) | 0;
    put2(out, i - 2, t - q * 100);
    i -= 2;
    t = q;
  }
  if (i > pos) out[pos] = 48 + t;
  return pos + n;
}

/** Digits of an integer 0 ≤ v < 2^53, written at pos. */
export function writeInteger(out: Uint8Array, pos: number, v: number): number {
  if (v < 1e8) return writeSmall(out, pos, v);
  const a = Math.floor(v / 1e8);
  const p = writeSmall(out, pos, a);
  put8(out, p, v - a * 1e8);
  return p + 8;
}

/** Write x as `num(x)` would (String(x), or inf / -inf / nan); at most MAX_NUMBER_BYTES bytes. */
export function writeNumber(out: Uint8Array, pos: number, x: number): number {
  if (x !== x) return writeAscii(out, pos, 'nan');
  if (x === 0) {
    // -0 keeps its sign: the text must read back as the same double
    if (1 / x < 0) { out[pos] = 45; out[pos + 1] = 48; return pos + 2; }
    out[pos] = 48;
    return pos + 1;
  }
  let p = pos;
  let v = x;
  if (v < 0) { out[p++] = 45; v = -v; }
  if (v === Infinity) return writeAscii(out, p, 'inf');
  if (v < TWO53 && v === Math.floor(v)) return writeInteger(out, p, v);
  const end = shortest(out, p, v);
  return end >= 0 ? end : writeAscii(out, pos, String(x));
}

let POW_HI: Float64Array | null = null;
let POW_LO: Float64Array | null = null;
let POW_EXP: Int32Array | null = null;

function loadTable(): Float64Array {
  const t = pow10Table();
  POW_LO = t.lo;
  POW_EXP = t.exp;
  POW_HI = t.hi;
  return t.hi;
}

/** The nd digits (16, 17 or 18) of lead·1e16 + mid·1e8 + low at out[q..]; lead < 10, or 10 with nd = 18. */
function putDigits(out: Uint8Array, q: number, lead: number, mid: number, low: number, nd: number): void {
  if (nd === 18) { out[q] = 49; out[q + 1] = 48; q += 2; } else if (nd === 17) out[q++] = 48 + lead;
  put8(out, q, mid);
  put8(out, q + 8, low);
}

/** Trailing zero digits of the nd-digit number ·mid·low (mid, low < 1e8), at most nd − 1. */
function trailingZeros(mid: number, low: number, nd: number): number {
  let z = 0;
  let v = low;
  if (v === 0) {
    z = 8;
    v = mid;
    if (v === 0) return nd - 1; // 1e16 or 1e17: one significant digit
  }
  while (v % 10 === 0) { v = (v / 10) | 0; z++; }
  return Math.min(z, nd - 1);
}

/** Shortest digits of a finite v > 0 at pos; -1 when the margin test sends it to String(). */
function shortest(out: Uint8Array, pos: number, v: number): number {
  const ph = POW_HI ?? loadTable();
  const powLo = POW_LO!, powExp = POW_EXP!;
  f64[0] = v;
  const hw = u32[HI]!;
  const be = hw >>> 20; // biased exponent; the sign bit is clear
  // subnormals have wider rounding intervals than the integer steps below allow for
  if (be === 0) return -1;
  const top = hw & 0xfffff;
  const f = top * TWO32 + u32[LO]! + TWO52;
  const e = be - 1075;
  // log2(v) ≈ (be − 1023) + (mantissa − 1) (never above it): K with V = v·10^K in [1e16, 1e17),
  // or one too large (then one more try below)
  let K = 16 - Math.floor((be - 1023 + top / 1048576) * 0.30102999566398114);
  const asymmetric = f === TWO52 && be > 1;
  let s = 0, t = 0, dh = 0, dl = 0;
  for (let tries = 0; ; tries++) {
    if (K < POW10_MIN || K > POW10_MAX || tries > 2) return -1;
    const mh = ph[K - POW10_MIN]!, ml = powLo[K - POW10_MIN]!;
    // f·mh exactly as p + q (Dekker), then + f·ml
    const p = f * mh;
    const q = productError(f, mh, p) + f * ml;
    const sc = e + powExp[K - POW10_MIN]!;
    if (sc < -64 || sc > 64) return -1;
    const scale = POW2[sc + 64]!;
    s = p + q;
    t = (q - (s - p)) * scale;
    s *= scale;
    dh = mh * scale * 0.5;
    dl = ml * scale * 0.5;
    if (s >= 1e17) K--;
    else if (s < 1e16) K++;
    else break;
  }
  // floor(V) = a·1e8 + b and frac(V) = fv; s is an integer (≥ 2^53)
  let a = Math.floor(s / 1e8);
  let b = s - a * 1e8;
  const ft = Math.floor(t);
  b += ft;
  const fv = t - ft;
  while (b < 0) { b += 1e8; a--; }
  while (b >= 1e8) { b -= 1e8; a++; }
  // the rounding interval relative to floor(V): [fv - dm, fv + dp]
  const dp = dh + dl;
  const dm = asymmetric ? 0.5 * dp : dp;
  const up = fv + dp, lowEnd = fv - dm;
  const pOff = Math.floor(up);
  const lowFloor = Math.floor(lowEnd);
  const upFrac = up - pOff, lowFrac = lowEnd - lowFloor;
  if (upFrac < EPS || upFrac > 1 - EPS || lowFrac < EPS || lowFrac > 1 - EPS) return -1;
  const mOff = lowFloor + 1; // lowEnd is not an integer
  const w = pOff - mOff; // integers in the interval, less one (0..22)
  if (w < 0) return -1;
  // M = floor(V) + mOff, the smallest integer in the interval
  let bm = b + mOff;
  let am = a;
  if (bm < 0) { bm += 1e8; am--; } else if (bm >= 1e8) { bm -= 1e8; am++; }
  const vr = fv - mOff; // V - M
  const m100 = (bm | 0) % 100; // bm < 1e8
  const m10 = m100 % 10;
  const g1 = m10 === 0 ? 0 : 10 - m10;
  let off: number;
  let r: number;
  if (g1 > w) {
    // every integer of the interval is a candidate: the one nearest V
    const fr = vr - Math.floor(vr);
    if (Math.abs(fr - 0.5) < EPS) return -1;
    off = Math.min(w, Math.max(0, Math.floor(vr + 0.5)));
    r = 0;
  } else {
    const g2 = m100 === 0 ? 0 : 100 - m100;
    if (g2 > w) {
      const y = (vr - g1) / 10;
      const fr = y - Math.floor(y);
      if (Math.abs(fr - 0.5) < EPS) return -1;
      off = g1 + 10 * Math.min(Math.floor((w - g1) / 10), Math.max(0, Math.floor(y + 0.5)));
      r = 1;
    } else {
      off = g2; // the only multiple of 100 in the interval
      r = -1;
    }
  }
  // the chosen integer C = M + off
  let bc = bm + off;
  let ac = am;
  if (bc >= 1e8) { bc -= 1e8; ac++; }
  // C = lead·1e16 + mid·1e8 + bc: nd digits (C ≥ 1e16 − 1, and C ≤ 1e17)
  const lead = Math.floor(ac / 1e8);
  const mid = ac - lead * 1e8;
  const nd = lead >= 10 ? 18 : lead > 0 ? 17 : 16;
  if (r < 0) r = trailingZeros(mid, bc, nd);
  const k = nd - r; // significant digits
  const n = nd - K; // decimal point position: value = 0.d1d2… × 10^n
  // the digits are written in place and moved a byte where a point goes in
  let o = pos;
  if (k <= n && n <= 21) {
    // an integer: the digits past k are zeros already
    putDigits(out, o, lead, mid, bc, nd);
    if (n <= nd) o += n;
    else { o += nd; for (let i = nd; i < n; i++) out[o++] = 48; }
  } else if (0 < n && n <= 21) {
    putDigits(out, o + 1, lead, mid, bc, nd);
    for (let i = 0; i < n; i++) out[o + i] = out[o + 1 + i]!;
    out[o + n] = 46;
    o += k + 1;
  } else if (-6 < n && n <= 0) {
    out[o++] = 48;
    out[o++] = 46;
    for (let i = n; i < 0; i++) out[o++] = 48;
    putDigits(out, o, lead, mid, bc, nd);
    o += k;
  } else {
    putDigits(out, o + 1, lead, mid, bc, nd);
    out[o] = out[o + 1]!;
    if (k > 1) { out[o + 1] = 46; o += k + 1; } else o += 1;
    out[o++] = 101;
    const ex = n - 1;
    out[o++] = ex < 0 ? 45 : 43;
    o = writeSmall(out, o, Math.abs(ex));
  }
  return o;
}
