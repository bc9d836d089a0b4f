/** Small statistics helpers over typed arrays (no per-value objects). */

import { HI_WORD as HI, LO_WORD as LO } from '../mesh/host.js';

const SIGN = 0x80000000;

/**
 * Turn the doubles of `w` (a Uint32Array view, two words per double) into keys whose unsigned
 * order is the numeric order (-0 before +0; NaN must not occur): flip every bit of a negative,
 * the sign bit of the rest. `back` undoes it.
 */
function toKeys(w: Uint32Array, n: number, back: boolean): void {
  for (let i = 0; i < n; i++) {
    const h = w[2 * i + HI]!;
    const negative = back ? (h & SIGN) === 0 : (h & SIGN) !== 0;
    if (negative) { w[2 * i + HI] = ~h >>> 0; w[2 * i + LO] = ~w[2 * i + LO]! >>> 0; } else w[2 * i + HI] = (h ^ SIGN) >>> 0;
  }
}

/** Digit k (11 bits, k = 0..5, least significant first) of the 64-bit key (lo, hi). */
function digit11(lo: number, hi: number, k: number): number {
  switch (k) {
    case 0: return lo & 0x7ff;
    case 1: return (lo >>> 11) & 0x7ff;
    case 2: return (lo >>> 22) | ((hi & 1) << 10);
    case 3: return (hi >>> 1) & 0x7ff;
    case 4: return (hi >>> 12) & 0x7ff;
    default: return hi >>> 23;
  }
}

/**
 * Sort doubles (no NaN) in place in ascending order, as Float64Array.prototype.sort does, by a
 * least-significant-digit radix sort on their bits: six stable passes of 11 bits (2048 buckets,
 * kind to the caches), a pass skipped when every value has the same digit there (the exponent
 * digits of steps that span a few decades). O(n) with one scratch array of n doubles.
 */
export function radixSort(a: Float64Array): Float64Array {
  const n = a.length;
  if (n < 2048) return a.sort();
  let src: Uint32Array = new Uint32Array(a.buffer, a.byteOffset, 2 * n);
  let dst: Uint32Array | null = null;
  toKeys(src, n, false);
  const count = new Int32Array(6 * 2048);
  for (let i = 0; i < n; i++) {
    const lo = src[2 * i + LO]!, hi = src[2 * i + HI]!;
    count[lo & 0x7ff]!++;
    count[2048 + ((lo >>> 11) & 0x7ff)]!++;
    count[4096 + ((lo >>> 22) | ((hi & 1) << 10))]!++;
    count[6144 + ((hi >>> 1) & 0x7ff)]!++;
    count[8192 + ((hi >>> 12) & 0x7ff)]!++;
    count[10240 + (hi >>> 23)]!++;
  }
  for (let pass = 0; pass < 6; pass++) {
    const base = pass * 2048;
    // one digit for every value: this pass would not change the order
    if (count[base + digit11(src[LO]!, src[HI]!, pass)] === n) continue;
    let sum = 0;
    for (let d = base; d < base + 2048; d++) { const c = count[d]!; count[d] = sum; sum += c; }
    dst ??= new Uint32Array(2 * n);
    for (let i = 0; i < n; i++) {
      const lo = src[2 * i + LO]!, hi = src[2 * i + HI]!;
      const j = count[base + digit11(lo, hi, pass)]!++;
      dst[2 * j + LO] = lo;
      dst[2 * j + HI] = hi;
    }
    const t = src; src = dst; dst = t;
  }
  toKeys(src, n, true);
  if (src.buffer !== a.buffer) a.set(new Float64Array(src.buffer, 0, n));
  return a;
}

/** Sorted copy of the finite values of `a` (NaN never occurs in our arrays; Infinity is left out). */
export function sortedFinite(a: Float64Array): Float64Array {
  let n = 0;
  for (let i = 0; i < a.length; i++) if (a[i]! < Infinity) n++;
  const out = new Float64Array(n);
  let j = 0;
  for (let i = 0; i < a.length; i++) { const v = a[i]!; if (v < Infinity) out[j++] = v; }
  return radixSort(out);
}

/** Quantile of sorted values by linear interpolation between closest ranks (q in [0, 1]). */
export function quantileSorted(s: Float64Array, q: number): number | null {
  if (s.length === 0) return null;
  const pos = q * (s.length - 1);
  const lo = Math.floor(pos);
  const hi = Math.min(lo + 1, s.length - 1);
  const t = pos - lo;
  return t === 0 ? s[lo]! : s[lo]! + t * (s[hi]! - s[lo]!);
}

/**
 * Indices of the k smallest values in ascending order (ties by index), with `keep(i)` false
 * values left out. A bounded max-heap: O(n log k), no per-value allocation.
 */
export function smallestK(values: Float64Array, k: number): Int32Array {
  const n = values.length;
  const cap = Math.min(k, n);
  const heap = new Int32Array(cap);
  let size = 0;
  // "greater" in heap order: larger value, or equal value and larger index
  const greater = (a: number, b: number): boolean => {
    const va = values[a]!, vb = values[b]!;
    return va > vb || (va === vb && a > b);
  };
  for (let i = 0; i < n && cap > 0; i++) {
    if (size < cap) {
      let c = size++;
      heap[c] = i;
      while (c > 0) {
        const p = (c - 1) >> 1;
        if (greater(heap[c]!, heap[p]!)) { const t = heap[c]!; heap[c] = heap[p]!; heap[p] = t; c = p; } else break;
      }
    } else if (greater(heap[0]!, i)) {
      heap[0] = i;
      let c = 0;
      for (;;) {
        const l = 2 * c + 1, r = l + 1;
        let m = c;
        if (l < size && greater(heap[l]!, heap[m]!)) m = l;
        if (r < size && greater(heap[r]!, heap[m]!)) m = r;
        if (m === c) break;
        const t = heap[c]!; heap[c] = heap[m]!; heap[m] = t; c = m;
      }
    }
  }
  const out = Array.from(heap.subarray(0, size));
  out.sort((a, b) => (values[a]! - values[b]!) || (a - b));
  return Int32Array.from(out);
}

/**
 * The k-th smallest of a[lo..hi] (inclusive), in place (Hoare partition around a median of
 * three; the array is permuted). O(n) on average.
 */
function selectInPlace(a: Float64Array, k: number, lo: number, hi: number): number {
  while (hi > lo) {
    const mid = (lo + hi) >>> 1;
    // median of three as the pivot
    let x = a[lo]!, y = a[mid]!, z = a[hi]!;
    if (x > y) { const t = x; x = y; y = t; }
    if (y > z) { y = z; }
    const pivot = x > y ? x : y;
    let i = lo, j = hi;
    while (i <= j) {
      while (a[i]! < pivot) i++;
      while (a[j]! > pivot) j--;
      if (i <= j) { const t = a[i]!; a[i] = a[j]!; a[j] = t; i++; j--; }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else return a[k]!;
  }
  return a[k]!;
}

const one = new Float64Array(1);
const oneWords = new Uint32Array(one.buffer);

/** The top 16 bits of v's order key (see toKeys). */
function topDigit(v: number): number {
  one[0] = v;
  const h = oneWords[HI]!;
  return (h & SIGN) !== 0 ? (~h >>> 16) & 0xffff : (h ^ SIGN) >>> 16;
}

/**
 * The k-th smallest (0-based) of the values v of `values` with above < v < below: a histogram
 * of their top 16 key bits finds the bucket that holds rank k; only that bucket's values are
 * copied and searched. O(n) without a copy of every value.
 */
function kthBetween(values: Float64Array, above: number, below: number, k: number): number {
  const count = new Int32Array(65536);
  for (let i = 0; i < values.length; i++) { const v = values[i]!; if (v > above && v < below) count[topDigit(v)]!++; }
  let before = 0, bucket = 0;
  while (before + count[bucket]! <= k) before += count[bucket++]!;
  const a = new Float64Array(count[bucket]!);
  for (let i = 0, j = 0; i < values.length; i++) { const v = values[i]!; if (v > above && v < below && topDigit(v) === bucket) a[j++] = v; }
  return selectInPlace(a, k - before, 0, a.length - 1);
}

/**
 * A quantile with the same definition as `quantileSorted` (linear interpolation between the
 * closest ranks) of the values v with above < v < below (default: the finite ones), without
 * sorting: order statistics by selection.
 */
export function quantileOf(values: Float64Array, q: number, above = -Infinity, below = Infinity): number | null {
  let n = 0;
  for (let i = 0; i < values.length; i++) { const v = values[i]!; if (v > above && v < below) n++; }
  if (n === 0) return null;
  const pos = q * (n - 1);
  const lo = Math.floor(pos);
  const vlo = kthBetween(values, above, below, lo);
  const t = pos - lo;
  if (t === 0 || lo + 1 >= n) return vlo;
  // the next order statistic: vlo again when more values equal it, else the smallest above it
  let atMost = 0, vhi = Infinity;
  for (let i = 0; i < values.length; i++) {
    const v = values[i]!;
    if (!(v > above && v < below)) continue;
    if (v <= vlo) atMost++; else if (v < vhi) vhi = v;
  }
  if (atMost > lo + 1) vhi = vlo;
  return vlo + t * (vhi - vlo);
}
