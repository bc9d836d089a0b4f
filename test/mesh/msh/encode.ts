/**
 * Small MSH writers for tests only: 2.2 and 4.1, ASCII and binary (either byte order, 4.1 with
 * 4- or 8-byte size_t). Layouts follow the "MSH file format" chapter of the Gmsh reference
 * manual (C. Geuzaine, J.-F. Remacle); binary data records use an int32 tag, as Gmsh writes them.
 */

export interface MshNode {
  tag: number;
  x: number;
  y: number;
  z: number;
}

export interface MshElement {
  tag: number;
  /** MSH element type id. */
  type: number;
  /** Node tags. */
  nodes: number[];
}

export interface MshField {
  kind: 'node' | 'element';
  name: string;
  time?: number;
  step?: number;
  components: number;
  entries: { tag: number; values: number[] }[];
}

export interface MshDoc {
  nodes: MshNode[];
  elements: MshElement[];
  fields?: MshField[];
  /** Add $PhysicalNames, $Periodic and an unknown section, which readers must skip. */
  extras?: boolean;
  /** 4.1: split the nodes into this many entity blocks (default 1); odd blocks are parametric curves. */
  nodeBlocks?: number;
}

export interface MshEncoding {
  version: '2.2' | '4.1';
  binary: boolean;
  bigEndian?: boolean;
  /** 4.1 binary only: bytes per size_t (default 8). */
  sizeT?: 4 | 8;
}

/** Dimension of the few element types the tests use. */
function dimOf(type: number): number {
  if (type === 15) return 0;
  if (type === 1 || type === 8 || type === 26) return 1;
  if (type === 4 || type === 5 || type === 11) return 3;
  return 2;
}

class Writer {
  private chunks: Uint8Array[] = [];
  private readonly enc = new TextEncoder();

  constructor(readonly binary: boolean, readonly le: boolean, readonly sizeT: number) {}

  text(s: string): void {
    this.chunks.push(this.enc.encode(s));
  }

  /** An ASCII line of values, or nothing in binary (use the typed writers). */
  line(...values: number[]): void {
    this.text(values.map((v) => String(v)).join(' ') + '\n');
  }

  private raw(n: number, fill: (dv: DataView) => void): void {
    const b = new Uint8Array(n);
    fill(new DataView(b.buffer));
    this.chunks.push(b);
  }

  /**
   * One ASCII line of values, or binary values: kinds[i] is 'i' int32, 's' size_t or 'd' double
   * (the last kind repeats for the rest).
   */
  values(kinds: string, values: number[]): void {
    if (!this.binary) {
      this.line(...values);
      return;
    }
    for (let i = 0; i < values.length; i++) {
      const k = kinds[Math.min(i, kinds.length - 1)];
      const v = values[i]!;
      if (k === 'i') this.raw(4, (dv) => dv.setInt32(0, v, this.le));
      else if (k === 'd') this.raw(8, (dv) => dv.setFloat64(0, v, this.le));
      else if (this.sizeT === 4) this.raw(4, (dv) => dv.setUint32(0, v, this.le));
      else this.raw(8, (dv) => dv.setBigUint64(0, BigInt(v), this.le));
    }
  }

  /** Close binary data before an $End line. */
  endBinary(): void {
    if (this.binary) this.text('\n');
  }

  bytes(): Uint8Array {
    let n = 0;
    for (const c of this.chunks) n += c.length;
    const out = new Uint8Array(n);
    let p = 0;
    for (const c of this.chunks) {
      out.set(c, p);
      p += c.length;
    }
    return out;
  }
}

function header(w: Writer, version: string): void {
  w.text(`$MeshFormat\n${version} ${w.binary ? 1 : 0} ${version === '2.2' ? 8 : w.sizeT}\n`);
  if (w.binary) {
    w.values('i', [1]);
    w.text('\n');
  }
  w.text('$EndMeshFormat\n');
}

function extras(w: Writer): void {
  w.text('$PhysicalNames\n2\n1 1 "shore line"\n2 2 "harbour water"\n$EndPhysicalNames\n');
  w.text('$Comments\nwritten by the steplens test encoder; $Nodes inside a comment is not a section\n$EndComments\n');
}

function periodic(w: Writer, version: string): void {
  if (version === '2.2' && !w.binary) w.text('$Periodic\n1\n1 3 1\n1\n4 2\n$EndPeriodic\n');
  else if (version === '4.1') {
    w.text('$Periodic\n');
    w.values('siiisss', [1, 1, 3, 1, 0, 1, 4, 2]);
    w.endBinary();
    w.text('$EndPeriodic\n');
  }
}

function fields(w: Writer, list: MshField[]): void {
  for (const f of list) {
    const sec = f.kind === 'node' ? 'NodeData' : 'ElementData';
    w.text(`$${sec}\n1\n"${f.name}"\n`);
    w.text(f.time === undefined ? '0\n' : `1\n${f.time}\n`);
    w.text(`3\n${f.step ?? 0}\n${f.components}\n${f.entries.length}\n`);
    for (const e of f.entries) w.values('id', [e.tag, ...e.values]);
    w.endBinary();
    w.text(`$End${sec}\n`);
  }
}

function encode22(doc: MshDoc, w: Writer): void {
  w.text(`$Nodes\n${doc.nodes.length}\n`);
  for (const n of doc.nodes) w.values('id', [n.tag, n.x, n.y, n.z]);
  w.endBinary();
  w.text('$EndNodes\n');
  w.text(`$Elements\n${doc.elements.length}\n`);
  if (!w.binary) {
    for (const e of doc.elements) w.line(e.tag, e.type, 2, 1, dimOf(e.type) + 1, ...e.nodes);
  } else {
    // blocks of consecutive elements of one type, two tags each (physical, entity)
    let i = 0;
    while (i < doc.elements.length) {
      const type = doc.elements[i]!.type;
      let j = i;
      while (j < doc.elements.length && doc.elements[j]!.type === type) j++;
      w.values('i', [type, j - i, 2]);
      for (let k = i; k < j; k++) w.values('i', [doc.elements[k]!.tag, 1, dimOf(type) + 1, ...doc.elements[k]!.nodes]);
      i = j;
    }
  }
  w.endBinary();
  w.text('$EndElements\n');
}

function entities41(w: Writer): void {
  w.text('$Entities\n');
  w.values('s', [1, 1, 1, 0]);
  w.values('idddsi', [1, 0, 0, 0, 1, 7]);
  w.values('iddddddsisi', [1, 0, 0, 0, 1, 1, 0, 1, 1, 2, 1, -1]);
  w.values('iddddddssi', [1, 0, 0, 0, 1, 1, 0, 0, 1, -1]);
  w.endBinary();
  w.text('$EndEntities\n');
}

function tagRange(tags: number[]): [number, number] {
  return tags.length === 0 ? [0, 0] : [Math.min(...tags), Math.max(...tags)];
}

function encode41(doc: MshDoc, w: Writer): void {
  entities41(w);
  const nodes = doc.nodes;
  const nb = Math.max(1, Math.min(doc.nodeBlocks ?? 1, nodes.length));
  w.text('$Nodes\n');
  w.values('s', [nb, nodes.length, ...tagRange(nodes.map((n) => n.tag))]);
  for (let b = 0; b < nb; b++) {
    const from = Math.floor((b * nodes.length) / nb);
    const to = Math.floor(((b + 1) * nodes.length) / nb);
    const parametric = b % 2 === 1 ? 1 : 0;
    w.values('iiis', [parametric ? 1 : 2, b + 1, parametric, to - from]);
    for (let i = from; i < to; i++) w.values('s', [nodes[i]!.tag]);
    for (let i = from; i < to; i++) w.values('d', parametric ? [nodes[i]!.x, nodes[i]!.y, nodes[i]!.z, 0.5] : [nodes[i]!.x, nodes[i]!.y, nodes[i]!.z]);
  }
  w.endBinary();
  w.text('$EndNodes\n');
  const els = doc.elements;
  const blocks: [number, number][] = [];
  for (let i = 0; i < els.length; ) {
    let j = i;
    while (j < els.length && els[j]!.type === els[i]!.type) j++;
    blocks.push([i, j]);
    i = j;
  }
  w.text('$Elements\n');
  w.values('s', [blocks.length, els.length, ...tagRange(els.map((e) => e.tag))]);
  for (const [i, j] of blocks) {
    const type = els[i]!.type;
    w.values('iiis', [dimOf(type), 1, type, j - i]);
    for (let k = i; k < j; k++) w.values('s', [els[k]!.tag, ...els[k]!.nodes]);
  }
  w.endBinary();
  w.text('$EndElements\n');
}

export function encodeMsh(doc: MshDoc, enc: MshEncoding): Uint8Array {
  const w = new Writer(enc.binary, !enc.bigEndian, enc.version === '4.1' ? (enc.sizeT ?? 8) : 8);
  header(w, enc.version);
  if (doc.extras) extras(w);
  if (enc.version === '2.2') encode22(doc, w);
  else encode41(doc, w);
  if (doc.extras) periodic(w, enc.version);
  fields(w, doc.fields ?? []);
  return w.bytes();
}

/** Every encoding the reader supports. */
export const ALL_ENCODINGS: MshEncoding[] = [
  { version: '2.2', binary: false },
  { version: '2.2', binary: true },
  { version: '2.2', binary: true, bigEndian: true },
  { version: '4.1', binary: false },
  { version: '4.1', binary: true },
  { version: '4.1', binary: true, bigEndian: true },
  { version: '4.1', binary: true, sizeT: 4 },
];

export function encodingName(e: MshEncoding): string {
  return `${e.version} ${e.binary ? 'binary' : 'ascii'}${e.bigEndian ? ' big-endian' : ''}${e.sizeT === 4 ? ' size_t=4' : ''}`;
}
