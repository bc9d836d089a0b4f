import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { Scanner } from '../../src/mesh/scan.js';
import { MeshInputError } from '../../src/mesh/errors.js';

const enc = new TextEncoder();

describe('Scanner.number', () => {
  it('parses every double exactly as ECMAScript Number() does (shortest, exponential and padded forms)', () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), fc.integer({ min: 0, max: 3 }), (x, form) => {
        const text = form === 0 ? String(x) : form === 1 ? x.toExponential() : form === 2 ? x.toPrecision(17) : x.toExponential(20);
        const s = new Scanner(enc.encode(` ${text}\n`), 't');
        const v = s.number();
        expect(Object.is(v, Number(text)) || (v === 0 && Number(text) === 0)).toBe(true);
      }),
      { numRuns: 3000, seed: 1 },
    );
  });

  it('reads Fortran exponents, signs, nan and inf, and reports the line of a bad token', () => {
    const s = new Scanner(enc.encode('1.5D+02 -2e-3 +7 nan -inf Infinity\n\n  12x'), 'f.txt');
    expect(s.number()).toBe(150);
    expect(s.number()).toBe(-0.002);
    expect(s.number()).toBe(7);
    expect(s.number()).toBeNaN();
    expect(s.number()).toBe(-Infinity);
    expect(s.number()).toBe(Infinity);
    expect(() => s.number('a coordinate')).toThrow(MeshInputError);
    const t = new Scanner(enc.encode('1\n2\n\n  12x'), 'f.txt');
    t.number(); t.number();
    expect(() => t.number('a coordinate')).toThrow('f.txt: line 4: expected a coordinate, found "12x"');
    expect(() => new Scanner(enc.encode('  '), 'e').number('a count')).toThrow(/unexpected end of file: expected a count/);
  });

  it('int() checks range and integrality', () => {
    const s = new Scanner(enc.encode('3 4.5 -1'), 'i');
    expect(s.int('n', 0, 10)).toBe(3);
    expect(() => s.int('n', 0, 10)).toThrow(/an integer in 0\.\.10/);
  });
});
