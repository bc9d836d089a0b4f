/**
 * The boundary |R(z)| = 1 of a stability region, sampled as polylines. Every boundary point solves
 * R(z) = e^{iω} for some ω, so the s roots of that polynomial are followed while ω goes once round
 * the circle; each root traces a piece of the contour.
 */
import { polynomialRoots } from './eigen.js';

/** Polylines of the boundary, each as x,y pairs interleaved. */
export function stabilityBoundary(r: Float64Array, samples = 720): Float64Array[] {
  const s = r.length - 1;
  const cRe = Float64Array.from(r);
  const cIm = new Float64Array(s + 1);
  const rootsRe: Float64Array[] = [];
  const rootsIm: Float64Array[] = [];
  let scale = 0;
  for (let k = 0; k <= samples; k++) {
    const w = (2 * Math.PI * k) / samples;
    cRe[0] = r[0]! - Math.cos(w);
    cIm[0] = -Math.sin(w);
    const roots = polynomialRoots(cRe, cIm);
    rootsRe.push(roots.re);
    rootsIm.push(roots.im);
    for (let i = 0; i < s; i++) scale = Math.max(scale, Math.hypot(roots.re[i]!, roots.im[i]!));
  }
  // A jump means the match swapped branches: start a new line rather than draw a chord.
  const jump = 0.1 * scale;
  const lines: Float64Array[] = [];
  const tracks: number[][] = Array.from({ length: s }, (_, i) => [rootsRe[0]![i]!, rootsIm[0]![i]!]);
  let prevRe = rootsRe[0]!;
  let prevIm = rootsIm[0]!;
  for (let k = 1; k <= samples; k++) {
    const order = matchNearest(prevRe, prevIm, rootsRe[k]!, rootsIm[k]!);
    const nextRe = new Float64Array(s);
    const nextIm = new Float64Array(s);
    for (let i = 0; i < s; i++) {
      const x = rootsRe[k]![order[i]!]!;
      const y = rootsIm[k]![order[i]!]!;
      nextRe[i] = x;
      nextIm[i] = y;
      if (Math.hypot(x - prevRe[i]!, y - prevIm[i]!) > jump) {
        if (tracks[i]!.length >= 4) lines.push(Float64Array.from(tracks[i]!));
        tracks[i] = [];
      }
      tracks[i]!.push(x, y);
    }
    prevRe = nextRe;
    prevIm = nextIm;
  }
  for (const t of tracks) if (t.length >= 4) lines.push(Float64Array.from(t));
  return lines;
}

/** order[i] = index of the new root assigned to old root i, nearest first (greedy). */
function matchNearest(oldRe: Float64Array, oldIm: Float64Array, newRe: Float64Array, newIm: Float64Array): Int32Array {
  const s = oldRe.length;
  const order = new Int32Array(s).fill(-1);
  const used = new Uint8Array(s);
  for (let step = 0; step < s; step++) {
    let bi = -1;
    let bj = -1;
    let bd = Infinity;
    for (let i = 0; i < s; i++) {
      if (order[i] !== -1) continue;
      for (let j = 0; j < s; j++) {
        if (used[j]) continue;
        const d = (oldRe[i]! - newRe[j]!) ** 2 + (oldIm[i]! - newIm[j]!) ** 2;
        if (d < bd) { bd = d; bi = i; bj = j; }
      }
    }
    order[bi] = bj;
    used[bj] = 1;
  }
  return order;
}
