/** The screenshot decoder against images filtered as the PNG specification describes (W3C 2003, 9.2). */
import { zlibSync } from 'fflate';
import { describe, expect, it } from 'vitest';
import { decodePng } from './png.js';

function paeth(a: number, b: number, c: number): number {
  const p = a + b - c;
  const pa = Math.abs(p - a), pb = Math.abs(p - b), pc = Math.abs(p - c);
  return pa <= pb && pa <= pc ? a : pb <= pc ? b : c;
}

/** A PNG of 8-bit pixels, row y filtered with filter y % 5 (CRCs left zero: the decoder ignores them). */
function encode(width: number, height: number, bpp: 3 | 4, pixels: Uint8Array): Uint8Array {
  const stride = width * bpp;
  const raw = new Uint8Array(height * (stride + 1));
  for (let y = 0; y < height; y++) {
    const f = y % 5;
    raw[y * (stride + 1)] = f;
    for (let i = 0; i < stride; i++) {
      const x = pixels[y * stride + i]!;
      const a = i >= bpp ? pixels[y * stride + i - bpp]! : 0;
      const b = y > 0 ? pixels[(y - 1) * stride + i]! : 0;
      const c = y > 0 && i >= bpp ? pixels[(y - 1) * stride + i - bpp]! : 0;
      const pred = f === 0 ? 0 : f === 1 ? a : f === 2 ? b : f === 3 ? (a + b) >> 1 : paeth(a, b, c);
      raw[y * (stride + 1) + 1 + i] = (x - pred) & 255;
    }
  }
  const chunk = (type: string, body: Uint8Array) => {
    const out = new Uint8Array(12 + body.length);
    new DataView(out.buffer).setUint32(0, body.length);
    for (let k = 0; k < 4; k++) out[4 + k] = type.charCodeAt(k);
    out.set(body, 8);
    return out;
  };
  const ihdr = new Uint8Array(13);
  const dv = new DataView(ihdr.buffer);
  dv.setUint32(0, width);
  dv.setUint32(4, height);
  ihdr.set([8, bpp === 4 ? 6 : 2, 0, 0, 0], 8);
  const parts = [Uint8Array.from([137, 80, 78, 71, 13, 10, 26, 10]), chunk('IHDR', ihdr), chunk('IDAT', zlibSync(raw)), chunk('IEND', new Uint8Array(0))];
  const total = parts.reduce((n, p) => n + p.length, 0);
  const png = new Uint8Array(total);
  let o = 0;
  for (const p of parts) { png.set(p, o); o += p.length; }
  return png;
}

describe('PNG decoder', () => {
  for (const bpp of [3, 4] as const) {
    it(`undoes all five filters (${bpp === 4 ? 'RGBA' : 'RGB'})`, () => {
      const w = 7, h = 10;
      const px = new Uint8Array(w * h * bpp);
      let s = 3;
      for (let i = 0; i < px.length; i++) px[i] = (s = (s * 48271) % 2147483647) & 255;
      const img = decodePng(encode(w, h, bpp, px));
      expect([img.width, img.height]).toEqual([w, h]);
      for (let p = 0; p < w * h; p++) {
        expect([...img.data.subarray(4 * p, 4 * p + 3)]).toEqual([...px.subarray(bpp * p, bpp * p + 3)]);
        expect(img.data[4 * p + 3]).toBe(bpp === 4 ? px[bpp * p + 3] : 255);
      }
    });
  }

  it('refuses what it cannot read', () => {
    expect(() => decodePng(new Uint8Array(16))).toThrow(/not a PNG/);
  });
});
