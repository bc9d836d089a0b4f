/**
 * The 2-D view: a centre and a scale (model units per CSS pixel) over a canvas of a given size.
 * Model coordinates here are the centred ones (file coordinates minus the mesh centre).
 * Screen y grows downwards; model y upwards. One scale for both axes: true aspect ratio.
 */
export class Viewport {
  cx = 0;
  cy = 0;
  /** Model units per CSS pixel. */
  scale = 1;
  width = 1;
  height = 1;
  /** Bounds of the content, for fitting and for limiting the zoom. */
  private extent = 1;

  setSize(width: number, height: number): void {
    this.width = Math.max(1, width);
    this.height = Math.max(1, height);
  }

  /** Show the box [minX, maxX] × [minY, maxY] whole, with a margin (fraction of the canvas). */
  fit(minX: number, minY: number, maxX: number, maxY: number, margin = 0.04): void {
    const w = Math.max(maxX - minX, 0);
    const h = Math.max(maxY - minY, 0);
    this.extent = Math.max(w, h, 1e-300);
    this.cx = (minX + maxX) / 2;
    this.cy = (minY + maxY) / 2;
    const usable = 1 - 2 * margin;
    const s = Math.max(w / (this.width * usable), h / (this.height * usable));
    this.scale = s > 0 ? s : 1;
  }

  /** Centre on (x, y) and show about `size` model units across the smaller canvas side. */
  focus(x: number, y: number, size: number): void {
    this.cx = x;
    this.cy = y;
    this.scale = this.clampScale(size / Math.min(this.width, this.height));
  }

  toModel(px: number, py: number): [number, number] {
    return [this.cx + (px - this.width / 2) * this.scale, this.cy - (py - this.height / 2) * this.scale];
  }

  toScreen(x: number, y: number): [number, number] {
    return [(x - this.cx) / this.scale + this.width / 2, this.height / 2 - (y - this.cy) / this.scale];
  }

  pan(dxPx: number, dyPx: number): void {
    this.cx -= dxPx * this.scale;
    this.cy += dyPx * this.scale;
  }

  /** Zoom by `factor` (> 1 zooms in) keeping the model point under (px, py) in place. */
  zoomAt(px: number, py: number, factor: number): void {
    const [x, y] = this.toModel(px, py);
    this.scale = this.clampScale(this.scale / factor);
    const [x2, y2] = this.toModel(px, py);
    this.cx += x - x2;
    this.cy += y - y2;
  }

  private clampScale(s: number): number {
    const min = (this.extent * 1e-7) / Math.max(this.width, this.height);
    const max = (this.extent * 20) / Math.min(this.width, this.height);
    return Math.min(Math.max(s, min), max);
  }

  /** The visible box in model units. */
  bounds(): { left: number; right: number; top: number; bottom: number } {
    const hw = (this.width / 2) * this.scale;
    const hh = (this.height / 2) * this.scale;
    return { left: this.cx - hw, right: this.cx + hw, top: this.cy + hh, bottom: this.cy - hh };
  }
}
