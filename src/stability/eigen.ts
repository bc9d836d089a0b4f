/**
 * Eigenvalues of a small dense complex matrix: Householder reduction to upper Hessenberg form,
 * then the single-shift QR iteration with Wilkinson shifts and deflation (Givens rotations).
 * Matrices are row-major, real and imaginary parts in separate arrays of length n·n.
 * Meant for the handful of sizes the stability analysis needs (n ≤ a few dozen).
 */

export interface ComplexValues {
  re: Float64Array;
  im: Float64Array;
}

const EPS = 2.220446049250313e-16;
const MAX_SWEEPS_PER_VALUE = 60;

/** Eigenvalues of the n×n complex matrix (re, im). The inputs are not modified. */
export function eigenvalues(n: number, re: ArrayLike<number>, im: ArrayLike<number>): ComplexValues {
  if (!Number.isInteger(n) || n < 0) throw new RangeError(`matrix size must be a non-negative integer, got ${n}`);
  if (re.length < n * n || im.length < n * n) throw new RangeError(`matrix arrays are shorter than ${n}×${n}`);
  const hr = Float64Array.from({ length: n * n }, (_, i) => re[i]!);
  const hi = Float64Array.from({ length: n * n }, (_, i) => im[i]!);
  let big = 0;
  for (let i = 0; i < n * n; i++) {
    if (!Number.isFinite(hr[i]!) || !Number.isFinite(hi[i]!)) throw new RangeError('matrix has a non-finite entry');
    big = Math.max(big, Math.abs(hr[i]!), Math.abs(hi[i]!));
  }
  const out = { re: new Float64Array(n), im: new Float64Array(n) };
  if (big === 0) return out;
  // Work on A/max|a_ij| so that products in the iteration neither underflow nor overflow.
  for (let i = 0; i < n * n; i++) {
    hr[i] = hr[i]! / big;
    hi[i] = hi[i]! / big;
  }
  toHessenberg(n, hr, hi);
  hessenbergQr(n, hr, hi, out);
  for (let i = 0; i < n; i++) {
    out.re[i] = out.re[i]! * big;
    out.im[i] = out.im[i]! * big;
  }
  return out;
}

/** In-place similarity reduction to upper Hessenberg form with complex Householder reflections. */
function toHessenberg(n: number, ar: Float64Array, ai: Float64Array): void {
  const vr = new Float64Array(n);
  const vi = new Float64Array(n);
  for (let k = 0; k < n - 2; k++) {
    // v is built from the column scaled to O(1): squares of tiny or huge entries would under/overflow.
    let colMax = 0;
    for (let i = k + 1; i < n; i++) colMax = Math.max(colMax, Math.abs(ar[i * n + k]!), Math.abs(ai[i * n + k]!));
    if (colMax === 0) continue;
    let norm2 = 0;
    for (let i = k + 1; i < n; i++) {
      vr[i] = ar[i * n + k]! / colMax;
      vi[i] = ai[i * n + k]! / colMax;
      norm2 += vr[i]! ** 2 + vi[i]! ** 2;
    }
    const norm = Math.sqrt(norm2);
    const x0r = vr[k + 1]!;
    const x0i = vi[k + 1]!;
    const x0abs = Math.hypot(x0r, x0i);
    // alpha = -e^{i arg x0} ||x||, v = x - alpha e1: no cancellation in v[0].
    let pr = x0abs === 0 ? 1 : x0r / x0abs;
    let pi = x0abs === 0 ? 0 : x0i / x0abs;
    const pabs = Math.hypot(pr, pi); // |p| = 1 again when x0 was subnormal
    pr /= pabs;
    pi /= pabs;
    vr[k + 1] = x0r + pr * norm;
    vi[k + 1] = x0i + pi * norm;
    let vnorm2 = 0;
    for (let i = k + 1; i < n; i++) vnorm2 += vr[i]! ** 2 + vi[i]! ** 2;
    if (vnorm2 === 0) continue;
    const beta = 2 / vnorm2;
    // Left: A[k+1:, :] -= beta v (v^H A[k+1:, :])
    for (let j = 0; j < n; j++) {
      let sr = 0;
      let si = 0;
      for (let i = k + 1; i < n; i++) {
        const a = ar[i * n + j]!;
        const b = ai[i * n + j]!;
        sr += vr[i]! * a + vi[i]! * b;
        si += vr[i]! * b - vi[i]! * a;
      }
      sr *= beta;
      si *= beta;
      for (let i = k + 1; i < n; i++) {
        ar[i * n + j] = ar[i * n + j]! - (vr[i]! * sr - vi[i]! * si);
        ai[i * n + j] = ai[i * n + j]! - (vr[i]! * si + vi[i]! * sr);
      }
    }
    // Right: A[:, k+1:] -= beta (A[:, k+1:] v) v^H
    for (let i = 0; i < n; i++) {
      let sr = 0;
      let si = 0;
      for (let j = k + 1; j < n; j++) {
        const a = ar[i * n + j]!;
        const b = ai[i * n + j]!;
        sr += a * vr[j]! - b * vi[j]!;
        si += a * vi[j]! + b * vr[j]!;
      }
      sr *= beta;
      si *= beta;
      for (let j = k + 1; j < n; j++) {
        ar[i * n + j] = ar[i * n + j]! - (sr * vr[j]! + si * vi[j]!);
        ai[i * n + j] = ai[i * n + j]! - (si * vr[j]! - sr * vi[j]!);
      }
    }
    for (let i = k + 2; i < n; i++) {
      ar[i * n + k] = 0;
      ai[i * n + k] = 0;
    }
  }
}

/** Shifted QR on an upper Hessenberg matrix; only the active diagonal block is updated. */
function hessenbergQr(n: number, hr: Float64Array, hi: Float64Array, out: ComplexValues): void {
  const cr = new Float64Array(n);
  const ci = new Float64Array(n);
  const sr = new Float64Array(n);
  const si = new Float64Array(n);
  // Sub-diagonal entries below EPS·‖H‖ are negligible for every eigenvalue (backward error of
  // the whole method); without this floor, badly scaled blocks can stall the iteration.
  let frob = 0;
  for (let q = 0; q < n * n; q++) frob = Math.hypot(frob, hr[q]!, hi[q]!);
  const floor = EPS * frob;
  let last = n - 1;
  let sweeps = 0;
  let sweepsHere = 0;
  while (last >= 0) {
    if (last === 0) {
      out.re[0] = hr[0]!;
      out.im[0] = hi[0]!;
      break;
    }
    let lo = last;
    while (lo > 0) {
      const sub = Math.abs(hr[lo * n + lo - 1]!) + Math.abs(hi[lo * n + lo - 1]!);
      let scale = Math.abs(hr[lo * n + lo]!) + Math.abs(hi[lo * n + lo]!) + Math.abs(hr[(lo - 1) * n + lo - 1]!) + Math.abs(hi[(lo - 1) * n + lo - 1]!);
      if (scale === 0) scale = 1;
      if (sub <= EPS * scale || sub <= floor) {
        hr[lo * n + lo - 1] = 0;
        hi[lo * n + lo - 1] = 0;
        break;
      }
      lo--;
    }
    if (lo === last) {
      out.re[last] = hr[last * n + last]!;
      out.im[last] = hi[last * n + last]!;
      last--;
      sweepsHere = 0;
      continue;
    }
    if (++sweeps > MAX_SWEEPS_PER_VALUE * n) throw new Error('eigenvalue iteration did not converge');
    sweepsHere++;
    let mur: number;
    let mui: number;
    if (sweepsHere % 11 === 10) {
      // Exceptional shift to break a cycle.
      mur = hr[last * n + last]! + 0.75 * Math.abs(hr[last * n + last - 1]!);
      mui = hi[last * n + last]! + 0.75 * Math.abs(hi[last * n + last - 1]!);
    } else {
      [mur, mui] = wilkinsonShift(n, hr, hi, last);
    }
    for (let k = lo; k <= last; k++) {
      hr[k * n + k] = hr[k * n + k]! - mur;
      hi[k * n + k] = hi[k * n + k]! - mui;
    }
    // H - mu I = Q R: rotations on rows.
    for (let k = lo; k < last; k++) {
      const xr = hr[k * n + k]!;
      const xi = hi[k * n + k]!;
      const yr = hr[(k + 1) * n + k]!;
      const yi = hi[(k + 1) * n + k]!;
      const r = Math.hypot(xr, xi, yr, yi);
      if (r === 0) {
        cr[k] = 1; ci[k] = 0; sr[k] = 0; si[k] = 0;
        continue;
      }
      cr[k] = xr / r; ci[k] = xi / r; sr[k] = yr / r; si[k] = yi / r;
      for (let j = k; j <= last; j++) {
        const ar = hr[k * n + j]!, ai = hi[k * n + j]!;
        const br = hr[(k + 1) * n + j]!, bi = hi[(k + 1) * n + j]!;
        // row k   <- conj(c) a + conj(s) b ; row k+1 <- -s a + c b
        hr[k * n + j] = cr[k]! * ar + ci[k]! * ai + sr[k]! * br + si[k]! * bi;
        hi[k * n + j] = cr[k]! * ai - ci[k]! * ar + sr[k]! * bi - si[k]! * br;
        hr[(k + 1) * n + j] = -(sr[k]! * ar - si[k]! * ai) + (cr[k]! * br - ci[k]! * bi);
        hi[(k + 1) * n + j] = -(sr[k]! * ai + si[k]! * ar) + (cr[k]! * bi + ci[k]! * br);
      }
    }
    // R Q: the adjoint rotations on columns, then undo the shift.
    for (let k = lo; k < last; k++) {
      const rowEnd = Math.min(k + 2, last);
      for (let i = lo; i <= rowEnd; i++) {
        const ar = hr[i * n + k]!, ai = hi[i * n + k]!;
        const br = hr[i * n + k + 1]!, bi = hi[i * n + k + 1]!;
        // col k <- a c + b s ; col k+1 <- -a conj(s) + b conj(c)
        hr[i * n + k] = ar * cr[k]! - ai * ci[k]! + br * sr[k]! - bi * si[k]!;
        hi[i * n + k] = ar * ci[k]! + ai * cr[k]! + br * si[k]! + bi * sr[k]!;
        hr[i * n + k + 1] = -(ar * sr[k]! + ai * si[k]!) + (br * cr[k]! + bi * ci[k]!);
        hi[i * n + k + 1] = -(ai * sr[k]! - ar * si[k]!) + (bi * cr[k]! - br * ci[k]!);
      }
    }
    for (let k = lo; k <= last; k++) {
      hr[k * n + k] = hr[k * n + k]! + mur;
      hi[k * n + k] = hi[k * n + k]! + mui;
    }
  }
}

/** The eigenvalue of the trailing 2×2 block closer to its last diagonal entry. */
function wilkinsonShift(n: number, hr: Float64Array, hi: Float64Array, last: number): [number, number] {
  const p = last - 1;
  const ar = hr[p * n + p]!, ai = hi[p * n + p]!;
  const br = hr[p * n + last]!, bi = hi[p * n + last]!;
  const cr = hr[last * n + p]!, ci = hi[last * n + p]!;
  const dr = hr[last * n + last]!, di = hi[last * n + last]!;
  // eigenvalues of [[a b][c d]]: m ± sqrt(h² + bc), m = (a+d)/2, h = (a-d)/2
  const mr = 0.5 * (ar + dr), mi = 0.5 * (ai + di);
  const hr2 = 0.5 * (ar - dr), hi2 = 0.5 * (ai - di);
  const qr = hr2 * hr2 - hi2 * hi2 + (br * cr - bi * ci);
  const qi = 2 * hr2 * hi2 + (br * ci + bi * cr);
  const [sqr, sqi] = complexSqrt(qr, qi);
  const e1r = mr + sqr, e1i = mi + sqi;
  const e2r = mr - sqr, e2i = mi - sqi;
  const d1 = Math.hypot(e1r - dr, e1i - di);
  const d2 = Math.hypot(e2r - dr, e2i - di);
  return d1 <= d2 ? [e1r, e1i] : [e2r, e2i];
}

export function complexSqrt(re: number, im: number): [number, number] {
  let m = Math.hypot(re, im);
  if (m === 0) return [0, 0];
  // Rescale by an even power of two so that halving m cannot underflow (or overflow).
  let back = 1;
  if (m < 1e-280) {
    re *= 2 ** 600; im *= 2 ** 600; m *= 2 ** 600; back = 2 ** -300;
  } else if (m > 1e280) {
    re *= 2 ** -600; im *= 2 ** -600; m *= 2 ** -600; back = 2 ** 300;
  }
  const r = Math.sqrt(0.5 * (m + Math.abs(re)));
  if (re >= 0) return [r * back, (im / (2 * r)) * back];
  return [(Math.abs(im) / (2 * r)) * back, (im >= 0 ? r : -r) * back];
}

/**
 * Roots of the polynomial Σ c[k] z^k with complex coefficients (cRe, cIm), as eigenvalues of its
 * companion matrix. Leading zero coefficients are dropped.
 */
export function polynomialRoots(cRe: ArrayLike<number>, cIm: ArrayLike<number>): ComplexValues {
  let deg = cRe.length - 1;
  while (deg > 0 && cRe[deg] === 0 && cIm[deg] === 0) deg--;
  if (deg <= 0) return { re: new Float64Array(0), im: new Float64Array(0) };
  const lr = cRe[deg]!;
  const li = cIm[deg]!;
  const l2 = lr * lr + li * li;
  const mr = new Float64Array(deg * deg);
  const mi = new Float64Array(deg * deg);
  for (let i = 1; i < deg; i++) mr[i * deg + i - 1] = 1;
  for (let k = 0; k < deg; k++) {
    // first row: -c[deg-1-k] / c[deg]
    const ar = cRe[deg - 1 - k]!, ai = cIm[deg - 1 - k]!;
    mr[k] = -(ar * lr + ai * li) / l2;
    mi[k] = -(ai * lr - ar * li) / l2;
  }
  return eigenvalues(deg, mr, mi);
}
