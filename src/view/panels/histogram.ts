/**
 * "Step spread": a histogram of log10(dt) with the global limit, the mark bound and the
 * threshold drawn on it. A click sets the threshold at the clicked step.
 */
import type { LogHistogram } from '../analysis.js';
import { tickLabel } from '../colour.js';

export interface HistogramMarks {
  limit: number | null;
  markBound: number | null;
  threshold: number | null;
  /** Colour of a bin by its position 0..1 along the binned range. */
  colourAt: (t: number) => string;
}

const PAD_L = 8, PAD_R = 8, PAD_T = 8, PAD_B = 20;

export class HistogramView {
  private hist: LogHistogram | null = null;

  constructor(private readonly canvas: HTMLCanvasElement, onPick: (dt: number) => void) {
    canvas.addEventListener('click', (e) => {
      if (!this.hist) return;
      const r = canvas.getBoundingClientRect();
      const t = (e.clientX - r.left - PAD_L) / (r.width - PAD_L - PAD_R);
      const clamped = Math.min(Math.max(t, 0), 1);
      onPick(10 ** (this.hist.lo + clamped * (this.hist.hi - this.hist.lo)));
    });
  }

  draw(hist: LogHistogram, marks: HistogramMarks): void {
    this.hist = hist;
    const c = this.canvas;
    const dpr = Math.min(window.devicePixelRatio || 1, 2);
    const w = c.clientWidth || 300;
    const h = c.clientHeight || 120;
    c.width = Math.round(w * dpr);
    c.height = Math.round(h * dpr);
    const ctx = c.getContext('2d')!;
    ctx.setTransform(dpr, 0, 0, dpr, 0, 0);
    ctx.clearRect(0, 0, w, h);
    const n = hist.counts.length;
    let max = 0;
    for (let k = 0; k < n; k++) if (hist.counts[k]! > max) max = hist.counts[k]!;
    const pw = w - PAD_L - PAD_R;
    const ph = h - PAD_T - PAD_B;
    const xOf = (dt: number) => PAD_L + ((Math.log10(dt) - hist.lo) / (hist.hi - hist.lo)) * pw;
    for (let k = 0; k < n; k++) {
      const cnt = hist.counts[k]!;
      if (cnt === 0) continue;
      // square-root heights keep a handful of tight cells visible next to millions of others
      const bh = Math.max(1, Math.sqrt(cnt / max) * ph);
      const thr = marks.threshold;
      const above = thr !== null && 10 ** (hist.lo + (k / n) * (hist.hi - hist.lo)) > thr;
      ctx.fillStyle = above ? '#4a4f57' : marks.colourAt((k + 0.5) / n);
      ctx.fillRect(PAD_L + (k / n) * pw, PAD_T + ph - bh, Math.max(1, pw / n - 1), bh);
    }
    ctx.fillStyle = '#9aa0a6';
    ctx.font = '11px system-ui, sans-serif';
    ctx.textBaseline = 'top';
    ctx.textAlign = 'left';
    ctx.fillText(`${tickLabel(10 ** hist.lo)} s`, PAD_L, h - PAD_B + 5);
    ctx.textAlign = 'right';
    ctx.fillText(`${tickLabel(10 ** hist.hi)} s`, w - PAD_R, h - PAD_B + 5);
    const vline = (dt: number | null, colour: string, dash: number[]) => {
      if (dt === null || !(dt > 0)) return;
      const x = Math.min(Math.max(xOf(dt), PAD_L), PAD_L + pw);
      ctx.strokeStyle = colour;
      ctx.setLineDash(dash);
      ctx.lineWidth = 1.5;
      ctx.beginPath();
      ctx.moveTo(x, PAD_T - 4);
      ctx.lineTo(x, PAD_T + ph);
      ctx.stroke();
      ctx.setLineDash([]);
    };
    vline(marks.markBound, '#ff2bd6', [3, 3]);
    vline(marks.limit, '#ffffff', []);
    vline(marks.threshold, '#ffb020', [6, 3]);
  }
}
