import { interpolateViridis } from 'd3-scale-chromatic';
import { describe, expect, it } from 'vitest';
import { CAUSE_DEGENERATE, CAUSE_DIFFUSION, CAUSE_FAST, CAUSE_SHAPE, CAUSE_SMALL } from '../../src/audit/audit.js';
import { cellThickness, centredPoints, logHistogram, markedCells } from '../../src/view/analysis.js';
import { paletteBytes, parseColour, sanitizeRange, scalePosition, ticks } from '../../src/view/colour.js';
import { causeCategory, encodeField, NO_LIMIT, UNDEFINED_VALUE } from '../../src/view/fields.js';
import { Viewport } from '../../src/view/scene/viewport.js';

describe('field encoding for the value texture', () => {
  it('keeps regular values, marks infinite and undefined ones, and finds the range', () => {
    const { values, min, max } = encodeField([0.5, Infinity, NaN, 0, 2, -3], true);
    expect([...values]).toEqual([0.5, NO_LIMIT, UNDEFINED_VALUE, 0, 2, UNDEFINED_VALUE]);
    // a log range leaves out zero
    expect([min, max]).toEqual([0.5, 2]);
    expect(encodeField([0, 1], false).min).toBe(0);
    const none = encodeField([Infinity], true);
    expect(Number.isNaN(none.min) && Number.isNaN(none.max)).toBe(true);
  });

  it('puts each cause bit set in one category, degenerate and diffusion first', () => {
    expect(causeCategory(0)).toBe(0);
    expect(causeCategory(CAUSE_SMALL)).toBe(1);
    expect(causeCategory(CAUSE_SHAPE)).toBe(2);
    expect(causeCategory(CAUSE_SMALL | CAUSE_SHAPE | CAUSE_FAST)).toBe(7);
    expect(causeCategory(CAUSE_DEGENERATE | CAUSE_SMALL)).toBe(8);
    expect(causeCategory(CAUSE_DIFFUSION | CAUSE_FAST)).toBe(9);
  });
});

describe('histogram of log10(dt)', () => {
  it('bins every positive finite step once and counts zero and unlimited steps apart', () => {
    const dt = Float64Array.from([1e-3, 1e-2, 1e-2, 0.1, 1, 0, Infinity, Infinity]);
    const h = logHistogram(dt, 3);
    expect(h.lo).toBeCloseTo(-3, 12);
    expect(h.hi).toBeCloseTo(0, 12);
    expect([...h.counts]).toEqual([1, 2, 2]);
    expect(h.zero).toBe(1);
    expect(h.unlimited).toBe(2);
  });

  it('widens a single value to one decade', () => {
    const h = logHistogram(Float64Array.from([2, 2, 2]), 4);
    expect(h.hi - h.lo).toBeCloseTo(1, 12);
    expect(h.counts.reduce((a, b) => a + b, 0)).toBe(3);
  });
});

describe('marked cells', () => {
  const dt = Float64Array.from([5, 1, 0, 1.9, 2.1, Infinity, 1.5]);
  it('are the cells within the factor of the limit, degenerate ones included', () => {
    const m = markedCells(dt, 1, 2, 100);
    expect([...m.cells]).toEqual([1, 2, 3, 6]);
    expect(m.total).toBe(4);
    expect([...markedCells(dt, null, 2, 100).cells]).toEqual([]);
  });
  it('keep the smallest steps when capped', () => {
    const m = markedCells(dt, 1, 2, 2);
    expect([...m.cells]).toEqual([1, 2]);
    expect(m.total).toBe(4);
  });
  it('have a thickness 2A/P for deciding whether a ring is needed', () => {
    // right triangle with legs 3 and 4: A = 6, P = 12, so 2A/P = 1 (its inradius)
    const pts = Float64Array.from([0, 0, 3, 0, 0, 4, 9, 9]);
    const t = cellThickness(pts, Int32Array.from([0, 3, 6]), Int32Array.from([3, 1, 2, 0, 1, 2]), Int32Array.from([1]));
    expect(t[0]).toBeCloseTo(1, 6);
    const flat = cellThickness(Float64Array.from([0, 0, 1, 0, 2, 0]), Int32Array.from([0, 3]), Int32Array.from([0, 1, 2]), Int32Array.from([0]));
    expect(flat[0]).toBeGreaterThan(0);
    expect(flat[0]).toBeLessThan(1e-20);
  });
  it('have their centroids shifted by the centre', () => {
    const c = Float64Array.from([10, 20, 30, 40]);
    expect([...centredPoints(c, Int32Array.from([1]), 10, 20)]).toEqual([20, 20]);
  });
});

describe('colour scales', () => {
  it('samples viridis as d3-scale-chromatic does, reversed when asked', () => {
    const p = paletteBytes('viridis', false);
    expect([...p.subarray(0, 3)]).toEqual(parseColour(interpolateViridis(0)));
    expect([...p.subarray(255 * 4, 255 * 4 + 3)]).toEqual(parseColour(interpolateViridis(1)));
    const r = paletteBytes('viridis', true);
    expect([...r.subarray(0, 3)]).toEqual(parseColour(interpolateViridis(1)));
    // viridis starts at #440154 (van der Walt and Smith, matplotlib colormaps, 2015; from memory)
    expect(parseColour(interpolateViridis(0))).toEqual([0x44, 0x01, 0x54]);
  });

  it('parses the two colour forms d3 returns', () => {
    expect(parseColour('#ff8000')).toEqual([255, 128, 0]);
    expect(parseColour('rgb(1, 2, 3)')).toEqual([1, 2, 3]);
  });

  it('places values on a log scale by decades', () => {
    const r = { lo: 1e-3, hi: 10 };
    expect(scalePosition('log', r, 1e-2)).toBeCloseTo(0.25, 12);
    expect(scalePosition('log', r, 1)).toBeCloseTo(0.75, 12);
    expect(scalePosition('log', r, 1e3)).toBe(1);
    expect(scalePosition('linear', { lo: 0, hi: 4 }, 1)).toBeCloseTo(0.25, 12);
  });

  it('repairs unusable ranges', () => {
    expect(sanitizeRange('log', 0, 5).lo).toBeGreaterThan(0);
    const one = sanitizeRange('log', 2, 2);
    expect(one.lo).toBeLessThan(2);
    expect(one.hi).toBeGreaterThan(2);
    const lin = sanitizeRange('linear', 3, 3);
    expect(lin.hi).toBeGreaterThan(lin.lo);
    expect(sanitizeRange('linear', NaN, NaN)).toEqual({ lo: 0, hi: 1 });
  });

  it('gives a handful of legend ticks inside the range', () => {
    for (const [lo, hi] of [[0.02477, 4.708], [1e-6, 1e3], [0.5, 0.9]] as const) {
      const t = ticks('log', { lo, hi });
      expect(t.length).toBeGreaterThanOrEqual(2);
      expect(t.length).toBeLessThanOrEqual(8);
      for (const k of t) {
        expect(k.value).toBeGreaterThanOrEqual(lo * (1 - 1e-12));
        expect(k.value).toBeLessThanOrEqual(hi * (1 + 1e-12));
      }
    }
  });
});

describe('viewport', () => {
  it('maps screen to model and back, y up, one scale for both axes', () => {
    const v = new Viewport();
    v.setSize(800, 400);
    v.fit(-100, -10, 100, 10, 0);
    expect(v.scale).toBeCloseTo(0.25, 12); // width decides: 200 units over 800 px
    const [x, y] = v.toModel(600, 100);
    expect(x).toBeCloseTo(50, 9);
    expect(y).toBeCloseTo(25, 9);
    const [px, py] = v.toScreen(x, y);
    expect(px).toBeCloseTo(600, 9);
    expect(py).toBeCloseTo(100, 9);
  });

  it('zooms about the pointer and pans by pixels', () => {
    const v = new Viewport();
    v.setSize(500, 500);
    v.fit(0, 0, 10, 10, 0);
    const before = v.toModel(123, 321);
    v.zoomAt(123, 321, 4);
    const after = v.toModel(123, 321);
    expect(after[0]).toBeCloseTo(before[0], 9);
    expect(after[1]).toBeCloseTo(before[1], 9);
    expect(v.scale).toBeCloseTo(10 / 500 / 4, 12);
    const c = [v.cx, v.cy];
    v.pan(10, 20);
    expect(v.cx).toBeCloseTo(c[0]! - 10 * v.scale, 12);
    expect(v.cy).toBeCloseTo(c[1]! + 20 * v.scale, 12);
  });

  it('limits the zoom to what float32 vertices can show', () => {
    const v = new Viewport();
    v.setSize(100, 100);
    v.fit(0, 0, 1, 1, 0);
    for (let k = 0; k < 100; k++) v.zoomAt(50, 50, 10);
    expect(v.scale).toBeGreaterThan(0);
    expect(v.scale * 100).toBeGreaterThanOrEqual(1e-7 * 0.999);
  });
});
