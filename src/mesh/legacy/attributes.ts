/**
 * Attribute sections after POINT_DATA n / CELL_DATA n, and FIELD blocks. Scalars, vectors,
 * normals and field arrays are kept; tensors, texture coordinates, colours, lookup tables and
 * id arrays are skipped by their known sizes.
 */
import type { DataArray } from '../model.js';
import { shown, type LegacySource } from './source.js';
import { FLOAT, UINT8, type ValueType } from './types.js';

export interface AttributeSet {
  readonly section: 'POINT_DATA' | 'CELL_DATA';
  /** Tuples per array, as declared. */
  readonly count: number;
  /** Byte offset of the POINT_DATA / CELL_DATA keyword. */
  readonly at: number;
  readonly arrays: DataArray[];
}

/** Names may encode special characters as %XX (a space as %20). */
export function decodeName(tok: string): string {
  if (tok.indexOf('%') < 0) return tok;
  return tok.replace(/%([0-9A-Fa-f]{2})/g, (_, h: string) => String.fromCharCode(parseInt(h, 16)));
}

const KEYWORDS = new Set([
  'SCALARS', 'VECTORS', 'NORMALS', 'TENSORS', 'TENSORS6', 'TEXTURE_COORDINATES', 'COLOR_SCALARS',
  'LOOKUP_TABLE', 'GLOBAL_IDS', 'PEDIGREE_IDS', 'EDGE_FLAGS', 'FIELD',
]);

/**
 * Read the attribute section whose keyword `kw` was just read into `set`. Returns false when
 * `kw` is not an attribute keyword (or is FIELD outside POINT_DATA / CELL_DATA).
 */
export function readAttribute(src: LegacySource, kw: string, set: AttributeSet | null, warnings: string[]): boolean {
  if (!KEYWORDS.has(kw) || (kw === 'FIELD' && !set)) return false; // a dataset FIELD block
  if (!set) throw src.fail(`${kw} comes before any POINT_DATA or CELL_DATA line`, src.keywordAt);
  const n = set.count;
  if (kw === 'FIELD') {
    for (const a of readFieldBlock(src, n, set.section, warnings)) set.arrays.push(a);
    return true;
  }
  const name = decodeName(src.need('a name', kw));
  const label = `${kw} ${name}`;
  switch (kw) {
    case 'SCALARS': {
      const t = src.type(label);
      const comps = src.atLineEnd() ? 1 : src.count('the number of components', label);
      src.endLine(label);
      if (src.accept('LOOKUP_TABLE')) {
        src.need('a table name', 'LOOKUP_TABLE');
        src.endLine('LOOKUP_TABLE');
      }
      addArray(src, set.arrays, name, comps, n, t, label, warnings);
      break;
    }
    case 'VECTORS':
    case 'NORMALS': {
      const t = src.type(label);
      src.endLine(label);
      addArray(src, set.arrays, name, 3, n, t, label, warnings);
      break;
    }
    case 'TENSORS':
    case 'TENSORS6':
    case 'GLOBAL_IDS':
    case 'PEDIGREE_IDS':
    case 'EDGE_FLAGS': {
      const t = src.type(label);
      src.endLine(label);
      src.skip(n * (kw === 'TENSORS' ? 9 : kw === 'TENSORS6' ? 6 : 1), t, label);
      break;
    }
    case 'TEXTURE_COORDINATES': {
      const dim = src.count('the dimension', label);
      const t = src.type(label);
      src.endLine(label);
      src.skip(n * dim, t, label);
      break;
    }
    case 'COLOR_SCALARS':
    case 'LOOKUP_TABLE': {
      // COLOR_SCALARS name nValues: nValues per tuple; LOOKUP_TABLE name size: size RGBA entries
      const m = src.count(kw === 'LOOKUP_TABLE' ? 'the table size' : 'the number of values', label);
      src.endLine(label);
      src.skip((kw === 'LOOKUP_TABLE' ? 4 : n) * m, src.binary ? UINT8 : FLOAT, label);
      break;
    }
  }
  return true;
}

/**
 * A FIELD block (the keyword was just read): `FIELD name nArrays`, then per array
 * `name numComp numTuples type` and its values. With `tuples` set, every array must have
 * that many tuples (arrays of POINT_DATA / CELL_DATA); with null any count is taken.
 */
export function readFieldBlock(src: LegacySource, tuples: number | null, owner: string, warnings: string[]): DataArray[] {
  src.need('a name', 'FIELD');
  const nArrays = src.count('the number of arrays', 'FIELD');
  src.endLine('FIELD');
  const out: DataArray[] = [];
  for (let i = 0; i < nArrays; i++) {
    while (src.accept('METADATA')) src.skipMetadata();
    src.sc.skipSpace();
    const at = src.pos;
    if (at >= src.sc.end) throw src.fail(`FIELD: the file ends after ${i} of its ${nArrays} arrays`);
    const tok = src.sc.token();
    if (tok === 'NULL_ARRAY') continue;
    const name = decodeName(tok);
    const label = `FIELD array ${shown(name)}`;
    const comps = src.count('the number of components', label);
    const m = src.count('the number of tuples', label);
    const t = src.type(label);
    src.endLine(label);
    if (tuples !== null && m !== tuples) {
      throw src.fail(`${label} has ${m} tuples but ${owner} declares ${tuples}`, at);
    }
    addArray(src, out, name, comps, m, t, label, warnings);
  }
  return out;
}

function addArray(
  src: LegacySource, out: DataArray[], name: string, comps: number, tuples: number,
  t: ValueType, label: string, warnings: string[],
): void {
  if (comps < 1) throw src.fail(`${label}: the number of components must be at least 1`);
  const n = tuples * comps;
  if (t.kind === 'bit' || t.kind === 'string') {
    src.skip(n, t, label);
    warnings.push(`${label}: ${t.name} values are not read`);
    return;
  }
  out.push({ name, components: comps, values: src.readData(n, t, label) });
}
