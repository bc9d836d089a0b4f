/** Test helpers shared by the MSH and Triangle reader tests. */
import { expect } from 'vitest';
import { MeshInputError } from '../../../src/mesh/errors.js';
import type { Mesh } from '../../../src/mesh/model.js';

/** Signed area of cell i by the shoelace formula (positive when counter-clockwise). */
export function cellArea(m: Mesh, i: number): number {
  let a = 0;
  const s = m.cellOffsets[i]!;
  const e = m.cellOffsets[i + 1]!;
  for (let k = s; k < e; k++) {
    const p = m.cellNodes[k]!;
    const q = m.cellNodes[k + 1 < e ? k + 1 : s]!;
    a += m.points[2 * p]! * m.points[2 * q + 1]! - m.points[2 * q]! * m.points[2 * p + 1]!;
  }
  return a / 2;
}

export function totalArea(m: Mesh): number {
  let a = 0;
  for (let i = 0; i < m.nCells; i++) a += cellArea(m, i);
  return a;
}

/** Coordinates of the nodes of cell i, as [x, y] pairs. */
export function cellCoords(m: Mesh, i: number): number[][] {
  const out: number[][] = [];
  for (let k = m.cellOffsets[i]!; k < m.cellOffsets[i + 1]!; k++) {
    const p = m.cellNodes[k]!;
    out.push([m.points[2 * p]!, m.points[2 * p + 1]!]);
  }
  return out;
}

/**
 * `fn` must throw a MeshInputError whose message matches `pattern` and which is located by a
 * line (ASCII) or a byte offset (binary).
 */
export function expectInputError(fn: () => unknown, pattern: RegExp, where: 'line' | 'byte'): MeshInputError {
  let caught: unknown;
  try {
    fn();
  } catch (e) {
    caught = e;
  }
  expect(caught).toBeInstanceOf(MeshInputError);
  const err = caught as MeshInputError;
  expect(err.message).toMatch(pattern);
  if (where === 'line') expect(err.location.line).toBeGreaterThan(0);
  else expect(err.location.byteOffset).toBeGreaterThanOrEqual(0);
  return err;
}

export const text = (s: string): Uint8Array => new TextEncoder().encode(s);
