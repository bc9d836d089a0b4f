/**
 * Exact decimal ↔ binary helpers shared by the ASCII scanner and the number writer: powers of
 * ten as double-double values, Dekker's exact product, and decimal mantissas of up to 19
 * digits turned into the nearest double.
 *
 * A double-double carries about 106 bits; the products here lose a few, which pins a result
 * to about 2^-100 of itself. A decision closer than 2^-40 ulp to a rounding boundary is
 * declined (NaN), and the caller falls back to the exact, slower Number(text).
 */
import { HI_WORD as HI, LO_WORD as LO } from './host.js';

export const POW10_MIN = -330;
export const POW10_MAX = 330;

/** 10^K = (hi + lo)·2^exp, hi in [1, 2], for K in [POW10_MIN, POW10_MAX]. */
export interface Pow10Table {
  hi: Float64Array;
  lo: Float64Array;
  exp: Int32Array;
}

let table: Pow10Table | null = null;

function bitLength(v: bigint): number {
  return v.toString(2).length;
}

/** The table, built on first use (BigInt arithmetic, a few milliseconds). */
export function pow10Table(): Pow10Table {
  if (table) return table;
  const n = POW10_MAX - POW10_MIN + 1;
  const hi = new Float64Array(n), lo = new Float64Array(n), exp = new Int32Array(n);
  const scale = 2 ** -120;
  for (let K = POW10_MIN; K <= POW10_MAX; K++) {
    const y = 10n ** BigInt(Math.abs(K));
    const bl = bitLength(y);
    let b: bigint;
    let t: number;
    if (K >= 0) {
      t = bl - 1;
      b = t <= 120 ? y << BigInt(120 - t) : y >> BigInt(t - 120);
    } else {
      t = -bl; // 10^K lies in (2^-bl, 2^(1-bl)) for K < 0
      b = (1n << BigInt(bl + 120)) / y;
    }
    const h = Number(b);
    hi[K - POW10_MIN] = h * scale;
    lo[K - POW10_MIN] = Number(b - BigInt(h)) * scale;
    exp[K - POW10_MIN] = t;
  }
  table = { hi, lo, exp };
  return table;
}

/** Veltkamp's splitter 2^27 + 1: x·SPLIT separates a double into two 26-bit halves. */
const SPLIT = 134217729;

/** a·b − p exactly, for p = fl(a·b) (Dekker's product, no fused multiply-add needed). */
export function productError(a: number, b: number, p: number): number {
  let c = SPLIT * a;
  const ah = c - (c - a), al = a - ah;
  c = SPLIT * b;
  const bh = c - (c - b), bl = b - bh;
  return ((ah * bh - p) + ah * bl + al * bh) + al * bl;
}

/** 2^i for i in [-600, 600]. */
const POW2 = new Float64Array(1201);
for (let i = -600; i <= 600; i++) POW2[i + 600] = 2 ** i;

const f64 = new Float64Array(1);
const u32 = new Uint32Array(f64.buffer);
const TEN_POW = [1, 10, 100, 1000, 10000];
const MIN_NORMAL = 2.2250738585072014e-308;

/**
 * The double nearest to (mHi·10^nLo + mLo)·10^e10, with mHi < 10^15, mLo < 10^nLo, nLo ≤ 4;
 * NaN when the answer is too close to call here (or subnormal, or out of range).
 */
export function decimalToDouble(mHi: number, mLo: number, nLo: number, e10: number): number {
  if (mHi === 0 && mLo === 0) return 0;
  if (e10 < POW10_MIN || e10 > POW10_MAX) return NaN;
  const t = pow10Table();
  // the mantissa M = m1 + m2 exactly: mHi·10^nLo by Dekker's product, then + mLo
  const k = TEN_POW[nLo]!;
  const p = mHi * k;
  const pe = productError(mHi, k, p);
  const s = p + mLo;
  const se = mLo - (s - p) + pe;
  const m1 = s + se, m2 = se - (m1 - s);
  // M × (th + tl), then the rounding of that double-double to one double
  const i = e10 - POW10_MIN;
  const th = t.hi[i]!, tl = t.lo[i]!;
  const q = m1 * th;
  const qe = productError(m1, th, q) + (m1 * tl + m2 * th);
  const r1 = q + qe, r2 = qe - (r1 - q);
  // ulp of r1, and the distance of r1 + r2 to the nearest midpoint between doubles
  f64[0] = r1;
  const hw = u32[HI]!;
  const powerOfTwo = (hw & 0xfffff) === 0 && u32[LO] === 0;
  u32[HI] = hw & 0x7ff00000;
  u32[LO] = 0;
  const ulp = f64[0] * 2 ** -52;
  const half = r2 < 0 && powerOfTwo ? ulp / 4 : ulp / 2;
  if (Math.abs(half - Math.abs(r2)) < ulp * 2 ** -40) return NaN;
  // scale by 2^exp in two steps, exact when the result is normal; a product that fell below
  // the normal range was rounded, and comes out at most MIN_NORMAL
  const e = t.exp[i]!;
  const a = Math.floor(e / 2);
  const v = r1 * POW2[a + 600]! * POW2[e - a + 600]!;
  return v > MIN_NORMAL && v < Infinity ? v : NaN;
}
