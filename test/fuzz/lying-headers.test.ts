/**
 * Every count and size a header states, in every format and encoding, replaced by a lie far
 * beyond what the file holds (2^31, 2^32 + 1, 2^40, 2^53 + 1, and the allocatable but
 * unbacked 5·10^7 and 3·10^8): the read must fail at once (500 ms), with our typed error, and
 * without allocating for the lie.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { expectTypedOutcome, newTally } from './outcome.js';
import { seeds, type Seed } from './seeds.js';

const SEEDS = seeds();
const tally = newTally();
afterAll(() => console.log(`fuzz/lying-headers: ${tally.cases} cases`));

/** Fast enough to rule out work or zero-filled memory sized by the lie, slow enough for a busy machine. */
const FAST_MS = 500;
const LIES = ['2147483648', '4294967297', '1099511627776', '9007199254740993', '50000000', '300000000'];

/** Header numbers by format, as text: [what, pattern whose group 1 is the number]. */
const TEXT_FIELDS: [string, RegExp][] = [
  ['VTU NumberOfPoints', /NumberOfPoints="(\d+)"/],
  ['VTU NumberOfCells', /NumberOfCells="(\d+)"/],
  ['VTU NumberOfComponents', /Name="velocity" NumberOfComponents="(\d+)"/],
  ['VTU NumberOfTuples', /NumberOfTuples="(\d+)"/],
  ['VTU offset', /Name="connectivity"[^>]*offset="(\d+)"/],
  ['legacy POINTS', /\nPOINTS (\d+)/],
  ['legacy cell count', /\n(?:CELLS|POLYGONS) (\d+)/],
  ['legacy cell size', /\n(?:CELLS|POLYGONS) \d+ (\d+)/],
  ['legacy LINES', /\nLINES (\d+)/],
  ['legacy CELL_TYPES', /\nCELL_TYPES (\d+)/],
  ['legacy POINT_DATA', /\nPOINT_DATA (\d+)/],
  ['legacy CELL_DATA', /\nCELL_DATA (\d+)/],
  ['legacy FIELD arrays', /\nFIELD \w+ (\d+)/],
  ['legacy FIELD components', /\nTimeValue (\d+)/],
  ['legacy FIELD tuples', /\nTimeValue \d+ (\d+)/],
  ['legacy SCALARS components', /\nSCALARS \S+ \w+ (\d+)/],
  ['MSH 2.2 nodes', /\$Nodes\n(\d+)\n/],
  ['MSH 2.2 elements', /\$Elements\n(\d+)\n/],
  ['MSH 4.1 node blocks', /\$Nodes\n(\d+) \d+ \d+ \d+\n/],
  ['MSH 4.1 nodes', /\$Nodes\n\d+ (\d+) \d+ \d+\n/],
  ['MSH 4.1 nodes in a block', /\$Nodes\n[^\n]*\n\d+ \d+ \d+ (\d+)\n/],
  ['MSH 4.1 element blocks', /\$Elements\n(\d+) \d+ \d+ \d+\n/],
  ['MSH 4.1 elements', /\$Elements\n\d+ (\d+) \d+ \d+\n/],
  ['MSH 4.1 entities', /\$Entities\n(\d+) /],
  ['MSH data components', /\$NodeData\n1\n"[^"]*"\n(?:0|1\n[^\n]*)\n3\n\d+\n(\d+)\n/],
  ['MSH data entries', /\$NodeData\n1\n"[^"]*"\n(?:0|1\n[^\n]*)\n3\n\d+\n\d+\n(\d+)\n/],
  ['Triangle points', /^(?:[ \t]*(?:#[^\n]*)?\n)*[ \t]*(\d+) 2 /],
  ['Triangle point attributes', /^(?:[ \t]*(?:#[^\n]*)?\n)*[ \t]*\d+ 2 (\d+)/],
  ['Triangle triangles', /^(?:[ \t]*(?:#[^\n]*)?\n)*[ \t]*(\d+) 3 /],
];

const latin1 = new TextDecoder('latin1');

/** `bytes` with group 1 of `m` (a match with indices, flag d) replaced by `lie`. */
function replaceGroup(bytes: Uint8Array, m: RegExpExecArray, lie: string): Uint8Array {
  const start = m.indices![1]![0];
  const lieBytes = new TextEncoder().encode(lie);
  const out = new Uint8Array(bytes.length - m[1]!.length + lieBytes.length);
  out.set(bytes.subarray(0, start), 0);
  out.set(lieBytes, start);
  out.set(bytes.subarray(start + m[1]!.length), start + lieBytes.length);
  return out;
}

/** Byte positions of binary header words: [what, offset, width, little-endian]. */
function binaryFields(seed: Seed, bytes: Uint8Array): [string, number, number, boolean][] {
  const text = latin1.decode(bytes);
  const out: [string, number, number, boolean][] = [];
  const le = !text.includes('byte_order="BigEndian"');
  const app = text.indexOf('_', text.indexOf('<AppendedData encoding="raw"'));
  if (text.includes('<AppendedData encoding="raw"') && app > 0) {
    const hs = text.includes('header_type="UInt64"') ? 8 : 4;
    for (const m of text.matchAll(/Name="(\w+)"[^>]*offset="(\d+)"/g)) {
      // the size header, or the block table: blocks, block size, last block size, first block size
      for (let k = 0; k < 4; k++) out.push([`VTU ${m[1]} header word ${k}`, app + 1 + Number(m[2]) + k * hs, hs, le]);
    }
  }
  if (seed.label.startsWith('msh 4.1') && seed.label.includes('binary')) {
    const sizeT = seed.label.includes('size_t=4') ? 4 : 8;
    const mle = !seed.label.includes('big-endian');
    for (const section of ['$Nodes\n', '$Elements\n', '$Entities\n']) {
      const at = text.indexOf(section) + section.length;
      for (let k = 0; k < 4; k++) out.push([`MSH ${section.trim()} size_t ${k}`, at + k * sizeT, sizeT, mle]);
      // the first block: dimension, entity, type or parametric flag (int), then its count (size_t)
      if (section !== '$Entities\n') out.push([`MSH ${section.trim()} block count`, at + 4 * sizeT + 12, sizeT, mle]);
    }
  }
  if (seed.label.startsWith('msh 2.2') && seed.label.includes('binary')) {
    const at = text.indexOf('\n', text.indexOf('$Elements\n') + 10) + 1;
    for (let k = 0; k < 3; k++) out.push([`MSH 2.2 element block int ${k}`, at + 4 * k, 4, !seed.label.includes('big-endian')]);
  }
  return out;
}

function putWord(bytes: Uint8Array, at: number, width: number, le: boolean, v: bigint): Uint8Array {
  const out = bytes.slice();
  const dv = new DataView(out.buffer);
  if (width === 8) dv.setBigUint64(at, v, le);
  else dv.setUint32(at, Number(v & 0xffffffffn), le);
  return out;
}

const WORD_LIES = [0x7fffffffn, 0xffffffffn, 1n << 40n, (1n << 53n) - 1n, 50000000n, 300000000n];

describe('header counts that lie', () => {
  it('every stated count and size, as text, fails at once', () => {
    const hits = new Map<string, number>();
    for (const seed of SEEDS) {
      const bytes = seed.files.get(seed.entry)!;
      const text = latin1.decode(bytes);
      for (const [what, re] of TEXT_FIELDS) {
        const version = /^MSH (\d\.\d)/.exec(what)?.[1];
        if (version !== undefined && !text.startsWith(`$MeshFormat\n${version} `)) continue;
        const m = new RegExp(re.source, 'd').exec(text);
        if (!m) continue;
        hits.set(what, (hits.get(what) ?? 0) + 1);
        for (const lie of LIES) {
          const err = expectTypedOutcome(seed.files, seed.entry, replaceGroup(bytes, m, lie), `${seed.label}: ${what} = ${lie}`, tally, FAST_MS);
          expect(err, `${seed.label}: ${what} = ${lie} was read`).not.toBeNull();
        }
      }
    }
    // each pattern found its number in at least one seed file
    expect(TEXT_FIELDS.filter(([what]) => !hits.has(what)).map(([what]) => what)).toEqual([]);
  });

  it('every size word of binary headers and block tables fails at once', () => {
    let n = 0;
    for (const seed of SEEDS) {
      const bytes = seed.files.get(seed.entry)!;
      for (const [what, at, width, le] of binaryFields(seed, bytes)) {
        for (const v of WORD_LIES) {
          const label = `${seed.label}: ${what} = ${v}`;
          // a lie may be read when the word is one the reader only checks (e.g. a block size
          // equal to the data); then the mesh must be sound, which expectTypedOutcome checks
          expectTypedOutcome(seed.files, seed.entry, putWord(bytes, at, width, le, v), label, tally, FAST_MS);
          n++;
        }
      }
    }
    expect(n).toBeGreaterThan(1000);
  });
});
