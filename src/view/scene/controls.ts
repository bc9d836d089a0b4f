/**
 * Pan and zoom with mouse, wheel and touch (pointer events): drag pans, wheel zooms at the
 * pointer, two fingers pinch. A press that barely moves is a click; a move with no button is hover.
 */
import type { Viewport } from './viewport.js';

export interface ControlEvents {
  changed(): void;
  hover(px: number, py: number): void;
  leave(): void;
  click(px: number, py: number): void;
}

const CLICK_SLOP = 4;

export function attachControls(el: HTMLElement, view: Viewport, on: ControlEvents): () => void {
  const pointers = new Map<number, { x: number; y: number }>();
  let downAt: { x: number; y: number } | null = null;
  let moved = false;
  let pinch = 0;

  const local = (e: PointerEvent | WheelEvent) => {
    const r = el.getBoundingClientRect();
    return { x: e.clientX - r.left, y: e.clientY - r.top };
  };
  const spread = () => {
    const [a, b] = [...pointers.values()];
    return a && b ? Math.hypot(a.x - b.x, a.y - b.y) : 0;
  };

  const down = (e: PointerEvent) => {
    el.setPointerCapture(e.pointerId);
    const p = local(e);
    pointers.set(e.pointerId, p);
    if (pointers.size === 1) { downAt = p; moved = false; }
    if (pointers.size === 2) { pinch = spread(); moved = true; }
  };
  const move = (e: PointerEvent) => {
    const p = local(e);
    const prev = pointers.get(e.pointerId);
    if (!prev) {
      if (e.pointerType === 'mouse') on.hover(p.x, p.y);
      return;
    }
    if (pointers.size === 1) {
      if (downAt && Math.hypot(p.x - downAt.x, p.y - downAt.y) > CLICK_SLOP) moved = true;
      if (moved) { view.pan(p.x - prev.x, p.y - prev.y); on.changed(); }
    } else if (pointers.size === 2) {
      const before = [...pointers.values()];
      pointers.set(e.pointerId, p);
      const now = spread();
      const [a, b] = [...pointers.values()];
      const mx = (a!.x + b!.x) / 2, my = (a!.y + b!.y) / 2;
      const pmx = (before[0]!.x + before[1]!.x) / 2, pmy = (before[0]!.y + before[1]!.y) / 2;
      view.pan(mx - pmx, my - pmy);
      if (pinch > 0 && now > 0) view.zoomAt(mx, my, now / pinch);
      pinch = now;
      on.changed();
      return;
    }
    pointers.set(e.pointerId, p);
  };
  const up = (e: PointerEvent) => {
    const p = local(e);
    const was = pointers.size;
    pointers.delete(e.pointerId);
    if (was === 1 && !moved && downAt) on.click(p.x, p.y);
    if (pointers.size < 2) pinch = 0;
    if (pointers.size === 0) downAt = null;
  };
  const cancel = (e: PointerEvent) => {
    pointers.delete(e.pointerId);
    if (pointers.size === 0) downAt = null;
  };
  const wheel = (e: WheelEvent) => {
    e.preventDefault();
    const p = local(e);
    const unit = e.deltaMode === 1 ? 30 : e.deltaMode === 2 ? 300 : 1;
    view.zoomAt(p.x, p.y, Math.exp(-e.deltaY * unit * 0.0015));
    on.changed();
  };
  const leave = () => { if (pointers.size === 0) on.leave(); };

  el.addEventListener('pointerdown', down);
  el.addEventListener('pointermove', move);
  el.addEventListener('pointerup', up);
  el.addEventListener('pointercancel', cancel);
  el.addEventListener('pointerleave', leave);
  el.addEventListener('wheel', wheel, { passive: false });
  return () => {
    el.removeEventListener('pointerdown', down);
    el.removeEventListener('pointermove', move);
    el.removeEventListener('pointerup', up);
    el.removeEventListener('pointercancel', cancel);
    el.removeEventListener('pointerleave', leave);
    el.removeEventListener('wheel', wheel);
  };
}
