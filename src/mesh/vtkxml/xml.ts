/**
 * A small purpose-built XML scanner for VTK XML files. It works on the bytes: only tags are
 * decoded to strings, element text (array bodies) stays a byte range. Scanning stops at
 * `<AppendedData`, whose content is raw bytes and not XML.
 */
import { MeshInputError } from '../errors.js';

export interface XmlElement {
  name: string;
  attrs: Map<string, string>;
  children: XmlElement[];
  /** Byte offset of the element's '<'. */
  start: number;
  /** Byte range of the element's first non-blank text (empty when it has none). */
  textStart: number;
  textEnd: number;
}

export interface XmlHead {
  root: XmlElement;
  /** The AppendedData element, if the scan reached one. */
  appended: XmlElement | null;
}

const LT = 60;
const GT = 62;
const SLASH = 47;

const utf8 = new TextDecoder('utf-8');

function indexOfSeq(bytes: Uint8Array, seq: string, from: number): number {
  const first = seq.charCodeAt(0);
  let p = from;
  for (;;) {
    p = bytes.indexOf(first, p);
    if (p < 0 || p + seq.length > bytes.length) return -1;
    let k = 1;
    while (k < seq.length && bytes[p + k] === seq.charCodeAt(k)) k++;
    if (k === seq.length) return p;
    p++;
  }
}

function isBlank(b: Uint8Array, start: number, end: number): boolean {
  for (let p = start; p < end; p++) {
    const c = b[p]!;
    if (c !== 32 && c !== 10 && c !== 13 && c !== 9) return false;
  }
  return true;
}

/** End ('>') of the tag opened at `lt`, skipping quoted attribute values. */
function tagEnd(bytes: Uint8Array, lt: number, file: string): number {
  let quote = 0;
  for (let p = lt + 1; p < bytes.length; p++) {
    const c = bytes[p]!;
    if (quote !== 0) {
      if (c === quote) quote = 0;
    } else if (c === 34 || c === 39) {
      quote = c;
    } else if (c === GT) {
      return p;
    } else if (c === LT) {
      throw new MeshInputError('malformed XML: "<" inside a tag', { file, byteOffset: p });
    }
  }
  throw new MeshInputError('unexpected end of file inside an XML tag', { file, byteOffset: lt });
}

/** Attribute text with entities replaced; a character reference beyond U+10FFFF is malformed (at: the tag). */
function unescapeXml(s: string, file: string, at: number): string {
  if (s.indexOf('&') < 0) return s;
  return s.replace(/&(lt|gt|amp|quot|apos|#x[0-9a-fA-F]+|#[0-9]+);/g, (_m, e: string) => {
    switch (e) {
      case 'lt': return '<';
      case 'gt': return '>';
      case 'amp': return '&';
      case 'quot': return '"';
      case 'apos': return "'";
      default: {
        const code = e[1] === 'x' ? parseInt(e.slice(2), 16) : parseInt(e.slice(1), 10);
        if (!(code <= 0x10ffff)) throw new MeshInputError(`malformed XML: &${e.length > 12 ? e.slice(0, 12) + '…' : e}; is not a Unicode character`, { file, byteOffset: at });
        return String.fromCodePoint(code);
      }
    }
  });
}

function isNameEnd(ch: string): boolean {
  return ch === ' ' || ch === '\t' || ch === '\n' || ch === '\r' || ch === '=' || ch === '/';
}

/** Parse `Name a="1" b='2'` (the tag without '<', '>' and a trailing '/'). */
function parseTag(text: string, file: string, at: number): { name: string; attrs: Map<string, string> } {
  const n = text.length;
  let i = 0;
  while (i < n && !isNameEnd(text[i]!)) i++;
  const name = text.slice(0, i);
  if (name.length === 0) throw new MeshInputError('malformed XML: a tag without a name', { file, byteOffset: at });
  const attrs = new Map<string, string>();
  for (;;) {
    while (i < n && text.charCodeAt(i) <= 32) i++;
    if (i >= n) break;
    const s = i;
    while (i < n && !isNameEnd(text[i]!)) i++;
    const key = text.slice(s, i);
    while (i < n && text.charCodeAt(i) <= 32) i++;
    if (key.length === 0 || text[i] !== '=') {
      throw new MeshInputError(`malformed XML attribute in <${name}>`, { file, byteOffset: at });
    }
    i++;
    while (i < n && text.charCodeAt(i) <= 32) i++;
    const q = text[i];
    if (q !== '"' && q !== "'") throw new MeshInputError(`attribute ${key} of <${name}> is not quoted`, { file, byteOffset: at });
    const close = text.indexOf(q, i + 1);
    if (close < 0) throw new MeshInputError(`attribute ${key} of <${name}> is not closed`, { file, byteOffset: at });
    attrs.set(key, unescapeXml(text.slice(i + 1, close), file, at));
    i = close + 1;
  }
  return { name, attrs };
}

/** Scan the XML structure up to (and including the start tag of) AppendedData. */
export function parseXmlHead(bytes: Uint8Array, file: string): XmlHead {
  const stack: XmlElement[] = [];
  let root: XmlElement | null = null;
  let pos = bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf ? 3 : 0;
  for (;;) {
    const lt = bytes.indexOf(LT, pos);
    const segEnd = lt < 0 ? bytes.length : lt;
    const top = stack.length > 0 ? stack[stack.length - 1]! : null;
    // an element's text is its first non-blank run of text (array data may follow child elements)
    if (top && top.textEnd < 0 && !isBlank(bytes, pos, segEnd)) {
      top.textStart = pos;
      top.textEnd = segEnd;
    }
    if (lt < 0) break;
    const next = bytes[lt + 1];
    if (next === 63 /* ? */) {
      const e = indexOfSeq(bytes, '?>', lt + 2);
      if (e < 0) throw new MeshInputError('unexpected end of file inside <?...?>', { file, byteOffset: lt });
      pos = e + 2;
      continue;
    }
    if (next === 33 /* ! */) {
      const close = bytes[lt + 2] === 45 ? '-->' : bytes[lt + 2] === 91 ? ']]>' : '>';
      const e = indexOfSeq(bytes, close, lt + 2);
      if (e < 0) throw new MeshInputError('unexpected end of file inside an XML comment or declaration', { file, byteOffset: lt });
      pos = e + close.length;
      continue;
    }
    const gt = tagEnd(bytes, lt, file);
    if (next === SLASH) {
      const name = utf8.decode(bytes.subarray(lt + 2, gt)).trim();
      const open = stack.pop();
      if (!open || open.name !== name) {
        throw new MeshInputError(`malformed XML: </${name}> does not close ${open ? `<${open.name}>` : 'any element'}`, { file, byteOffset: lt });
      }
      if (open.textEnd < 0) open.textStart = open.textEnd = lt;
      pos = gt + 1;
      continue;
    }
    const selfClosing = bytes[gt - 1] === SLASH;
    const { name, attrs } = parseTag(utf8.decode(bytes.subarray(lt + 1, selfClosing ? gt - 1 : gt)), file, lt);
    const el: XmlElement = { name, attrs, children: [], start: lt, textStart: gt + 1, textEnd: selfClosing ? gt + 1 : -1 };
    if (top) top.children.push(el);
    else if (root === null) root = el;
    else throw new MeshInputError(`malformed XML: a second root element <${name}>`, { file, byteOffset: lt });
    if (name === 'AppendedData') {
      el.textEnd = bytes.length;
      return { root: root!, appended: el };
    }
    if (!selfClosing) stack.push(el);
    pos = gt + 1;
  }
  if (root === null) throw new MeshInputError('no XML element found', { file, byteOffset: 0 });
  if (stack.length > 0) {
    const open = stack[stack.length - 1]!;
    throw new MeshInputError(`unexpected end of file: <${open.name}> is not closed`, { file, byteOffset: bytes.length });
  }
  return { root, appended: null };
}

export function childNamed(el: XmlElement, name: string): XmlElement | undefined {
  for (const c of el.children) if (c.name === name) return c;
  return undefined;
}

export function childrenNamed(el: XmlElement, name: string): XmlElement[] {
  return el.children.filter((c) => c.name === name);
}
