/**
 * A tiny PNG decoder for screenshots: 8-bit RGB or RGBA, non-interlaced, all five filters
 * (PNG specification, W3C Recommendation 2003, sections 9.2 and 11.2).
 */
import { unzlibSync } from 'fflate';

export interface Image {
  width: number;
  height: number;
  /** RGBA, 4 bytes per pixel. */
  data: Uint8Array;
}

function paeth(a: number, b: number, c: number): number {
  const p = a + b - c;
  const pa = Math.abs(p - a), pb = Math.abs(p - b), pc = Math.abs(p - c);
  return pa <= pb && pa <= pc ? a : pb <= pc ? b : c;
}

export function decodePng(bytes: Uint8Array): Image {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const sig = [137, 80, 78, 71, 13, 10, 26, 10];
  for (let i = 0; i < 8; i++) if (bytes[i] !== sig[i]) throw new Error('not a PNG');
  let pos = 8;
  let width = 0, height = 0, colourType = 0;
  const idat: Uint8Array[] = [];
  while (pos < bytes.length) {
    const len = view.getUint32(pos);
    const type = String.fromCharCode(...bytes.subarray(pos + 4, pos + 8));
    const body = bytes.subarray(pos + 8, pos + 8 + len);
    if (type === 'IHDR') {
      width = view.getUint32(pos + 8);
      height = view.getUint32(pos + 12);
      const depth = body[8]!;
      colourType = body[9]!;
      if (depth !== 8 || (colourType !== 2 && colourType !== 6) || body[12] !== 0) throw new Error(`unsupported PNG (depth ${depth}, colour type ${colourType}, interlace ${body[12]})`);
    } else if (type === 'IDAT') idat.push(body);
    else if (type === 'IEND') break;
    pos += 12 + len;
  }
  let total = 0;
  for (const c of idat) total += c.length;
  const z = new Uint8Array(total);
  let o = 0;
  for (const c of idat) { z.set(c, o); o += c.length; }
  const raw = unzlibSync(z);
  const bpp = colourType === 6 ? 4 : 3;
  const stride = width * bpp;
  const cur = new Uint8Array(stride);
  const prev = new Uint8Array(stride);
  const data = new Uint8Array(width * height * 4);
  for (let y = 0; y < height; y++) {
    const f = raw[y * (stride + 1)]!;
    const line = raw.subarray(y * (stride + 1) + 1, (y + 1) * (stride + 1));
    for (let i = 0; i < stride; i++) {
      const a = i >= bpp ? cur[i - bpp]! : 0;
      const b = prev[i]!;
      const c = i >= bpp ? prev[i - bpp]! : 0;
      const x = line[i]!;
      cur[i] = (f === 0 ? x : f === 1 ? x + a : f === 2 ? x + b : f === 3 ? x + ((a + b) >> 1) : x + paeth(a, b, c)) & 255;
    }
    for (let px = 0; px < width; px++) {
      const d = (y * width + px) * 4;
      data[d] = cur[px * bpp]!;
      data[d + 1] = cur[px * bpp + 1]!;
      data[d + 2] = cur[px * bpp + 2]!;
      data[d + 3] = bpp === 4 ? cur[px * bpp + 3]! : 255;
    }
    prev.set(cur);
  }
  return { width, height, data };
}
