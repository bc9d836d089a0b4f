/**
 * Bad MSH input: every failure is a located MeshInputError with a message saying what is
 * wrong, never a TypeError, RangeError, hang or huge allocation.
 */
import { describe, expect, it } from 'vitest';
import { MeshInputError } from '../../../src/mesh/errors.js';
import { readMsh } from '../../../src/mesh/msh/index.js';
import { ALL_ENCODINGS, encodeMsh, encodingName, type MshDoc } from './encode.js';
import { expectInputError, text } from './helpers.js';

const read = (s: string | Uint8Array) => () => readMsh(typeof s === 'string' ? text(s) : s, 'bad.msh');

const HEAD22 = '$MeshFormat\n2.2 0 8\n$EndMeshFormat\n';
const HEAD41 = '$MeshFormat\n4.1 0 8\n$EndMeshFormat\n';
const NODES22 = '$Nodes\n3\n1 0 0 0\n2 1 0 0\n3 0 1 0\n$EndNodes\n';

const small: MshDoc = {
  nodes: [
    { tag: 10, x: 0, y: 0, z: 0 }, { tag: 3, x: 1, y: 0, z: 0 }, { tag: 7, x: 1, y: 1, z: 0 }, { tag: 1, x: 0, y: 1, z: 0 },
  ],
  elements: [
    { tag: 5, type: 1, nodes: [10, 3] },
    { tag: 9, type: 2, nodes: [10, 3, 7] },
    { tag: 2, type: 2, nodes: [10, 7, 1] },
  ],
  fields: [{ kind: 'node', name: 'velocity', time: 1, components: 3, entries: [{ tag: 7, values: [1, 2, 0] }] }],
  extras: true,
  nodeBlocks: 2,
};

describe('version and header', () => {
  it('rejects versions other than 2.2 and 4.1, naming them', () => {
    for (const v of ['3.0', '1.0', '4.0', '2.1', 'x']) {
      expectInputError(read(`$MeshFormat\n${v} 0 8\n$EndMeshFormat\n`), new RegExp(`version "${v.replace('.', '\\.')}" is not supported`), 'line');
    }
  });

  it('rejects an MSH 1.0 file ($NOD)', () => {
    expectInputError(read('$NOD\n1\n1 0 0 0\n$ENDNOD\n'), /version 1\.0 is not supported/, 'line');
  });

  it('rejects a wrong endianness check value, at its byte offset', () => {
    const head = text('$MeshFormat\n2.2 1 8\n');
    const bytes = new Uint8Array([...head, 2, 0, 0, 0, ...text('\n$EndMeshFormat\n')]);
    const err = expectInputError(read(bytes), /endianness check is 2/, 'byte');
    expect(err.location.byteOffset).toBe(head.length);
  });

  it('rejects a data size it cannot read', () => {
    expectInputError(read('$MeshFormat\n2.2 1 4\n\x01\x00\x00\x00\n$EndMeshFormat\n'), /data size 4/, 'line');
  });

  it('needs $Nodes and $Elements', () => {
    expectInputError(read(HEAD22), /without a \$Nodes section/, 'line');
    expectInputError(read(HEAD22 + NODES22), /without an \$Elements section/, 'line');
  });
});

describe('counts checked before allocating', () => {
  it('fails at once on a huge node count (ASCII 2.2)', () => {
    expectInputError(read(HEAD22 + '$Nodes\n1099511627776\n1 0 0 0\n$EndNodes\n'), /1099511627776 announced/, 'line');
  });

  it('fails at once on a huge element count (ASCII 4.1)', () => {
    const nodes = '$Nodes\n1 1 1 1\n2 1 0 1\n1\n0 0 0\n$EndNodes\n';
    expectInputError(read(HEAD41 + nodes + '$Elements\n1 1099511627776 1 1\n$EndElements\n'), /1099511627776 announced/, 'line');
  });

  it('fails at once on a huge binary 4.1 node count', () => {
    const doc: MshDoc = { nodes: small.nodes, elements: small.elements };
    const bytes = encodeMsh(doc, { version: '4.1', binary: true });
    const at = indexOf(bytes, '$Nodes\n') + 7;
    new DataView(bytes.buffer).setBigUint64(at + 8, 1n << 40n, true);
    expectInputError(read(bytes), /1099511627776 announced/, 'byte');
  });

  it('fails at once on a huge data entry count', () => {
    const data = '$NodeData\n1\n"h"\n0\n3\n0\n1\n1099511627776\n1 0\n$EndNodeData\n';
    expectInputError(read(HEAD22 + NODES22 + data), /1099511627776 announced/, 'line');
  });
});

/** The last non-blank line of a prefix, as latin1 text. */
function lastLine(bytes: Uint8Array): string {
  const s = new TextDecoder('latin1').decode(bytes).trimEnd();
  return s.slice(s.lastIndexOf('\n') + 1);
}

function indexOf(bytes: Uint8Array, s: string): number {
  const t = text(s);
  outer: for (let i = 0; i + t.length <= bytes.length; i++) {
    for (let k = 0; k < t.length; k++) if (bytes[i + k] !== t[k]) continue outer;
    return i;
  }
  return -1;
}

describe('elements', () => {
  it('names an unknown node tag and its element (ASCII, with the line)', () => {
    const err = expectInputError(read(HEAD22 + NODES22 + '$Elements\n1\n8 2 0 1 2 99\n$EndElements\n'), /element 8 uses node tag 99/, 'line');
    expect(err.location.line).toBe(12);
  });

  it('names an unknown node tag in binary files, at the element record', () => {
    for (const enc of ALL_ENCODINGS.filter((e) => e.binary)) {
      const doc: MshDoc = { nodes: small.nodes, elements: [...small.elements, { tag: 4, type: 2, nodes: [10, 3, 42] }] };
      expectInputError(read(encodeMsh(doc, enc)), /element 4 uses node tag 42/, 'byte');
    }
  });

  it('names an unknown MSH element type id', () => {
    expectInputError(read(HEAD22 + NODES22 + '$Elements\n1\n8 999 0 1 2 3\n$EndElements\n'), /unknown MSH element type 999/, 'line');
    for (const enc of ALL_ENCODINGS) {
      const doc: MshDoc = { nodes: small.nodes, elements: [{ tag: 1, type: 777, nodes: [10] }] };
      expectInputError(read(encodeMsh(doc, enc)), /unknown MSH element type 777/, enc.binary ? 'byte' : 'line');
    }
  });

  it('rejects a 3-D mesh, counting its cells by kind', () => {
    const tets = [{ tag: 1, type: 4, nodes: [10, 3, 7, 1] }, { tag: 2, type: 11, nodes: [10, 3, 7, 1, 10, 3, 7, 1, 10, 3] }];
    for (const enc of ALL_ENCODINGS) {
      const bytes = encodeMsh({ nodes: small.nodes, elements: [...small.elements, ...tets] }, enc);
      expectInputError(read(bytes), /2-D meshes only: found 2 tetrahedra$/, enc.binary ? 'byte' : 'line');
    }
    const mixed = [...tets, { tag: 3, type: 5, nodes: [10, 3, 7, 1, 10, 3, 7, 1] }];
    expect(read(encodeMsh({ nodes: small.nodes, elements: mixed }, ALL_ENCODINGS[0]!))).toThrow(/found 2 tetrahedra, 1 hexahedra/);
  });

  it('checks that an element line holds no more than its type\'s nodes', () => {
    expectInputError(read(HEAD22 + NODES22 + '$Elements\n1\n8 2 0 1 2 3 1\n$EndElements\n'), /more values than the 3 nodes/, 'line');
  });
});

describe('nodes', () => {
  it('rejects a duplicated node tag', () => {
    expectInputError(read(HEAD22 + '$Nodes\n2\n4 0 0 0\n4 1 0 0\n$EndNodes\n'), /node tag 4 appears twice/, 'line');
  });

  it('names a non-numeric token and its line', () => {
    const err = expectInputError(read(HEAD22 + '$Nodes\n2\n1 0 0 0\n2 1 abc 0\n$EndNodes\n'), /expected a y coordinate, found "abc"/, 'line');
    expect(err.location.line).toBe(7);
  });

  it('rejects a non-finite coordinate', () => {
    expectInputError(read(HEAD22 + '$Nodes\n1\n1 nan 0 0\n$EndNodes\n'), /non-finite coordinate/, 'line');
  });

  it('reports a missing $EndNodes', () => {
    expectInputError(read(HEAD22 + '$Nodes\n1\n1 0 0 0\n$Elements\n0\n$EndElements\n'), /expected \$EndNodes, found "\$Elements"/, 'line');
  });

  it('reports a node count that disagrees with the lines', () => {
    expectInputError(read(HEAD22 + '$Nodes\n1\n1 0 0 0\n2 1 0 0\n$EndNodes\n'), /expected \$EndNodes, found "2"/, 'line');
  });

  it('rejects 4.1 node blocks that hold more nodes than announced', () => {
    expectInputError(read(HEAD41 + '$Nodes\n1 1 1 2\n2 1 0 2\n1\n2\n0 0 0\n1 0 0\n$EndNodes\n'), /block of 2 nodes, where 1 of the 1 announced remain/, 'line');
  });
});

describe('data sections', () => {
  it('names a node tag the data refers to that is not in $Nodes', () => {
    const data = '$NodeData\n1\n"depth"\n0\n3\n0\n1\n1\n77 1.5\n$EndNodeData\n';
    const elems = '$Elements\n1\n1 2 0 1 2 3\n$EndElements\n';
    expectInputError(read(HEAD22 + NODES22 + elems + data), /"depth" refers to node tag 77/, 'line');
  });

  it('needs the three integer tags', () => {
    const data = '$NodeData\n1\n"depth"\n0\n2\n0\n1\n$EndNodeData\n';
    expectInputError(read(HEAD22 + NODES22 + data), /at least 3 integer tags/, 'line');
  });
});

describe('truncated and corrupted files', () => {
  it('fails with a located MeshInputError at every truncation of every encoding', () => {
    for (const enc of ALL_ENCODINGS) {
      const full = encodeMsh(small, enc);
      for (let n = 0; n < full.length; n++) {
        try {
          readMsh(full.subarray(0, n), 'cut.msh');
        } catch (e) {
          if (!(e instanceof MeshInputError)) throw new Error(`${encodingName(enc)} cut at ${n}: ${String(e)}`);
          const loc = e.location;
          expect(loc.line !== undefined || loc.byteOffset !== undefined, `${encodingName(enc)} cut at ${n}: ${e.message}`).toBe(true);
          continue;
        }
        // a cut can only succeed between whole sections
        expect(lastLine(full.subarray(0, n)), `${encodingName(enc)} cut at ${n} was read`).toMatch(/^\$End[A-Za-z]+$/);
      }
    }
  });

  it('cuts inside each section say where', () => {
    for (const enc of ALL_ENCODINGS) {
      const full = encodeMsh(small, enc);
      for (const section of ['$Entities', '$Nodes', '$Elements', '$NodeData', '$PhysicalNames', '$Periodic']) {
        const at = indexOf(full, section + '\n');
        if (at < 0) continue;
        const err = expectInputError(() => readMsh(full.subarray(0, at + section.length + 4), 'cut.msh'), /./, enc.binary ? 'byte' : 'line');
        expect(err.message).toMatch(/end of file|announced|no \$End|expected|no closing quote/);
      }
    }
  });

  it('survives random byte corruption: a mesh or a MeshInputError, nothing else', () => {
    let seed = 12345;
    const next = () => (seed = (Math.imul(seed, 1103515245) + 12345) >>> 0) / 4294967296;
    for (const enc of ALL_ENCODINGS) {
      const full = encodeMsh(small, enc);
      for (let trial = 0; trial < 150; trial++) {
        const bytes = full.slice();
        const flips = 1 + Math.floor(next() * 4);
        for (let f = 0; f < flips; f++) bytes[Math.floor(next() * bytes.length)] = Math.floor(next() * 256);
        try {
          const m = readMsh(bytes, 'noisy.msh');
          for (const v of m.cellNodes) expect(v >= 0 && v < m.nPoints).toBe(true);
        } catch (e) {
          if (!(e instanceof MeshInputError)) throw new Error(`${encodingName(enc)} trial ${trial}: ${String(e)}`);
        }
      }
    }
  });
});
