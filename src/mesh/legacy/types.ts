/**
 * Value types of legacy VTK arrays and their sizes in binary files.
 */

/** `bit` arrays are packed 8 values a byte; `string` arrays have no fixed size. */
export type ValueKind = 'int' | 'uint' | 'float' | 'bit' | 'string';

export interface ValueType {
  /** The name as written in the file (for messages). */
  readonly name: string;
  /** Bytes per value in binary files (0 for bit and string). */
  readonly size: number;
  readonly kind: ValueKind;
}

function t(size: number, kind: ValueKind): { size: number; kind: ValueKind } {
  return { size, kind };
}

// `long` is taken as 8 bytes, the size written by 64-bit Linux and macOS builds (from memory);
// `vtkIdType` arrays are written as 4-byte ints in binary legacy files (from memory).
const TYPES: Record<string, { size: number; kind: ValueKind }> = {
  bit: t(0, 'bit'),
  char: t(1, 'int'), signed_char: t(1, 'int'), unsigned_char: t(1, 'uint'),
  short: t(2, 'int'), unsigned_short: t(2, 'uint'),
  int: t(4, 'int'), unsigned_int: t(4, 'uint'),
  long: t(8, 'int'), unsigned_long: t(8, 'uint'),
  vtkidtype: t(4, 'int'),
  vtktypeint8: t(1, 'int'), vtktypeuint8: t(1, 'uint'),
  vtktypeint16: t(2, 'int'), vtktypeuint16: t(2, 'uint'),
  vtktypeint32: t(4, 'int'), vtktypeuint32: t(4, 'uint'),
  vtktypeint64: t(8, 'int'), vtktypeuint64: t(8, 'uint'),
  float: t(4, 'float'), double: t(8, 'float'),
  vtktypefloat32: t(4, 'float'), vtktypefloat64: t(8, 'float'),
  string: t(0, 'string'), utf8_string: t(0, 'string'),
};

/** The type named `name` (case-insensitive), or undefined. */
export function valueType(name: string): ValueType | undefined {
  const key = name.toLowerCase();
  if (!Object.prototype.hasOwnProperty.call(TYPES, key)) return undefined;
  const e = TYPES[key]!;
  return { name, size: e.size, kind: e.kind };
}

/** The 4-byte signed integer type (binary CELLS and CELL_TYPES are always written with it). */
export const INT32: ValueType = { name: 'int', size: 4, kind: 'int' };
/** Colours in COLOR_SCALARS and LOOKUP_TABLE sections are bytes in binary files. */
export const UINT8: ValueType = { name: 'unsigned_char', size: 1, kind: 'uint' };
/** ASCII colours are written as floats in [0, 1]. */
export const FLOAT: ValueType = { name: 'float', size: 4, kind: 'float' };
