/**
 * VTK XML reader: UnstructuredGrid (.vtu) and PolyData (.vtp, polygons only), every encoding.
 * Only the XML head is decoded as text; array bodies are read as bytes.
 */
import { assembleMesh, keepSurfaceCells, planarPoints } from '../cells.js';
import { MeshInputError } from '../errors.js';
import type { Mesh } from '../model.js';
import { isSpace } from '../scan.js';
import { arrayInfo, attrInt, readField, type AppendedAccess, type ArrayContext, type Inflate } from './arrays.js';
import { mergePieces } from './merge.js';
import { readPolyPiece, readUnstructuredPiece } from './piece.js';
import { PARALLEL_KINDS, readPartitioned } from './pvtu.js';
import { childNamed, childrenNamed, parseXmlHead, type XmlElement } from './xml.js';

export interface VtkXmlOptions {
  /** Loads the pieces of a partitioned file (.pvtu) by path, or null when one is missing. */
  loadSibling?: (name: string) => Uint8Array | null;
  /** Reads raw appended arrays in place; `bytes` is then only the file's XML head. */
  appended?: AppendedAccess;
  /** A faster zlib than the built-in one, where the platform has it. */
  inflate?: Inflate;
}

const TIME_NAMES = ['TimeValue', 'TIME'];

function fileContext(bytes: Uint8Array, file: string, root: XmlElement, appended: XmlElement | null, options: VtkXmlOptions): ArrayContext {
  const at = { file, byteOffset: root.start };
  const order = root.attrs.get('byte_order') ?? 'LittleEndian';
  if (order !== 'LittleEndian' && order !== 'BigEndian') throw new MeshInputError(`unknown byte_order "${order}"`, at);
  const header = root.attrs.get('header_type') ?? 'UInt32';
  if (header !== 'UInt32' && header !== 'UInt64') throw new MeshInputError(`unsupported header_type "${header}" (UInt32 or UInt64)`, at);
  const compressor = root.attrs.get('compressor')?.trim() || null;
  let appendedStart = -1;
  let appendedEncoding: 'raw' | 'base64' = 'raw';
  if (appended) {
    const enc = appended.attrs.get('encoding') ?? 'raw';
    if (enc !== 'raw' && enc !== 'base64') throw new MeshInputError(`unknown AppendedData encoding "${enc}"`, { file, byteOffset: appended.start });
    appendedEncoding = enc;
    let p = appended.textStart;
    while (p < bytes.length && isSpace(bytes[p]!)) p++;
    if (bytes[p] !== 95 /* _ */) throw new MeshInputError("AppendedData does not start with the '_' marker", { file, byteOffset: p });
    appendedStart = p + 1;
  }
  const ctx: ArrayContext = { bytes, file, bigEndian: order === 'BigEndian', header64: header === 'UInt64', compressor, appendedStart, appendedEncoding };
  if (options.appended) ctx.appended = options.appended;
  if (options.inflate) ctx.inflate = options.inflate;
  return ctx;
}

function readTime(ctx: ArrayContext, dataset: XmlElement, warnings: string[]): number | undefined {
  const fd = childNamed(dataset, 'FieldData');
  if (!fd) return undefined;
  for (const el of childrenNamed(fd, 'DataArray')) {
    if (!TIME_NAMES.includes(el.attrs.get('Name') ?? '')) continue;
    const info = arrayInfo(ctx, el);
    if (info === null) continue;
    const expect = attrInt(ctx, el, 'NumberOfTuples', 1) * info.components;
    const values = readField(ctx, info, expect);
    if (values.length === 0) continue;
    const t = values[0]!;
    if (Number.isFinite(t)) return t;
    warnings.push(`the time value ${t} is not finite and was ignored`);
  }
  return undefined;
}

export function readVtkXml(bytes: Uint8Array, file: string, options: VtkXmlOptions = {}): Mesh {
  if (bytes.length === 0) throw new MeshInputError('the file is empty', { file, byteOffset: 0 });
  const { root, appended } = parseXmlHead(bytes, file);
  if (root.name !== 'VTKFile') throw new MeshInputError(`not a VTK XML file: the root element is <${root.name}>`, { file, byteOffset: root.start });
  const kind = root.attrs.get('type') ?? '';
  if (PARALLEL_KINDS[kind] !== undefined) {
    return readPartitioned(root, file, options.loadSibling, (b, name) => readVtkXml(b, name, options.inflate ? { inflate: options.inflate } : {}));
  }
  if (kind !== 'UnstructuredGrid' && kind !== 'PolyData') {
    throw new MeshInputError(`VTK XML type "${kind}" is not read; UnstructuredGrid (.vtu), PolyData (.vtp) or their partitioned forms (.pvtu, .pvtp) expected`, { file, byteOffset: root.start });
  }
  const ctx = fileContext(bytes, file, root, appended, options);
  const dataset = childNamed(root, kind);
  if (!dataset) throw new MeshInputError(`the file has no <${kind}> element`, { file, byteOffset: root.start });
  const pieceEls = childrenNamed(dataset, 'Piece');
  if (pieceEls.length === 0) throw new MeshInputError(`<${kind}> has no Piece`, { file, byteOffset: dataset.start });
  const warnings: string[] = [];
  const pieces = pieceEls.map((el) => (kind === 'PolyData' ? readPolyPiece(ctx, el) : readUnstructuredPiece(ctx, el)));
  const piece = mergePieces(pieces, warnings);
  const points = planarPoints(piece.coords, piece.nPoints, piece.dim, warnings, piece.pointsLoc);
  const connLoc = piece.connLoc;
  const cells = keepSurfaceCells({ types: piece.types, offsets: piece.starts, connectivity: piece.conn }, piece.nPoints, piece.typesLoc, () => connLoc);
  const time = readTime(ctx, dataset, warnings);
  const encoding = piece.encoding ?? 'ascii';
  const zlib = ctx.compressor !== null && encoding !== 'ascii' ? '-zlib' : '';
  return assembleMesh({
    points,
    cells,
    pointData: piece.pointData,
    cellData: piece.cellData,
    format: `${kind === 'PolyData' ? 'vtp' : 'vtu'}/${encoding}${zlib}`,
    warnings,
    ...(time !== undefined ? { time } : {}),
  });
}
