/**
 * Delaunay triangles of a point set, keeping those whose centroid lies in a region. With the
 * region's boundary sampled densely enough (no point inside the circle on any boundary chord),
 * every boundary chord is a Delaunay edge and the kept triangles tile the region exactly.
 */
import Delaunator from 'delaunator';
import type { Region } from './plane.js';

/** Triangles as node triples (counter-clockwise), in Delaunay order. */
export function delaunayInside(coords: Float64Array, region: Region): Int32Array {
  const tri = new Delaunator(coords).triangles;
  const out = new Int32Array(tri.length);
  let m = 0;
  for (let t = 0; t < tri.length; t += 3) {
    const a = tri[t]!;
    let b = tri[t + 1]!;
    let c = tri[t + 2]!;
    const ax = coords[2 * a]!;
    const ay = coords[2 * a + 1]!;
    const bx = coords[2 * b]!;
    const by = coords[2 * b + 1]!;
    const cx = coords[2 * c]!;
    const cy = coords[2 * c + 1]!;
    if (!region.contains((ax + bx + cx) / 3, (ay + by + cy) / 3)) continue;
    if ((bx - ax) * (cy - ay) - (by - ay) * (cx - ax) < 0) {
      const s = b;
      b = c;
      c = s;
    }
    out[m++] = a;
    out[m++] = b;
    out[m++] = c;
  }
  return out.slice(0, m);
}
