// Long decimal mantissas read by the scanner must give exactly what Number(text) gives (the
// correctly rounded double, ECMA-262 StringToNumber); Number() is the reference.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { decimalToDouble } from '../../src/mesh/decimal.js';
import { Scanner } from '../../src/mesh/scan.js';
import { rng } from '../helpers/meshes.js';

const enc = new TextEncoder();

function scan(texts: string[]): number[] {
  const sc = new Scanner(enc.encode(texts.join(' ')), 'test');
  return texts.map(() => sc.number());
}

describe('decimalToDouble', () => {
  it('is the correctly rounded value, or declines (NaN)', () => {
    const next = rng(77);
    let declined = 0;
    for (let i = 0; i < 50_000; i++) {
      const mHi = Math.floor(next() * 1e15), nLo = Math.floor(next() * 5), mLo = Math.floor(next() * 10 ** nLo);
      const e10 = Math.floor(next() * 580) - 300; // normal results
      const v = decimalToDouble(mHi, mLo, nLo, e10);
      const text = `${mHi}${nLo > 0 ? String(mLo).padStart(nLo, '0') : ''}e${e10}`;
      if (v !== v) declined++;
      else if (v !== Number(text)) expect(v, text).toBe(Number(text));
    }
    // declines are exact ties (integers halfway between two doubles above 2^53) and rare near-ties
    expect(declined).toBeLessThan(100);
  });

  it('declines exact ties between two doubles (ties to even are left to Number)', () => {
    // 2^53 + 1 lies halfway between 2^53 and 2^53 + 2 (common practice: binary64 spacing is 2 there)
    expect(decimalToDouble(900719925474099, 3, 1, 0)).toBeNaN();
    expect(scan(['9007199254740993'])).toEqual([9007199254740992]);
  });
});

describe('Scanner.number with 16 to 19 significant digits', () => {
  it('reads what writers print at full precision', () => {
    const next = rng(3);
    const texts: string[] = [];
    for (let i = 0; i < 20_000; i++) {
      const x = (next() - 0.5) * 10 ** Math.floor(next() * 30 - 15);
      texts.push(String(x), x.toPrecision(17), x.toExponential(18), (4.2e5 + next() * 1e4).toPrecision(19));
    }
    const got = scan(texts);
    texts.forEach((t, i) => { if (got[i] !== Number(t)) expect(got[i], t).toBe(Number(t)); });
  });

  it('any double printed with 15 to 19 digits (fast-check)', () => {
    fc.assert(fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), fc.integer({ min: 15, max: 19 }), (x, d) => {
      const t = x.toPrecision(d);
      return Object.is(scan([t])[0], Number(t));
    }), { numRuns: 20_000 });
  });

  it('zeros, signs and exponents at the edges', () => {
    const texts = ['-0.0000000000000000000', '0.00000000000000000001', '1.7976931348623157e308', '1.7976931348623159e308',
      '2.2250738585072011e-308', '2.2250738585072014e-308', '4.9406564584124654e-324', '-123456789012345678e-5', '+1234567890123456789'];
    const got = scan(texts);
    texts.forEach((t, i) => expect(Object.is(got[i], Number(t)), t).toBe(true));
  });
});
