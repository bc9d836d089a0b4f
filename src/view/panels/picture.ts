/** The PNG export: the view as drawn, its legend in the lower left and a title line. */
import { legendHeight, paintLegend, type LegendSpec } from './legend.js';

export function viewPicture(view: HTMLCanvasElement, legend: LegendSpec, title: string): Promise<Blob | null> {
  const out = document.createElement('canvas');
  out.width = view.width;
  out.height = view.height;
  const ctx = out.getContext('2d')!;
  ctx.drawImage(view, 0, 0);
  const dpr = view.width / Math.max(1, view.clientWidth);
  ctx.setTransform(dpr, 0, 0, dpr, 0, 0);
  paintLegend(ctx, legend, 12, view.clientHeight - legendHeight(legend) - 12);
  ctx.font = '13px system-ui, sans-serif';
  ctx.fillStyle = 'rgba(21,23,27,0.86)';
  ctx.fillRect(12, 12, ctx.measureText(title).width + 16, 24);
  ctx.fillStyle = '#e8eaed';
  ctx.textBaseline = 'middle';
  ctx.fillText(title, 20, 24);
  return new Promise((resolve) => out.toBlob(resolve, 'image/png'));
}
