import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { MeshInputError } from '../../../src/mesh/errors.js';
import { Base64Reader, Base64Writer, base64Length } from '../../../src/mesh/vtkxml/base64.js';

const ascii = (s: string): Uint8Array => Uint8Array.from(s, (c) => c.charCodeAt(0));
const text = (b: Uint8Array): string => String.fromCharCode(...b);

function decode(s: string, n: number): Uint8Array {
  return new Base64Reader(ascii(s), 0, s.length, 'b.vtu').read(n, 'test data');
}

function encode(parts: Uint8Array[][]): string {
  const n = parts.reduce((t, st) => t + base64Length(st.reduce((m, p) => m + p.length, 0)), 0);
  const w = new Base64Writer(new Uint8Array(n), 0);
  for (const st of parts) {
    for (const p of st) w.push(p);
    w.flush();
  }
  expect(w.pos).toBe(n);
  return text(w.out);
}

// S. Josefsson, "The Base16, Base32, and Base64 Data Encodings", RFC 4648 (2006), section 10.
const RFC4648: Array<[string, string]> = [
  ['', ''], ['f', 'Zg=='], ['fo', 'Zm8='], ['foo', 'Zm9v'], ['foob', 'Zm9vYg=='], ['fooba', 'Zm9vYmE='], ['foobar', 'Zm9vYmFy'],
];

describe('base64', () => {
  it.each(RFC4648)('RFC 4648 test vector "%s"', (plain, coded) => {
    expect(text(decode(coded, plain.length))).toBe(plain);
    expect(encode([[ascii(plain)]])).toBe(coded);
  });

  it('decodes across whitespace and line breaks', () => {
    expect(text(decode(' Zm9v\n  Ym\r\nFy ', 6))).toBe('foobar');
  });

  it('reads separately padded segments as one byte sequence', () => {
    // "f" and "oobar" encoded apart: Zg== then b29iYXI=
    const r = new Base64Reader(ascii('Zg==b29iYXI='), 0, 12, 'b.vtu');
    expect(text(r.read(1, 'header'))).toBe('f');
    expect(text(r.read(5, 'data'))).toBe('oobar');
  });

  it('hands out the rest of a group to the next read', () => {
    const r = new Base64Reader(ascii('Zm9vYmFy'), 0, 8, 'b.vtu');
    expect(text(r.read(4, 'a'))).toBe('foob');
    expect(text(r.read(2, 'b'))).toBe('ar');
  });

  it('matches Node Buffer on random data, split and streamed arbitrarily', () => {
    fc.assert(fc.property(fc.uint8Array({ maxLength: 200 }), fc.array(fc.nat(200), { maxLength: 4 }), (data, cuts) => {
      const points = [...new Set(cuts.map((c) => c % (data.length + 1)))].sort((a, b) => a - b);
      const parts: Uint8Array[] = [];
      let prev = 0;
      for (const c of [...points, data.length]) { parts.push(data.subarray(prev, c)); prev = c; }
      const coded = encode([parts]);
      expect(coded).toBe(Buffer.from(data).toString('base64'));
      expect(Array.from(decode(coded, data.length))).toEqual(Array.from(data));
    }), { numRuns: 200, seed: 7 });
  });

  it('reports a bad character and early end at their bytes', () => {
    const bad = (): Uint8Array => decode('Zm9v*mFy', 6);
    expect(bad).toThrow(MeshInputError);
    expect(bad).toThrow("b.vtu: byte 4: bad base64 character '*' in test data");
    expect(() => decode('Zm9vYm  ', 6)).toThrow(/ends early/);
    expect(() => decode('Zm9vYmFy', 9)).toThrow(/needs 9 bytes/);
    expect(() => decode('Z===', 1)).toThrow(/misplaced base64 padding/);
  });
});
