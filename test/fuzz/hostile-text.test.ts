/**
 * Text shaped to hurt a parser rather than picked at random: runs of a hundred thousand
 * digits (with and without garbage after them), huge exponents, character references beyond
 * Unicode. Each must end in a typed, located error (or a sound mesh) within the time bound.
 * Found by this file: a number pattern in the shared Scanner that backtracked quadratically,
 * and XML character references that threw a RangeError.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { Scanner } from '../../src/mesh/scan.js';
import { MeshInputError } from '../../src/mesh/errors.js';
import { expectTypedOutcome, newTally } from './outcome.js';
import { seeds } from './seeds.js';

const tally = newTally();
afterAll(() => console.log(`fuzz/hostile-text: ${tally.cases} cases`));

const enc = new TextEncoder();
const latin1 = new TextDecoder('latin1');
const DIGITS = '7'.repeat(100000);

/** The ASCII files written from the seed basin, in every format. */
function asciiSeeds() {
  return seeds().filter((s) => /ascii|triangle/.test(s.label) && !s.label.startsWith('fixture'));
}

describe('hostile text', () => {
  it('a number token of 100 000 digits, with garbage after it, fails fast in the Scanner', () => {
    for (const tok of [DIGITS + 'x', '-' + DIGITS + '.5q', '0.' + DIGITS + 'e5z', '1e' + DIGITS + '!']) {
      const sc = new Scanner(enc.encode(`1 2 ${tok} 4`), 'long.txt');
      sc.number();
      sc.number();
      const t0 = performance.now();
      expect(() => sc.number('a coordinate')).toThrow(MeshInputError);
      expect(performance.now() - t0).toBeLessThan(500);
    }
  });

  it('the same tokens as coordinates and field values in every ASCII format', () => {
    const tokens = [DIGITS + 'x', DIGITS, '1e' + DIGITS, '-0.' + DIGITS + 'e-99999', '1d' + '9'.repeat(20)];
    let n = 0;
    for (const seed of asciiSeeds()) {
      const text = latin1.decode(seed.files.get(seed.entry)!);
      // a coordinate of the seed basin (12.5) and a value of its arrays (the depth 2.3 or roughness 0.02x)
      for (const target of ['12.5', '0.021']) {
        const at = text.indexOf(target);
        if (at < 0) continue;
        for (const tok of tokens) {
          const bytes = enc.encode(text.slice(0, at) + tok + text.slice(at + target.length));
          expectTypedOutcome(seed.files, seed.entry, bytes, `${seed.label}: ${target} → ${tok.slice(0, 12)}… (${tok.length} chars)`, tally, 1000);
          n++;
        }
      }
    }
    expect(n).toBeGreaterThan(40);
  });

  it('XML character references beyond U+10FFFF are malformed XML, located at their tag', () => {
    const seed = seeds().find((s) => s.label.startsWith('vtu') && s.label.includes('"ascii"'))!;
    const text = latin1.decode(seed.files.get(seed.entry)!);
    for (const ref of ['&#x110000;', '&#99999999999;', '&#xFFFFFFFFFFFFFFFFFFFFFFFFFFFF;']) {
      const bytes = enc.encode(text.replace('Name="velocity"', `Name="velocity${ref}"`));
      const err = expectTypedOutcome(seed.files, seed.entry, bytes, `Name with ${ref}`, tally);
      expect(err?.detail).toMatch(/malformed XML: &#.*; is not a Unicode character/);
      expect(err?.location.byteOffset).toBe(text.lastIndexOf('<', text.indexOf('Name="velocity"')));
    }
    // the largest code point is a character
    const ok = enc.encode(text.replace('Name="velocity"', 'Name="velocity&#x10FFFF;"'));
    expect(expectTypedOutcome(seed.files, seed.entry, ok, 'U+10FFFF', tally)).toBeNull();
  });
});
