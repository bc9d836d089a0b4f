/** Small statistics helpers over typed arrays (no per-value objects). */

/** Sorted copy of the finite values of `a` (NaN never occurs in our arrays; Infinity is left out). */
export function sortedFinite(a: Float64Array): Float64Array {
  let n = 0;
  for (let i = 0; i < a.length; i++) if (a[i]! < Infinity) n++;
  const out = new Float64Array(n);
  let j = 0;
  for (let i = 0; i < a.length; i++) { const v = a[i]!; if (v < Infinity) out[j++] = v; }
  return out.sort();
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

/**
 * A quantile with the same definition as `quantileSorted` (linear interpolation between the
 * closest ranks) without sorting: two selections on a copy of the values that pass `keep`.
 */
export function quantileOf(values: Float64Array, q: number, keep: (v: number) => boolean): number | null {
  let n = 0;
  for (let i = 0; i < values.length; i++) if (keep(values[i]!)) n++;
  if (n === 0) return null;
  const a = new Float64Array(n);
  for (let i = 0, j = 0; i < values.length; i++) { const v = values[i]!; if (keep(v)) a[j++] = v; }
  const pos = q * (n - 1);
  const lo = Math.floor(pos);
  const vlo = selectInPlace(a, lo, 0, n - 1);
  const t = pos - lo;
  if (t === 0 || lo + 1 >= n) return vlo;
  // the next order statistic is the smallest value to the right of rank lo after selection
  let vhi = Infinity;
  for (let i = lo + 1; i < n; i++) if (a[i]! < vhi) vhi = a[i]!;
  return vlo + t * (vhi - vlo);
}
