/**
 * Partitioned VTK XML (.pvtu, .pvtp): a small XML file that names its pieces, each an ordinary
 * .vtu (.vtp) file, with <Piece Source="…"/>. The pieces are joined in order: points
 * concatenated (points shared by two partitions stay duplicated: cells are what counts), cells
 * in piece order then file order, point and cell arrays joined by name. Each cell's piece is
 * kept as the cell array PIECE_ARRAY.
 */
import { MeshInputError } from '../errors.js';
import { findArray, type Mesh } from '../model.js';
import { joinArrays } from './merge.js';
import { childNamed, childrenNamed, type XmlElement } from './xml.js';

/** Cell array holding the 0-based index of each cell's piece, in the order of the .pvtu. */
export const PIECE_ARRAY = 'piece';
/** Its name when the pieces already carry an array called PIECE_ARRAY. */
export const PIECE_ARRAY_ALT = 'pvtu_piece';

export const PARALLEL_KINDS: Record<string, string> = { PUnstructuredGrid: 'UnstructuredGrid', PPolyData: 'PolyData' };

export interface PieceSource {
  /** The Source attribute as written. */
  source: string;
  /** The path to load: Source relative to the folder of the .pvtu (absolute paths kept). */
  path: string;
  /** Byte offset of the <Piece> element in the .pvtu, for messages. */
  at: number;
}

export interface PieceSpan {
  path: string;
  firstCell: number;
  nCells: number;
}

function folderOf(file: string): string {
  const cut = Math.max(file.lastIndexOf('/'), file.lastIndexOf('\\'));
  return cut < 0 ? '' : file.slice(0, cut + 1);
}

function isAbsolute(p: string): boolean {
  return p.startsWith('/') || p.startsWith('\\') || /^[A-Za-z]:[\\/]/.test(p);
}

/** The pieces a parallel file names, in order. `root` is its parsed <VTKFile>. */
export function pieceSources(root: XmlElement, file: string): { kind: string; pieces: PieceSource[] } {
  const pkind = root.attrs.get('type') ?? '';
  const kind = PARALLEL_KINDS[pkind];
  if (kind === undefined) throw new MeshInputError(`"${pkind}" is not a partitioned VTK XML type`, { file, byteOffset: root.start });
  const dataset = childNamed(root, pkind);
  if (!dataset) throw new MeshInputError(`the file has no <${pkind}> element`, { file, byteOffset: root.start });
  const els = childrenNamed(dataset, 'Piece');
  if (els.length === 0) throw new MeshInputError(`<${pkind}> names no Piece`, { file, byteOffset: dataset.start });
  const dir = folderOf(file);
  const pieces = els.map((el) => {
    const source = (el.attrs.get('Source') ?? '').trim();
    if (source === '') throw new MeshInputError('a <Piece> has no Source attribute', { file, byteOffset: el.start });
    return { source, path: isAbsolute(source) ? source : dir + source, at: el.start };
  });
  return { kind, pieces };
}

/** Read every piece through `loadSibling` and `readPiece`, in order, and join them. */
export function readPartitioned(
  root: XmlElement,
  file: string,
  loadSibling: ((name: string) => Uint8Array | null) | undefined,
  readPiece: (bytes: Uint8Array, name: string) => Mesh,
): Mesh {
  const { kind, pieces } = pieceSources(root, file);
  if (!loadSibling) throw new MeshInputError(`a partitioned file: its ${pieces.length} pieces can only be read from files`, { file, byteOffset: root.start });
  const meshes = pieces.map((p) => {
    const bytes = loadSibling(p.path);
    if (!bytes) throw missingPiece(p, file);
    return readPiece(bytes, p.path);
  });
  return joinPieces(meshes, pieces, kind, file).mesh;
}

export function missingPiece(p: PieceSource, file: string): MeshInputError {
  return new MeshInputError(`piece "${p.source}" was not found (looked for ${p.path})`, { file, byteOffset: p.at });
}

function expectKind(mesh: Mesh, kind: string, p: PieceSource, file: string): void {
  const want = kind === 'PolyData' ? 'vtp/' : 'vtu/';
  if (!mesh.format.startsWith(want)) {
    throw new MeshInputError(`piece "${p.source}" is ${mesh.format}, not ${kind === 'PolyData' ? 'VTK XML PolyData' : 'a VTK XML UnstructuredGrid'}`, { file, byteOffset: p.at });
  }
}

/**
 * One mesh from the pieces' meshes (already read, in .pvtu order), with the cell array of piece
 * indices and the cell span of each piece.
 */
export function joinPieces(meshes: Mesh[], pieces: PieceSource[], kind: string, file: string): { mesh: Mesh; spans: PieceSpan[] } {
  let nPoints = 0, nCells = 0, nNodes = 0;
  meshes.forEach((m, k) => {
    expectKind(m, kind, pieces[k]!, file);
    nPoints += m.nPoints;
    nCells += m.nCells;
    nNodes += m.cellOffsets[m.nCells]!;
  });
  if (nNodes > 0x7fffffff) throw new MeshInputError(`the pieces hold ${nNodes} cell nodes, more than one mesh can index`, { file });
  const points = new Float64Array(2 * nPoints);
  const cellNodes = new Int32Array(nNodes);
  const cellOffsets = new Int32Array(nCells + 1);
  const cellTypes = new Uint8Array(nCells);
  const piece = new Float64Array(nCells);
  const spans: PieceSpan[] = [];
  const warnings: string[] = [];
  let pointBase = 0, cellBase = 0, nodeBase = 0;
  meshes.forEach((m, k) => {
    points.set(m.points.subarray(0, 2 * m.nPoints), 2 * pointBase);
    const used = m.cellOffsets[m.nCells]!;
    const src = m.cellNodes;
    for (let i = 0; i < used; i++) cellNodes[nodeBase + i] = src[i]! + pointBase;
    const off = m.cellOffsets;
    for (let i = 1; i <= m.nCells; i++) cellOffsets[cellBase + i] = off[i]! + nodeBase;
    cellTypes.set(m.cellTypes.subarray(0, m.nCells), cellBase);
    piece.fill(k, cellBase, cellBase + m.nCells);
    spans.push({ path: pieces[k]!.path, firstCell: cellBase, nCells: m.nCells });
    for (const w of m.warnings) warnings.push(`${pieces[k]!.source}: ${w}`);
    pointBase += m.nPoints;
    cellBase += m.nCells;
    nodeBase += used;
  });
  const cellData = joinArrays(meshes.map((m) => m.cellData), 'cell', warnings);
  const pieceName = findArray(cellData, PIECE_ARRAY) ? PIECE_ARRAY_ALT : PIECE_ARRAY;
  cellData.push({ name: pieceName, components: 1, values: piece });
  const first = meshes[0]!;
  const mesh: Mesh = {
    points, nPoints, cellOffsets, cellNodes, cellTypes, nCells,
    pointData: joinArrays(meshes.map((m) => m.pointData), 'point', warnings),
    cellData,
    format: `p${first.format}`,
    warnings,
  };
  const time = meshes.find((m) => m.time !== undefined)?.time;
  if (time !== undefined) mesh.time = time;
  return { mesh, spans };
}

/** The piece holding `cell` of a joined mesh (from its piece array), or null when it has none. */
export function pieceOfCell(mesh: Mesh, cell: number): number | null {
  const a = findArray(mesh.cellData, PIECE_ARRAY_ALT) ?? findArray(mesh.cellData, PIECE_ARRAY);
  if (!a || a.components !== 1 || !(cell >= 0 && cell < a.values.length)) return null;
  return a.values[cell]!;
}
