/**
 * The legend, drawn on a 2-D canvas so the PNG export can paint the same picture under the view.
 */
import { CAUSE_COLOURS, scalePosition, ticks, type Range } from '../colour.js';
import { CAUSE_CATEGORIES as CAUSE_LABELS, type ScaleKind } from '../fields.js';

export interface LegendSpec {
  title: string;
  unit: string;
  kind: ScaleKind;
  range: Range;
  /** RGBA palette bytes, the low end of the range first. */
  palette: Uint8Array;
  /** Extra swatches (no limit, greyed out, marked ...). */
  swatches: { label: string; colour: string; ring?: boolean }[];
}


export const LEGEND_WIDTH = 360;

/** Cause swatches go three to a row, the others two (their labels are longer). */
function rowsFor(spec: LegendSpec): number {
  const swatchRows = Math.ceil(spec.swatches.length / 2);
  return spec.kind === 'category' ? Math.ceil(CAUSE_LABELS.length / 3) + swatchRows : swatchRows;
}

export function legendHeight(spec: LegendSpec): number {
  return (spec.kind === 'category' ? 26 : 62) + rowsFor(spec) * 18 + 6;
}

/** A square of colour; `ring`: the mark of near-limit cells instead (stripes in a ring). */
function swatch(ctx: CanvasRenderingContext2D, x: number, y: number, colour: string, ring: boolean): void {
  if (ring) {
    ctx.save();
    ctx.beginPath();
    ctx.arc(x + 6, y + 6, 6, 0, 2 * Math.PI);
    ctx.clip();
    ctx.strokeStyle = colour;
    ctx.lineWidth = 1.5;
    for (let k = -12; k <= 12; k += 4) {
      ctx.beginPath();
      ctx.moveTo(x + k, y + 12);
      ctx.lineTo(x + k + 12, y);
      ctx.stroke();
    }
    ctx.restore();
    ctx.beginPath();
    ctx.arc(x + 6, y + 6, 5.5, 0, 2 * Math.PI);
    ctx.lineWidth = 2;
    ctx.strokeStyle = colour;
    ctx.stroke();
    return;
  }
  ctx.fillStyle = colour;
  ctx.fillRect(x, y, 12, 12);
  ctx.strokeStyle = 'rgba(255,255,255,0.35)';
  ctx.lineWidth = 1;
  ctx.strokeRect(x + 0.5, y + 0.5, 11, 11);
}

/** Paint the legend at (x0, y0) in CSS pixels on `ctx` (already scaled for the pixel ratio). */
export function paintLegend(ctx: CanvasRenderingContext2D, spec: LegendSpec, x0: number, y0: number): void {
  const w = LEGEND_WIDTH;
  const h = legendHeight(spec);
  ctx.save();
  ctx.translate(x0, y0);
  ctx.fillStyle = 'rgba(21,23,27,0.86)';
  ctx.fillRect(0, 0, w, h);
  ctx.font = '12px system-ui, sans-serif';
  ctx.textBaseline = 'top';
  ctx.fillStyle = '#e8eaed';
  ctx.fillText(spec.unit ? `${spec.title} [${spec.unit}]` : spec.title, 10, 7);
  let y = 26;
  if (spec.kind !== 'category') {
    const barX = 14, barW = w - 28, barY = y, barH = 14;
    const img = ctx.createImageData(256, 1);
    img.data.set(spec.palette.subarray(0, 1024));
    const tmp = document.createElement('canvas');
    tmp.width = 256;
    tmp.height = 1;
    tmp.getContext('2d')!.putImageData(img, 0, 0);
    ctx.imageSmoothingEnabled = true;
    ctx.drawImage(tmp, barX, barY, barW, barH);
    ctx.strokeStyle = 'rgba(255,255,255,0.4)';
    ctx.strokeRect(barX + 0.5, barY + 0.5, barW - 1, barH - 1);
    ctx.fillStyle = '#c9ccd1';
    ctx.textAlign = 'center';
    for (const t of ticks(spec.kind, spec.range)) {
      const x = barX + scalePosition(spec.kind, spec.range, t.value) * barW;
      ctx.fillRect(Math.round(x), barY + barH, 1, 4);
      ctx.fillText(t.label, Math.min(Math.max(x, barX + 12), barX + barW - 12), barY + barH + 6);
    }
    ctx.textAlign = 'left';
    y = 62;
  }
  const grid = (items: { label: string; colour: string; ring?: boolean }[], perRow: number, top: number): number => {
    const colW = (w - 20) / perRow;
    items.forEach((it, i) => {
      const x = 10 + (i % perRow) * colW;
      const yy = top + Math.floor(i / perRow) * 18;
      swatch(ctx, x, yy, it.colour, it.ring ?? false);
      ctx.fillStyle = '#c9ccd1';
      ctx.fillText(it.label, x + 17, yy);
    });
    return top + Math.ceil(items.length / perRow) * 18;
  };
  if (spec.kind === 'category') y = grid(CAUSE_LABELS.map((label, i) => ({ label, colour: CAUSE_COLOURS[i]! })), 3, y);
  grid(spec.swatches, 2, y);
  ctx.restore();
}

/** Size the legend canvas for the spec and paint it. */
export function drawLegend(canvas: HTMLCanvasElement, spec: LegendSpec): void {
  const dpr = Math.min(window.devicePixelRatio || 1, 2);
  const h = legendHeight(spec);
  canvas.width = Math.round(LEGEND_WIDTH * dpr);
  canvas.height = Math.round(h * dpr);
  canvas.style.width = `${LEGEND_WIDTH}px`;
  canvas.style.height = `${h}px`;
  const ctx = canvas.getContext('2d')!;
  ctx.setTransform(dpr, 0, 0, dpr, 0, 0);
  ctx.clearRect(0, 0, LEGEND_WIDTH, h);
  paintLegend(ctx, spec, 0, 0);
}
