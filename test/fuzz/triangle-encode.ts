/**
 * A tiny Triangle .node / .ele writer for the tests. Layout as in J. R. Shewchuk's Triangle
 * documentation (".node files", ".ele files"): a header line, then one numbered record per line;
 * '#' comments and blank lines may stand anywhere.
 */

export interface TriangleDoc {
  /** x, y interleaved. */
  points: readonly number[];
  /** Per attribute, one value per point. */
  pointAttributes: readonly (readonly number[])[];
  /** One integer per point, or null for no marker column. */
  markers: readonly number[] | null;
  /** Three 0-based point indices per triangle. */
  triangles: readonly (readonly number[])[];
  /** Per attribute, one value per triangle. */
  triangleAttributes: readonly (readonly number[])[];
}

export interface TriangleStyle {
  /** Index of the first record (and the offset of node numbers): 0 or 1. */
  base: 0 | 1;
  /** Add comment lines, trailing comments and blank lines. */
  noise: boolean;
}

function lines(header: string, rows: string[], style: TriangleStyle): string {
  if (!style.noise) return [header, ...rows].join('\n') + '\n';
  const out = ['# written by the steplens test encoder', '', `${header}   # header`];
  rows.forEach((r, i) => {
    if (i % 3 === 1) out.push('');
    if (i % 4 === 2) out.push('   # a comment between records');
    out.push(i % 2 === 0 ? `  ${r}\t# row ${i}` : r);
  });
  out.push('', '# end');
  return out.join('\n');
}

export function encodeTriangle(doc: TriangleDoc, style: TriangleStyle): { node: Uint8Array; ele: Uint8Array } {
  const n = doc.points.length / 2;
  const nAttr = doc.pointAttributes.length;
  const nodeRows: string[] = [];
  for (let i = 0; i < n; i++) {
    const values = [i + style.base, doc.points[2 * i]!, doc.points[2 * i + 1]!, ...doc.pointAttributes.map((a) => a[i]!)];
    if (doc.markers) values.push(doc.markers[i]!);
    nodeRows.push(values.map(String).join(' '));
  }
  const nodeHeader = `${n} 2 ${nAttr} ${doc.markers ? 1 : 0}`;
  const m = doc.triangles.length;
  const eleRows = doc.triangles.map((t, i) =>
    [i + style.base, ...t.map((v) => v + style.base), ...doc.triangleAttributes.map((a) => a[i]!)].map(String).join(' '));
  const eleHeader = `${m} 3 ${doc.triangleAttributes.length}`;
  const enc = new TextEncoder();
  return { node: enc.encode(lines(nodeHeader, nodeRows, style)), ele: enc.encode(lines(eleHeader, eleRows, style)) };
}
