/**
 * $NodeData and $ElementData (same layout in 2.2 and 4.1): an ASCII header of string tags
 * (the name first), real tags (the time first) and integer tags (time step, components,
 * entries, partition), then one record per entry: tag and values (binary: int32 + doubles).
 *
 * Blocks are kept per name until the mesh is known: a later time step replaces an earlier
 * one, blocks of the same step (one per partition) are merged. Arrays are float64.
 */
import type { DataArray } from '../model.js';
import type { Scanner } from '../scan.js';
import type { Source } from './source.js';
import type { TagMap } from './tagmap.js';

const utf8 = new TextDecoder('utf-8');

/** Values per point (or per cell) that all the arrays together may hold. */
const MAX_VALUES_PER_ENTITY = 64;

export interface FieldBlock {
  name: string;
  step: number;
  time: number | undefined;
  components: number;
  count: number;
  tags: Float64Array;
  values: Float64Array;
  /** Where the section starts (for messages). */
  at: number;
}

/** A string tag: quoted (Gmsh writes "name") or, unquoted, the rest of the line. */
function stringTag(sc: Scanner): string {
  sc.skipSpace();
  const b = sc.bytes;
  if (sc.pos < sc.end && b[sc.pos] === 34) {
    const s = sc.pos + 1;
    let p = s;
    while (p < sc.end && b[p] !== 34 && b[p] !== 10) p++;
    if (p >= sc.end || b[p] !== 34) throw sc.error('a string tag has no closing quote', s - 1);
    sc.pos = p + 1;
    return utf8.decode(b.subarray(s, p));
  }
  if (sc.pos >= sc.end) throw sc.error('unexpected end of file: expected a string tag');
  return sc.line();
}

export function readFieldBlock(src: Source, section: string, sectionAt: number): FieldBlock {
  const sc = src.sc;
  const nStrings = sc.int('the number of string tags', 0, 1000);
  let name = '';
  for (let i = 0; i < nStrings; i++) {
    const s = stringTag(sc);
    if (i === 0) name = s;
  }
  const nReals = sc.int('the number of real tags', 0, 1000);
  let time: number | undefined;
  for (let i = 0; i < nReals; i++) {
    const v = sc.number('a real tag');
    if (i === 0) time = v;
  }
  const at = (sc.skipSpace(), sc.pos);
  const nInts = sc.int('the number of integer tags', 0, 1000);
  if (nInts < 3) throw sc.error(`${section} needs at least 3 integer tags (time step, components, entries), found ${nInts}`, at);
  const step = sc.int('the time step');
  const components = sc.int('the number of components', 1, MAX_VALUES_PER_ENTITY);
  const count = sc.int('the number of entries', 0);
  for (let i = 3; i < nInts; i++) sc.int('an integer tag');
  if (src.binary) sc.skipLine();
  src.need(count, 1, 0, components, section);
  const tags = new Float64Array(count);
  const values = new Float64Array(count * components);
  for (let i = 0; i < count; i++) {
    tags[i] = src.int('a tag');
    for (let c = 0; c < components; c++) values[i * components + c] = src.f64('a value');
  }
  if (name === '') name = section === '$NodeData' ? 'node data' : 'element data';
  return { name, step, time, components, count, tags, values, at: sectionAt };
}

/** The blocks of one name that are kept: those of its last time step (one per partition). */
export interface FieldGroup {
  name: string;
  step: number;
  components: number;
  parts: FieldBlock[];
}

export class FieldCollector {
  readonly node = new Map<string, FieldGroup>();
  readonly element = new Map<string, FieldGroup>();
  /** Time of the last block that gave one. */
  time: number | undefined;

  add(kind: 'node' | 'element', block: FieldBlock, sc: Scanner): void {
    if (block.time !== undefined) this.time = block.time;
    const byName = kind === 'node' ? this.node : this.element;
    const old = byName.get(block.name);
    if (old && old.step === block.step && old.components === block.components) {
      old.parts.push(block);
      return;
    }
    byName.set(block.name, { name: block.name, step: block.step, components: block.components, parts: [block] });
    let total = 0;
    for (const g of byName.values()) total += g.components;
    if (total > MAX_VALUES_PER_ENTITY) {
      throw sc.error(`the ${kind} data arrays hold ${total} values per ${kind}, more than the ${MAX_VALUES_PER_ENTITY} supported`, block.at);
    }
  }
}

/**
 * Spread a group onto `n` points or cells through `map` (tag → index). Tags found in
 * `dropped` (points and lines) are ignored; other unknown tags are an error. Entries not given
 * are 0, with a warning.
 */
export function spreadGroup(
  group: FieldGroup,
  n: number,
  map: TagMap,
  dropped: TagMap | null,
  what: 'node' | 'element',
  warnings: string[],
  sc: Scanner,
): DataArray {
  const m = group.components;
  const out = new Float64Array(n * m);
  const seen = new Uint8Array(n);
  let filled = 0;
  for (const { tags, values, count, at } of group.parts) {
    for (let i = 0; i < count; i++) {
      const t = tags[i]!;
      const j = map.get(t);
      if (j < 0) {
        if (dropped !== null && dropped.get(t) >= 0) continue;
        throw sc.error(`data "${group.name}" refers to ${what} tag ${t}, which is not in $${what === 'node' ? 'Nodes' : 'Elements'}`, at);
      }
      if (seen[j] === 0) {
        seen[j] = 1;
        filled++;
      }
      for (let c = 0; c < m; c++) out[j * m + c] = values[i * m + c]!;
    }
  }
  if (filled < n) {
    const where = what === 'node' ? 'points' : 'triangles and quads';
    warnings.push(`array "${group.name}" is given for ${filled} of the ${n} ${where}; the others are set to 0`);
  }
  return { name: group.name, components: m, values: out };
}
