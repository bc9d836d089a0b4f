// Shared allocation and the recycling of spent read buffers: live buffers are never handed out,
// carved arrays start at zero and never overlap, and ordinary memory is used when sharing is off.
import { afterEach, describe, expect, it } from 'vitest';
import { allocateShared, float64s, int32s, readBuffer, recycleSpent, sharedFloat64s, uint8s } from '../../src/mesh/alloc.js';

afterEach(() => allocateShared(false));

function span(a: ArrayBufferView): [ArrayBufferLike, number, number] {
  return [a.buffer, a.byteOffset, a.byteOffset + a.byteLength];
}

describe('allocation', () => {
  it('ordinary memory by default; shared memory once asked', () => {
    expect(float64s(4).buffer).toBeInstanceOf(ArrayBuffer);
    expect(readBuffer(2 ** 21).buffer).toBeInstanceOf(ArrayBuffer);
    allocateShared(true);
    expect(float64s(4).buffer).toBeInstanceOf(SharedArrayBuffer);
    expect(int32s(4).buffer).toBeInstanceOf(SharedArrayBuffer);
    expect(uint8s(4).buffer).toBeInstanceOf(SharedArrayBuffer);
    expect(sharedFloat64s(4).buffer).toBeInstanceOf(SharedArrayBuffer);
  });

  it('recycles only the read buffers no live array lies on; carved arrays are zeroed and disjoint', () => {
    allocateShared(true);
    const live = readBuffer(2 ** 21);
    const spentA = readBuffer(2 ** 21);
    const spentB = readBuffer(3 * 2 ** 20);
    live.fill(7);
    spentA.fill(9);
    spentB.fill(9);
    const view = new Float64Array(live.buffer, 8, 10); // the mesh keeps a view into `live`
    expect(recycleSpent([view])).toBe(2 ** 21 + 3 * 2 ** 20);
    const carved = [sharedFloat64s(2 ** 17), float64s(2 ** 17 - 3), int32s(1000), uint8s(12345), sharedFloat64s(2 ** 18)];
    for (const a of carved) {
      expect(a.buffer === spentA.buffer || a.buffer === spentB.buffer).toBe(true);
      expect(a.byteOffset % (a instanceof Uint8Array ? 1 : a.BYTES_PER_ELEMENT)).toBe(0);
      expect(Array.from(new Uint8Array(a.buffer, a.byteOffset, a.byteLength)).every((b) => b === 0)).toBe(true);
    }
    const spans = carved.map(span);
    for (let i = 0; i < spans.length; i++) {
      for (let j = i + 1; j < spans.length; j++) {
        const [bi, si, ei] = spans[i]!, [bj, sj, ej] = spans[j]!;
        expect(bi !== bj || ei <= sj || ej <= si).toBe(true);
      }
    }
    // the live buffer is untouched; when the spare memory runs out, fresh memory follows
    expect(live.every((b) => b === 7)).toBe(true);
    const fresh = sharedFloat64s(2 ** 20);
    expect(fresh.buffer === spentA.buffer || fresh.buffer === spentB.buffer || fresh.buffer === live.buffer).toBe(false);
    // a reset forgets the spare memory
    allocateShared(true);
    const after = sharedFloat64s(16);
    expect(after.buffer === spentA.buffer || after.buffer === spentB.buffer).toBe(false);
  });
});
