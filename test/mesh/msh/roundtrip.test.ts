/**
 * Random small meshes through every MSH encoding (2.2 / 4.1, ASCII / binary, both byte
 * orders, 4- and 8-byte size_t). Expected results are built here from the random description,
 * not from the reader.
 */
import { describe, expect, it } from 'vitest';
import { QUAD, TRIANGLE, findArray } from '../../../src/mesh/model.js';
import { readMsh } from '../../../src/mesh/msh/index.js';
import { ALL_ENCODINGS, encodeMsh, encodingName, type MshDoc, type MshElement } from './encode.js';
import { rng } from '../../helpers/meshes.js';

function shuffle<T>(a: T[], r: () => number): T[] {
  for (let i = a.length - 1; i > 0; i--) {
    const j = Math.floor(r() * (i + 1));
    [a[i], a[j]] = [a[j]!, a[i]!];
  }
  return a;
}

/** Distinct positive tags, shuffled; sometimes far apart (so the reader needs a hash map). */
function tags(n: number, r: () => number): number[] {
  const sparse = r() < 0.4;
  const set = new Set<number>();
  while (set.size < n) set.add(sparse ? 1 + Math.floor(r() * 2e9) : 1 + Math.floor(r() * 3 * n));
  return shuffle([...set], r);
}

/** MSH type id → [node count, corners kept (0 = dropped)] for the types drawn here (Gmsh manual, element types). */
const TYPES: Record<number, [number, number]> = {
  15: [1, 0], 1: [2, 0], 8: [3, 0], 2: [3, 3], 3: [4, 4], 9: [6, 3], 16: [8, 4], 10: [9, 4], 21: [10, 3],
};
const TYPE_IDS = Object.keys(TYPES).map(Number);

function randomDoc(seed: number): MshDoc {
  const r = rng(seed);
  const nNodes = 4 + Math.floor(r() * 30);
  const nodeTags = tags(nNodes, r);
  const flat = r() < 0.7;
  const nodes = nodeTags.map((tag) => ({ tag, x: (r() - 0.5) * 1e6, y: r() * 4e6, z: flat ? 0 : r() }));
  const nEl = 1 + Math.floor(r() * 25);
  const elTags = tags(nEl, r);
  const elements: MshElement[] = elTags.map((tag) => {
    const type = TYPE_IDS[Math.floor(r() * TYPE_IDS.length)]!;
    const nodesOf = Array.from({ length: TYPES[type]![0] }, () => nodeTags[Math.floor(r() * nNodes)]!);
    return { tag, type, nodes: nodesOf };
  });
  const vel = { kind: 'node' as const, name: 'velocity', time: 3.25, step: 1, components: 3,
    entries: shuffle(nodes.map((n) => ({ tag: n.tag, values: [n.x / 1e6, -n.y / 1e6, 0] })), r) };
  const rough = { kind: 'element' as const, name: 'roughness', time: 3.25, step: 1, components: 1,
    entries: elements.map((e) => ({ tag: e.tag, values: [e.tag / 1e9] })) };
  return { nodes, elements, fields: [vel, rough], extras: r() < 0.5, nodeBlocks: 1 + Math.floor(r() * 4) };
}

describe('round trips of random meshes through every encoding', () => {
  for (let seed = 1; seed <= 25; seed++) {
    const doc = randomDoc(seed);
    const index = new Map(doc.nodes.map((n, i) => [n.tag, i]));
    const kept = doc.elements.filter((e) => TYPES[e.type]![1] > 0);
    for (const enc of ALL_ENCODINGS) {
      it(`seed ${seed}, ${encodingName(enc)}`, () => {
        const m = readMsh(encodeMsh(doc, enc), 'random.msh');
        expect(m.format).toBe(`msh/${enc.version}-${enc.binary ? 'binary' : 'ascii'}`);
        expect(m.nPoints).toBe(doc.nodes.length);
        expect(Array.from(m.points)).toEqual(doc.nodes.flatMap((n) => [n.x, n.y]));
        expect(m.nCells).toBe(kept.length);
        expect(Array.from(m.cellTypes)).toEqual(kept.map((e) => (TYPES[e.type]![1] === 3 ? TRIANGLE : QUAD)));
        expect(Array.from(m.cellNodes)).toEqual(kept.flatMap((e) => e.nodes.slice(0, TYPES[e.type]![1]).map((t) => index.get(t)!)));
        const v = findArray(m.pointData, 'velocity')!;
        expect(v.components).toBe(3);
        expect(Array.from(v.values)).toEqual(doc.nodes.flatMap((n) => [n.x / 1e6, -n.y / 1e6, 0]));
        const rough = findArray(m.cellData, 'roughness')!;
        expect(Array.from(rough.values)).toEqual(kept.map((e) => e.tag / 1e9));
        expect(m.time).toBe(3.25);
        const higher = kept.filter((e) => TYPES[e.type]![0] > TYPES[e.type]![1]).length;
        expect(m.warnings.some((w) => w.includes('higher-order'))).toBe(higher > 0);
        const zVaries = doc.nodes.some((n) => n.z !== doc.nodes[0]!.z);
        expect(m.warnings.some((w) => w.includes('z varies'))).toBe(zVaries);
      });
    }
  }
});
