import { describe, expect, it } from 'vitest';
import { MeshInputError } from '../../../src/mesh/errors.js';
import { childNamed, parseXmlHead } from '../../../src/mesh/vtkxml/xml.js';

const bytes = (s: string): Uint8Array => new TextEncoder().encode(s);
const slice = (b: Uint8Array, s: number, e: number): string => new TextDecoder().decode(b.subarray(s, e));

describe('XML head scanner', () => {
  it('reads attributes in either quotes, with entities, spaces and ">" inside values', () => {
    const b = bytes(`<?xml version="1.0"?>\n<!-- a > comment -->\n<A x = "1 &lt; 2" y='a>b' z="&#233;t&#xE9;"><B/><C k="v">text</C></A>`);
    const { root, appended } = parseXmlHead(b, 'x.vtu');
    expect(appended).toBeNull();
    expect(root.name).toBe('A');
    expect(Object.fromEntries(root.attrs)).toEqual({ x: '1 < 2', y: 'a>b', z: 'été' });
    expect(root.children.map((c) => c.name)).toEqual(['B', 'C']);
    const c = childNamed(root, 'C')!;
    expect(slice(b, c.textStart, c.textEnd)).toBe('text');
  });

  it("takes an element's first non-blank text, after any child elements", () => {
    const b = bytes('<D>\n  <Info><Value>9</Value></Info>\n  1 2 3\n</D>');
    const { root } = parseXmlHead(b, 'x.vtu');
    expect(slice(b, root.textStart, root.textEnd).trim()).toBe('1 2 3');
  });

  it('stops at AppendedData, whose bytes are not XML', () => {
    const b = bytes('<F><G/><AppendedData encoding="raw">\n_\u0001<</>>\u00ff');
    const { root, appended } = parseXmlHead(b, 'x.vtu');
    expect(root.children.map((c) => c.name)).toEqual(['G', 'AppendedData']);
    expect(appended!.attrs.get('encoding')).toBe('raw');
    expect(b[appended!.textStart + 1]).toBe(95);
  });

  it('locates structural errors', () => {
    const cases: Array<[string, RegExp]> = [
      ['<A><B></A>', /x\.vtu: byte 6: malformed XML: <\/A> does not close <B>/],
      ['<A><B>', /x\.vtu: byte 6: unexpected end of file: <B> is not closed/],
      ['<A x="1>', /byte 0: unexpected end of file inside an XML tag/],
      ['<A x=1></A>', /attribute x of <A> is not quoted/],
      ['<A/><B/>', /a second root element <B>/],
      ['  ', /no XML element found/],
      ['<A><!-- open', /inside an XML comment/],
    ];
    for (const [src, msg] of cases) {
      expect(() => parseXmlHead(bytes(src), 'x.vtu'), src).toThrow(MeshInputError);
      expect(() => parseXmlHead(bytes(src), 'x.vtu'), src).toThrow(msg);
    }
  });
});
