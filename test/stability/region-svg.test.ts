import { describe, expect, test } from 'vitest';
import { stabilityBoundary } from '../../src/stability/region.js';
import { abs2, regionRadiusBound, stabilityPolynomial } from '../../src/stability/polynomial.js';
import { builtInTableau, TIME_INTEGRATORS } from '../../src/stability/tableau.js';
import { stabilitySvg } from '../../src/stability/svg.js';

const poly = (name: string) => stabilityPolynomial(builtInTableau(name)!);

describe('stabilityBoundary', () => {
  test('forward Euler: the circle |z + 1| = 1 (common practice)', () => {
    const lines = stabilityBoundary(poly('euler'));
    let count = 0;
    for (const l of lines) for (let k = 0; k < l.length; k += 2) {
      expect(Math.hypot(l[k]! + 1, l[k + 1]!)).toBeCloseTo(1, 12);
      count++;
    }
    expect(count).toBeGreaterThan(700);
  });

  test.each(TIME_INTEGRATORS)('%s: every point has |R| = 1 and the lines are unbroken', (name) => {
    const r = poly(name);
    const lines = stabilityBoundary(r, 360);
    expect(lines.length).toBeGreaterThan(0);
    let maxX = -Infinity;
    let minX = Infinity;
    for (const l of lines) {
      for (let k = 0; k < l.length; k += 2) {
        expect(Math.sqrt(abs2(r, l[k]!, l[k + 1]!))).toBeCloseTo(1, 9);
        if (k > 0) expect(Math.hypot(l[k]! - l[k - 2]!, l[k + 1]! - l[k - 1]!)).toBeLessThan(0.5);
        maxX = Math.max(maxX, l[k]!);
        minX = Math.min(minX, l[k]!);
      }
    }
    expect(maxX).toBeGreaterThanOrEqual(-1e-9); // z = 0 is on the boundary
    const bound = regionRadiusBound(r);
    for (const l of lines) for (let k = 0; k < l.length; k += 2) expect(Math.hypot(l[k]!, l[k + 1]!)).toBeLessThan(bound);
    expect(minX).toBeLessThan(-1.9); // every method here reaches at least −2 on the real axis
  });
});

describe('stabilitySvg', () => {
  test('draws the boundary and the scaled spectrum with labelled axes', () => {
    const svg = stabilitySvg('rk4', 'dg2');
    expect(svg.startsWith('<svg xmlns="http://www.w3.org/2000/svg"')).toBe(true);
    expect(svg.trimEnd().endsWith('</svg>')).toBe(true);
    expect(svg).toMatch(/rk4 in time, dg2 in space: largest stable Courant number 0\.235/);
    expect(svg).toContain('>Re z<');
    expect(svg).toContain('>Im z<');
    expect((svg.match(/<polyline /g) ?? []).length).toBeGreaterThanOrEqual(1);
    expect((svg.match(/<circle /g) ?? []).length).toBe(257 * 3);
    expect(svg).not.toMatch(/NaN|Infinity|undefined/);
    const opened = (svg.match(/<(svg|g|text)\b/g) ?? []).length;
    const closed = (svg.match(/<\/(svg|g|text)>/g) ?? []).length;
    expect(opened).toBe(closed);
  });

  test('an unstable pairing is drawn at σ = 1 "for illustration"; labels are escaped', () => {
    const svg = stabilitySvg('euler', 'central2', { timeLabel: 'my<rk>&co.json' });
    expect(svg).toContain('weakly-unstable');
    expect(svg).toContain('σ = 1 (for illustration)');
    expect(svg).toContain('my&lt;rk&gt;&amp;co.json');
    expect(svg).not.toContain('my<rk>');
  });

  test('an explicit σ and size are honoured', () => {
    const svg = stabilitySvg('ssp-rk3', 'upwind1', { sigma: 0.5, width: 400, height: 300 });
    expect(svg).toContain('width="400" height="300"');
    expect(svg).toContain('σ = 0.5<');
  });
});
