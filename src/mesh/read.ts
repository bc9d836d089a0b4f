/**
 * Format detection from content (the extension is only a hint) and dispatch to the readers.
 */
import { MeshInputError } from './errors.js';
import type { Mesh } from './model.js';
import { readVtkXml, type VtkXmlOptions } from './vtkxml/index.js';
import type { Inflate } from './vtkxml/arrays.js';
import { readVtkLegacy } from './legacy/index.js';
import { readMsh } from './msh/index.js';
import { readTriangle } from './triangle/index.js';

export type FormatId = 'vtk-xml' | 'vtk-legacy' | 'msh' | 'triangle-node' | 'triangle-ele';

export interface ReadOptions {
  /** Loads a file next to the one being read (Triangle's .node/.ele sibling, a .pvtu's pieces), or null if absent. */
  loadSibling?: (name: string) => Uint8Array | null;
  /** A faster zlib inflation than the built-in one (the CLI passes Node's). */
  inflate?: Inflate;
}

function startsWith(bytes: Uint8Array, at: number, text: string): boolean {
  if (at + text.length > bytes.length) return false;
  for (let i = 0; i < text.length; i++) if (bytes[at + i] !== text.charCodeAt(i)) return false;
  return true;
}

function extension(name: string): string {
  const base = name.replace(/^.*[\\/]/, '');
  const dot = base.lastIndexOf('.');
  return dot < 0 ? '' : base.slice(dot + 1).toLowerCase();
}

export function sniffFormat(bytes: Uint8Array, name: string): FormatId {
  let p = 0;
  if (bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf) p = 3; // UTF-8 BOM
  while (p < bytes.length && (bytes[p] === 32 || bytes[p] === 9 || bytes[p] === 10 || bytes[p] === 13)) p++;
  if (startsWith(bytes, p, '<?xml') || startsWith(bytes, p, '<VTKFile') || startsWith(bytes, p, '<!--')) return 'vtk-xml';
  if (startsWith(bytes, p, '# vtk DataFile') || startsWith(bytes, p, '#vtk DataFile')) return 'vtk-legacy';
  if (startsWith(bytes, p, '$MeshFormat') || startsWith(bytes, p, '$NOD')) return 'msh';
  const ext = extension(name);
  if (ext === 'node') return 'triangle-node';
  if (ext === 'ele') return 'triangle-ele';
  if (bytes.length === 0) throw new MeshInputError('the file is empty', { file: name });
  // Triangle files have no magic: a first data line of integers is the best evidence.
  if (p < bytes.length && (bytes[p]! === 35 || (bytes[p]! >= 48 && bytes[p]! <= 57))) {
    throw new MeshInputError('unrecognised format (looks like a Triangle file: name it .node or .ele)', { file: name, byteOffset: 0 });
  }
  throw new MeshInputError('unrecognised format: expected VTK XML (.vtu/.vtp), legacy VTK (.vtk), Gmsh MSH or Triangle .node/.ele', { file: name, byteOffset: 0 });
}

function siblingName(name: string, ext: string): string {
  return name.replace(/\.[^./\\]*$/, '') + '.' + ext;
}

export function readMesh(bytes: Uint8Array, name: string, options: ReadOptions = {}): Mesh {
  if (bytes.length === 0) throw new MeshInputError('the file is empty', { file: name });
  const fmt = sniffFormat(bytes, name);
  switch (fmt) {
    case 'vtk-xml': {
      const xml: VtkXmlOptions = {};
      if (options.loadSibling) xml.loadSibling = options.loadSibling;
      if (options.inflate) xml.inflate = options.inflate;
      return readVtkXml(bytes, name, xml);
    }
    case 'vtk-legacy':
      return readVtkLegacy(bytes, name);
    case 'msh':
      return readMsh(bytes, name);
    case 'triangle-node':
    case 'triangle-ele': {
      const otherExt = fmt === 'triangle-node' ? 'ele' : 'node';
      const other = siblingName(name, otherExt);
      const otherBytes = options.loadSibling ? options.loadSibling(other) : null;
      if (!otherBytes) throw new MeshInputError(`the matching ${other} was not found next to it`, { file: name });
      return fmt === 'triangle-node'
        ? readTriangle(bytes, otherBytes, name, other)
        : readTriangle(otherBytes, bytes, other, name);
    }
  }
}
