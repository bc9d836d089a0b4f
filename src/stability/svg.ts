/**
 * A plain SVG picture of a pairing: the boundary |R(z)| = 1 of the integrator's stability region
 * and the operator's spectrum scaled by the Courant number, z = σ·λ(θ).
 */
import { analyseScheme, resolveTime } from './courant.js';
import { spaceOperator } from './operators.js';
import { stabilityPolynomial } from './polynomial.js';
import { stabilityBoundary } from './region.js';
import type { Tableau } from './tableau.js';

export interface SvgOptions {
  /** Courant number to scale the spectrum by; default the pairing's limit (1 when that is 0). */
  sigma?: number;
  width?: number;
  height?: number;
  /** Name shown for the integrator (e.g. the tableau file). */
  timeLabel?: string;
}

const SPECTRUM_SAMPLES = 256;
const MARGIN = { left: 64, right: 20, top: 46, bottom: 56 };

export function stabilitySvg(time: string | Tableau, space: string, options: SvgOptions = {}): string {
  const result = analyseScheme(time, space);
  const { tableau } = resolveTime(time);
  const op = spaceOperator(space);
  const r = stabilityPolynomial(tableau);
  const sigma = options.sigma ?? (result.courant > 0 ? result.courant : 1);
  const width = options.width ?? 640;
  const height = options.height ?? 520;

  const lines = stabilityBoundary(r);
  const n = SPECTRUM_SAMPLES;
  const sre = new Float64Array((n + 1) * op.size);
  const sim = new Float64Array((n + 1) * op.size);
  for (let i = 0; i <= n; i++) op.spectrum(-Math.PI + (2 * Math.PI * i) / n, sre, sim, i * op.size);
  for (let q = 0; q < sre.length; q++) {
    sre[q] = sre[q]! * sigma;
    sim[q] = sim[q]! * sigma;
  }

  let x0 = -0.5, x1 = 0.5, y0 = -0.5, y1 = 0.5;
  const grow = (x: number, y: number) => {
    if (!Number.isFinite(x) || !Number.isFinite(y)) return;
    x0 = Math.min(x0, x); x1 = Math.max(x1, x);
    y0 = Math.min(y0, y); y1 = Math.max(y1, y);
  };
  for (const l of lines) for (let k = 0; k < l.length; k += 2) grow(l[k]!, l[k + 1]!);
  for (let q = 0; q < sre.length; q++) grow(sre[q]!, sim[q]!);
  const padX = 0.06 * (x1 - x0);
  const padY = 0.06 * (y1 - y0);
  x0 -= padX; x1 += padX; y0 -= padY; y1 += padY;

  const plotW = width - MARGIN.left - MARGIN.right;
  const plotH = height - MARGIN.top - MARGIN.bottom;
  const scale = Math.min(plotW / (x1 - x0), plotH / (y1 - y0));
  const cx = MARGIN.left + plotW / 2 - scale * (x0 + x1) / 2;
  const cy = MARGIN.top + plotH / 2 + scale * (y0 + y1) / 2;
  const px = (x: number) => cx + scale * x;
  const py = (y: number) => cy - scale * y;
  const left = px(x0), right = px(x1), top = py(y1), bottom = py(y0);

  const out: string[] = [];
  out.push(`<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}" font-family="sans-serif" font-size="11">`);
  out.push(`<rect x="0" y="0" width="${width}" height="${height}" fill="#ffffff"/>`);
  const timeName = options.timeLabel ?? result.time;
  const verdict = result.status === 'stable' ? `largest stable Courant number ${fmt(result.courant)}` : `${result.status}: no positive Courant number is stable`;
  out.push(`<text x="${MARGIN.left}" y="20" font-size="14">${esc(timeName)} in time, ${esc(result.space)} in space: ${esc(verdict)}</text>`);
  const note = options.sigma === undefined && result.courant === 0 ? ' (for illustration)' : '';
  out.push(`<text x="${MARGIN.left}" y="36" fill="#555555">line: |R(z)| = 1; dots: z = σ·λ(θ) with σ = ${fmt(sigma)}${note}</text>`);

  const xt = ticks(x0, x1);
  const yt = ticks(y0, y1);
  for (const t of xt) {
    out.push(`<line x1="${f(px(t))}" y1="${f(top)}" x2="${f(px(t))}" y2="${f(bottom)}" stroke="#eeeeee"/>`);
    out.push(`<text x="${f(px(t))}" y="${f(bottom + 15)}" text-anchor="middle">${fmtTick(t)}</text>`);
  }
  for (const t of yt) {
    out.push(`<line x1="${f(left)}" y1="${f(py(t))}" x2="${f(right)}" y2="${f(py(t))}" stroke="#eeeeee"/>`);
    out.push(`<text x="${f(left - 6)}" y="${f(py(t) + 4)}" text-anchor="end">${fmtTick(t)}</text>`);
  }
  out.push(`<rect x="${f(left)}" y="${f(top)}" width="${f(right - left)}" height="${f(bottom - top)}" fill="none" stroke="#999999"/>`);
  out.push(`<line x1="${f(left)}" y1="${f(py(0))}" x2="${f(right)}" y2="${f(py(0))}" stroke="#777777"/>`);
  out.push(`<line x1="${f(px(0))}" y1="${f(top)}" x2="${f(px(0))}" y2="${f(bottom)}" stroke="#777777"/>`);
  out.push(`<text x="${f((left + right) / 2)}" y="${f(bottom + 34)}" text-anchor="middle">Re z</text>`);
  out.push(`<text x="${f(left - 44)}" y="${f((top + bottom) / 2)}" text-anchor="middle" transform="rotate(-90 ${f(left - 44)} ${f((top + bottom) / 2)})">Im z</text>`);

  for (const l of lines) {
    const pts: string[] = [];
    for (let k = 0; k < l.length; k += 2) pts.push(`${f(px(l[k]!))},${f(py(l[k + 1]!))}`);
    out.push(`<polyline points="${pts.join(' ')}" fill="none" stroke="#1d4e89" stroke-width="1.6"/>`);
  }
  const dots: string[] = [];
  for (let q = 0; q < sre.length; q++) {
    if (Number.isFinite(sre[q]!) && Number.isFinite(sim[q]!)) dots.push(`<circle cx="${f(px(sre[q]!))}" cy="${f(py(sim[q]!))}" r="1.4"/>`);
  }
  out.push(`<g fill="#c2410c">${dots.join('')}</g>`);
  out.push('</svg>');
  return out.join('\n') + '\n';
}

function ticks(a: number, b: number): number[] {
  const raw = (b - a) / 6;
  const p = 10 ** Math.floor(Math.log10(raw));
  const m = raw / p;
  const step = (m < 1.5 ? 1 : m < 3.5 ? 2 : m < 7.5 ? 5 : 10) * p;
  const out: number[] = [];
  for (let t = Math.ceil(a / step) * step; t <= b + 1e-9 * step; t += step) out.push(Math.abs(t) < 1e-9 * step ? 0 : t);
  return out;
}

const f = (v: number): string => v.toFixed(1);
const fmt = (v: number): string => Number(v.toPrecision(4)).toString();
const fmtTick = (v: number): string => Number(v.toPrecision(6)).toString();

function esc(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}
