/**
 * Palettes and scales for the view. The GPU maps values through a 256-texel palette texture;
 * the legend and the PNG export use the same scales from d3-scale here.
 */
import { scaleLinear, scaleLog } from 'd3-scale';
import { interpolateCividis, interpolateMagma, interpolateViridis, schemeTableau10 } from 'd3-scale-chromatic';
import type { ScaleKind } from './fields.js';

export const PALETTES = {
  viridis: interpolateViridis,
  cividis: interpolateCividis,
  magma: interpolateMagma,
} as const;

export type PaletteName = keyof typeof PALETTES;

export const PALETTE_SIZE = 256;

/** Colours for values that are not on the scale (CSS strings and 0..1 RGB for the shader). */
export const SPECIAL = {
  noLimit: '#9fb3c8',
  undefined: '#6b6b6b',
  zero: '#ff3b30',
  greyed: '#3c4047',
  marker: '#ff2bd6',
  selected: '#ffffff',
  background: '#15171b',
} as const;

/** Bytes of a '#rrggbb' or 'rgb(r, g, b)' colour (the forms d3-scale-chromatic returns). */
export function parseColour(css: string): [number, number, number] {
  if (css.startsWith('#') && css.length === 7) {
    const n = parseInt(css.slice(1), 16);
    return [Math.floor(n / 65536) % 256, Math.floor(n / 256) % 256, n % 256];
  }
  const m = /^rgb\(\s*([\d.]+)\s*,\s*([\d.]+)\s*,\s*([\d.]+)\s*\)$/.exec(css);
  if (!m) throw new Error(`unsupported colour "${css}"`);
  return [Math.round(Number(m[1])), Math.round(Number(m[2])), Math.round(Number(m[3]))];
}

export function cssToRgb01(css: string): [number, number, number] {
  const [r, g, b] = parseColour(css);
  return [r / 255, g / 255, b / 255];
}

/** RGBA bytes of a palette, low end first. `reverse` puts the bright end at the low values. */
export function paletteBytes(name: PaletteName, reverse: boolean, size = PALETTE_SIZE): Uint8Array {
  const f = PALETTES[name];
  const out = new Uint8Array(size * 4);
  for (let i = 0; i < size; i++) {
    const t = i / (size - 1);
    out.set(parseColour(f(reverse ? 1 - t : t)), 4 * i);
    out[4 * i + 3] = 255;
  }
  return out;
}

/** Colours of the cause categories of fields.ts (none, small, shape, ..., degenerate, diffusion). */
export const CAUSE_COLOURS: readonly string[] = (() => {
  const [blue, orange, , teal, green, yellow, purple, pink, brown] = schemeTableau10 as readonly string[];
  return ['#5b6470', orange!, blue!, purple!, teal!, yellow!, green!, pink!, SPECIAL.zero, brown!];
})();

export function categoryBytes(colours: readonly string[]): Uint8Array {
  const out = new Uint8Array(colours.length * 4);
  colours.forEach((css, i) => {
    out.set(parseColour(css), 4 * i);
    out[4 * i + 3] = 255;
  });
  return out;
}

export interface Range {
  lo: number;
  hi: number;
}

/** A usable range for a scale: positive for log, non-empty for both. */
export function sanitizeRange(kind: ScaleKind, lo: number, hi: number): Range {
  if (kind === 'category') return { lo: 0, hi: 15 };
  if (!Number.isFinite(lo) || !Number.isFinite(hi)) return kind === 'log' ? { lo: 1e-3, hi: 1 } : { lo: 0, hi: 1 };
  if (kind === 'log') {
    if (!(lo > 0)) lo = hi > 0 ? hi / 1000 : 1e-3;
    if (!(hi > lo)) { const m = lo; lo = m / Math.SQRT2; hi = m * Math.SQRT2; }
    return { lo, hi };
  }
  if (!(hi > lo)) { const m = lo; const d = Math.abs(m) > 0 ? Math.abs(m) * 0.05 : 0.5; lo = m - d; hi = m + d; }
  return { lo, hi };
}

/** Position 0..1 of a value on the scale (before any palette reversal), clamped. */
export function scalePosition(kind: ScaleKind, range: Range, v: number): number {
  const t = kind === 'log'
    ? (Math.log(v) - Math.log(range.lo)) / (Math.log(range.hi) - Math.log(range.lo))
    : (v - range.lo) / (range.hi - range.lo);
  return t < 0 ? 0 : t > 1 ? 1 : t;
}

/** Tick values and labels for a legend. */
export function ticks(kind: ScaleKind, range: Range, count = 5): { value: number; label: string }[] {
  if (kind === 'category') return [];
  const s = kind === 'log' ? scaleLog().domain([range.lo, range.hi]) : scaleLinear().domain([range.lo, range.hi]);
  let vals = s.ticks(count);
  if (kind === 'log' && vals.length > count + 2) {
    // d3 lists every 1..9 multiple: keep powers of ten (thinned), or 1-2-5 over a short range
    const isPow = (v: number) => Math.abs(Math.log10(v) - Math.round(Math.log10(v))) < 1e-9;
    const pows = vals.filter(isPow);
    if (pows.length >= 3) {
      const step = Math.ceil(pows.length / (count + 1));
      vals = pows.filter((_, i) => i % step === 0);
    } else {
      vals = vals.filter((v) => { const m = Math.round(v / 10 ** Math.floor(Math.log10(v) + 1e-9)); return m === 1 || m === 2 || m === 5; });
    }
  }
  return vals.map((v) => ({ value: v, label: tickLabel(v) }));
}

export function tickLabel(v: number): string {
  if (v === 0) return '0';
  const a = Math.abs(v);
  if (a >= 1e-3 && a < 1e5) return String(Number(v.toPrecision(3)));
  const [m, e] = v.toExponential(1).split('e');
  const mant = m!.replace(/\.0$/, '');
  return `${mant === '1' ? '' : mant + '·'}1e${Number(e)}`;
}
