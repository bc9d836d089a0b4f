/**
 * Valid files of every format, broken at random: bytes changed, inserted, deleted or repeated;
 * numbers replaced by lies (in text and in binary words); cut at every kind of boundary; two
 * files spliced. Each read must end in a sound mesh or a located typed error, within 2 s and
 * without allocating more than the file can back (see outcome.ts). The per-reader tests of
 * test/mesh/ cut small files at every byte; this layer goes through readMesh, across formats.
 */
import fc from 'fast-check';
import { afterAll, describe, it } from 'vitest';
import { expectTypedOutcome, newTally, runs } from './outcome.js';
import { seeds, type Seed } from './seeds.js';

const SEEDS = seeds();
const tally = newTally();
afterAll(() => console.log(`fuzz/mutations: ${tally.cases} cases (${tally.read} read as meshes, ${tally.failed} typed errors) on ${SEEDS.length} seed files`));

const latin1 = new TextDecoder('latin1');
const enc = new TextEncoder();

/** Where formats change meaning: line and tag starts, quotes, section marks, appended arrays, and midway between them. */
function boundaries(b: Uint8Array): number[] {
  const at = new Set<number>([0, b.length]);
  for (let i = 0; i < b.length; i++) {
    const c = b[i]!;
    if (c === 10 || c === 62) at.add(i + 1); // after '\n', '>'
    if (c === 60 || c === 36 || c === 34 || c === 95) at.add(i); // '<', '$', '"', '_'
  }
  const text = latin1.decode(b);
  const tag = text.indexOf('<AppendedData');
  const app = tag < 0 ? -1 : text.indexOf('_', tag);
  if (app > 0) {
    for (const m of text.matchAll(/offset="(\d+)"/g)) for (const k of [0, 2, 4, 7, 8, 12, 16, 24, 33]) at.add(app + 1 + Number(m[1]) + k);
  }
  const sorted = [...at].filter((p) => p <= b.length).sort((x, y) => x - y);
  for (let i = 1; i < sorted.length; i++) {
    const [p, q] = [sorted[i - 1]!, sorted[i]!];
    if (q - p > 3) at.add(p + Math.floor((q - p) / 2)).add(p + Math.floor((q - p) / 4));
  }
  return [...at].filter((p) => p <= b.length).sort((x, y) => x - y);
}

const BOUNDS = SEEDS.map((s) => boundaries(s.files.get(s.entry)!));

/** Runs of ASCII digits (with a leading '-'): header counts, sizes, ids, values. */
function numberRuns(b: Uint8Array): [number, number][] {
  const runs: [number, number][] = [];
  for (let i = 0; i < b.length; ) {
    const c = b[i]!;
    if ((c >= 48 && c <= 57) || (c === 45 && b[i + 1]! >= 48 && b[i + 1]! <= 57)) {
      let j = i + 1;
      while (j < b.length && b[j]! >= 48 && b[j]! <= 57) j++;
      runs.push([i, j]);
      i = j;
    } else i++;
  }
  return runs;
}

const RUNS = SEEDS.map((s) => numberRuns(s.files.get(s.entry)!));

const LIES = ['0', '-1', '1', '3', '255', '65536', '2147483647', '2147483648', '4294967295', '4294967296', '1099511627776',
  '9007199254740993', '18446744073709551615', '1e308', '1e999', '-2147483649', '3.5', 'nan', '', '00000000000000000000001'];

/** 32- and 64-bit words as a lying size header, count or index would hold them. */
const WORDS: bigint[] = [0n, 1n, 0x7fffffffn, 0x80000000n, 0xffffffffn, 0x100000000n, 1n << 40n, (1n << 53n) + 1n, (1n << 63n), (1n << 64n) - 1n];

function splice(a: Uint8Array, from: number, to: number, insert: Uint8Array = new Uint8Array(0)): Uint8Array {
  const out = new Uint8Array(from + insert.length + a.length - to);
  out.set(a.subarray(0, from), 0);
  out.set(insert, from);
  out.set(a.subarray(to), from + insert.length);
  return out;
}

function check(seed: Seed, bytes: Uint8Array, what: string): void {
  expectTypedOutcome(seed.files, seed.entry, bytes, `${seed.label}: ${what}`, tally);
}

const seedIndex = fc.nat(SEEDS.length - 1);
const fraction = fc.double({ min: 0, max: 1, maxExcluded: true, noNaN: true });
const place = (n: number, f: number): number => Math.floor(f * n);

describe('random damage to valid files', () => {
  it('bytes changed, inserted, deleted and repeated', () => {
    const edit = fc.oneof(
      fc.record({ kind: fc.constant('set' as const), at: fraction, v: fc.integer({ min: 0, max: 255 }) }),
      fc.record({ kind: fc.constant('insert' as const), at: fraction, v: fc.oneof(fc.uint8Array({ minLength: 1, maxLength: 12 }), fc.constantFrom(...[' ', '\n', '-', '9', 'e', '.', '#', '$', '<', '>', '"', '_', '=', '/>', 'nan'].map((t) => enc.encode(t)))) }),
      fc.record({ kind: fc.constant('delete' as const), at: fraction, len: fc.integer({ min: 1, max: 64 }) }),
      fc.record({ kind: fc.constant('repeat' as const), at: fraction, len: fc.integer({ min: 1, max: 64 }) }),
    );
    fc.assert(fc.property(seedIndex, fc.array(edit, { minLength: 1, maxLength: 4 }), (s, edits) => {
      const seed = SEEDS[s]!;
      let b = seed.files.get(seed.entry)!;
      for (const e of edits) {
        const at = place(b.length, e.at);
        if (e.kind === 'set') { b = b.slice(); b[at] = e.v; }
        else if (e.kind === 'insert') b = splice(b, at, at, e.v);
        else if (e.kind === 'delete') b = splice(b, at, Math.min(b.length, at + e.len));
        else b = splice(b, at, at, b.slice(at, at + e.len));
      }
      check(seed, b, JSON.stringify(edits));
    }), runs(1500, 7001));
  });

  it('numbers replaced by lies: counts, sizes and ids in text, words in binary', () => {
    const lie = fc.oneof(
      fc.record({ kind: fc.constant('text' as const), run: fraction, v: fc.constantFrom(...LIES) }),
      fc.record({ kind: fc.constant('word' as const), at: fraction, v: fc.constantFrom(...WORDS), wide: fc.boolean(), le: fc.boolean() }),
    );
    fc.assert(fc.property(seedIndex, fc.array(lie, { minLength: 1, maxLength: 3 }), (s, lies) => {
      const seed = SEEDS[s]!;
      let b = seed.files.get(seed.entry)!;
      for (const l of lies) {
        if (l.kind === 'text') {
          const runs = RUNS[s]!;
          if (runs.length === 0 || b.length !== seed.files.get(seed.entry)!.length) continue;
          const [from, to] = runs[place(runs.length, l.run)]!;
          b = splice(b, from, to, enc.encode(l.v));
        } else {
          const width = l.wide ? 8 : 4;
          if (b.length < width) continue;
          const at = place(b.length - width + 1, l.at);
          b = b.slice();
          const dv = new DataView(b.buffer);
          if (width === 8) dv.setBigUint64(at, l.v & ((1n << 64n) - 1n), l.le);
          else dv.setUint32(at, Number(l.v & 0xffffffffn), l.le);
        }
      }
      check(seed, b, JSON.stringify(lies, (_k, v: unknown) => (typeof v === 'bigint' ? String(v) : v)));
    }), runs(1500, 7002));
  });

  it('cut at every kind of boundary: headers, tags, lines, arrays, blocks, base64 groups', () => {
    fc.assert(fc.property(seedIndex, fraction, fc.integer({ min: -3, max: 3 }), (s, f, delta) => {
      const seed = SEEDS[s]!;
      const b = seed.files.get(seed.entry)!;
      const bounds = BOUNDS[s]!;
      const cut = Math.max(0, Math.min(b.length, bounds[place(bounds.length, f)]! + delta));
      check(seed, b.subarray(0, cut), `cut at ${cut} of ${b.length}`);
    }), runs(1500, 7003));
  });

  it('two valid files spliced, of the same format or of two formats', () => {
    fc.assert(fc.property(seedIndex, seedIndex, fraction, fraction, (s, t, f, g) => {
      const seed = SEEDS[s]!;
      const a = seed.files.get(seed.entry)!;
      const other = SEEDS[t]!.files.get(SEEDS[t]!.entry)!;
      const i = BOUNDS[s]![place(BOUNDS[s]!.length, f)]!;
      const j = BOUNDS[t]![place(BOUNDS[t]!.length, g)]!;
      check(seed, splice(a, i, a.length, other.subarray(j)), `first ${i} bytes + ${SEEDS[t]!.label} from byte ${j}`);
    }), runs(1000, 7004));
  });

  it('a broken sibling: the .ele or .node beside a good Triangle file', () => {
    const pairs = SEEDS.filter((s) => s.entry.endsWith('.node') || s.entry.endsWith('.ele'));
    fc.assert(fc.property(fc.nat(pairs.length - 1), fraction, fc.integer({ min: 0, max: 255 }), fraction, (p, f, v, cutAt) => {
      const seed = pairs[p]!;
      const sibling = seed.entry.replace(/\.(node|ele)$/, (_m, e: string) => (e === 'node' ? '.ele' : '.node'));
      const bad = seed.files.get(sibling)!.slice(0, Math.max(1, place(seed.files.get(sibling)!.length + 1, cutAt)));
      bad[place(bad.length, f)] = v;
      const files = new Map(seed.files).set(sibling, bad);
      expectTypedOutcome(files, seed.entry, files.get(seed.entry)!, `${seed.label}: sibling ${sibling} broken`, tally);
    }), runs(300, 7005));
  });
});
