/** The per-cell quantities the view can colour by, and how each is scaled. */
import { CAUSE_DEGENERATE, CAUSE_DIFFUSION, CAUSE_FAST, CAUSE_SHAPE, CAUSE_SMALL } from '../audit/audit.js';

export type FieldId = 'dt' | 'courant' | 'h' | 'speed' | 'radiusRatio' | 'minAngle' | 'cause';

export type ScaleKind = 'log' | 'linear' | 'category';

export interface FieldDef {
  id: FieldId;
  label: string;
  unit: string;
  scale: ScaleKind;
  /** Which end of the range matters: it gets the bright end of the palette. */
  emphasis: 'low' | 'high';
}

export const FIELDS: readonly FieldDef[] = [
  { id: 'dt', label: 'Allowed step Δt', unit: 's', scale: 'log', emphasis: 'low' },
  { id: 'courant', label: 'Courant number at the intended step', unit: '', scale: 'linear', emphasis: 'high' },
  { id: 'h', label: 'Inscribed length h = 2A/P', unit: 'm', scale: 'log', emphasis: 'low' },
  { id: 'speed', label: 'Wave speed λ', unit: 'm/s', scale: 'log', emphasis: 'high' },
  { id: 'radiusRatio', label: 'Radius ratio', unit: '', scale: 'linear', emphasis: 'low' },
  { id: 'minAngle', label: 'Minimum angle', unit: '°', scale: 'linear', emphasis: 'low' },
  { id: 'cause', label: 'Cause of a small step', unit: '', scale: 'category', emphasis: 'high' },
];

export function fieldDef(id: FieldId): FieldDef {
  for (const f of FIELDS) if (f.id === id) return f;
  return FIELDS[0]!;
}

export function isFieldId(s: string): s is FieldId {
  return FIELDS.some((f) => f.id === s);
}

/** Sentinels in the float32 value texture. Regular values of every field are >= 0. */
export const NO_LIMIT = -1;
export const UNDEFINED_VALUE = -2;

/**
 * Copy float64 values into float32 with sentinels and find the regular range
 * (positive values only when `positiveRange`, as a log scale needs).
 */
export function encodeField(src: ArrayLike<number>, positiveRange: boolean, out = new Float32Array(src.length)): { values: Float32Array; min: number; max: number } {
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < src.length; i++) {
    const v = src[i]!;
    if (v === Infinity) { out[i] = NO_LIMIT; continue; }
    if (!(v >= 0)) { out[i] = UNDEFINED_VALUE; continue; }
    out[i] = v < 3e38 ? v : 3e38;
    if (positiveRange && v <= 0) continue;
    if (v < min) min = v;
    if (v > max) max = v;
  }
  if (min > max) { min = NaN; max = NaN; }
  return { values: out, min, max };
}

/** Labels of the cause categories, in category order (see causeCategory). */
export const CAUSE_CATEGORIES = ['none', 'small', 'shape', 'small + shape', 'fast', 'small + fast', 'shape + fast', 'all three', 'degenerate', 'diffusion'];

/**
 * One colour category per cell from its cause bits: degenerate first, then diffusion, then the
 * combination of small / shape / fast (0–7). The read-out gives the full set.
 */
export function causeCategory(bits: number): number {
  if (bits & CAUSE_DEGENERATE) return 8;
  if (bits & CAUSE_DIFFUSION) return 9;
  return (bits & CAUSE_SMALL ? 1 : 0) + (bits & CAUSE_SHAPE ? 2 : 0) + (bits & CAUSE_FAST ? 4 : 0);
}

/** Cause categories of every cell, as float64 for encodeField. */
export function causeCategories(cause: Uint8Array): Float64Array {
  const out = new Float64Array(cause.length);
  for (let i = 0; i < cause.length; i++) out[i] = causeCategory(cause[i]!);
  return out;
}
