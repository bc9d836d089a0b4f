import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { angleDegrees, atanNonNegative } from '../../src/geometry/angle.js';

describe('arithmetic-only angles', () => {
  it('atan agrees with Math.atan within 1 ulp of the result (fdlibm s_atan.c accuracy)', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1e20, noNaN: true }), (a) => {
        const v = atanNonNegative(a), ref = Math.atan(a);
        expect(Math.abs(v - ref)).toBeLessThanOrEqual(Math.max(Number.EPSILON * Math.abs(ref), Number.MIN_VALUE));
      }),
      { numRuns: 20000, seed: 3 },
    );
  });

  it('angles in degrees agree with Math.atan2 to 1e-15 relative, with exact special values', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1e6, noNaN: true }), fc.double({ min: -1e6, max: 1e6, noNaN: true }), (y, x) => {
        const ref = (Math.atan2(y, x) * 180) / Math.PI;
        expect(Math.abs(angleDegrees(y, x) - ref)).toBeLessThanOrEqual(1e-15 * Math.max(1, ref) * 4);
      }),
      { numRuns: 20000, seed: 4 },
    );
    expect(angleDegrees(1, 1)).toBe(45);
    expect(angleDegrees(1, 0)).toBe(90);
    expect(angleDegrees(0, -1)).toBe(180);
    expect(angleDegrees(0, 0)).toBe(0);
    expect(angleDegrees(Math.sqrt(3), 1)).toBeCloseTo(60, 13);
  });
});
