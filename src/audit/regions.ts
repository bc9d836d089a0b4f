/**
 * The worst cells grouped into connected regions (cells that share a node), so that remeshing can
 * be planned region by region.
 */
import type { Mesh } from '../mesh/model.js';

/** At most this many worst cells are grouped. */
export const REGION_CELL_CAP = 2000;

export interface Region {
  /** 1-based, in order of the region's smallest step. */
  region: number;
  cells: number;
  worst_cell: number;
  worst_dt: number;
  /** [xmin, ymin, xmax, ymax] over the nodes of the region's cells. */
  bbox: [number, number, number, number];
  /** The global limit once this region and every region before it no longer limit (null: no limit left). */
  dt_after: number | null;
  /** dt_after over the reference step (null: no limit left). */
  gain_after: number | null;
  /** The grouped cells of the region, ascending by step. */
  cell_ids: number[];
}

function find(parent: Int32Array, i: number): number {
  let r = i;
  while (parent[r]! !== r) r = parent[r]!;
  while (parent[i]! !== r) { const p = parent[i]!; parent[i] = r; i = p; }
  return r;
}

/**
 * `group`: cell indices ascending by step (ties by index), e.g. smallestK(dt, G).
 * `nextDt`: the limit once every grouped cell is fixed (the (G+1)-th smallest step, Infinity if none).
 * `ref`: the step gains are measured against.
 */
export function groupRegions(mesh: Mesh, dt: Float64Array, group: Int32Array, nextDt: number, ref: number): Region[] {
  const G = group.length;
  const parent = new Int32Array(G);
  for (let i = 0; i < G; i++) parent[i] = i;
  const owner = new Int32Array(mesh.nPoints).fill(-1);
  const off = mesh.cellOffsets, nodes = mesh.cellNodes;
  for (let gi = 0; gi < G; gi++) {
    const c = group[gi]!;
    for (let k = off[c]!; k < off[c + 1]!; k++) {
      const p = nodes[k]!;
      const o = owner[p]!;
      if (o < 0) { owner[p] = gi; continue; }
      const a = find(parent, gi), b = find(parent, o);
      // the root stays the member with the smaller step, so regions come out ordered
      if (a !== b) { if (a < b) parent[b] = a; else parent[a] = b; }
    }
  }
  const regionOf = new Int32Array(G).fill(-1);
  const regions: Region[] = [];
  const pts = mesh.points;
  for (let gi = 0; gi < G; gi++) {
    const root = find(parent, gi);
    let r = regionOf[root]!;
    const c = group[gi]!;
    if (r < 0) {
      r = regionOf[root] = regions.length;
      regions.push({ region: r + 1, cells: 0, worst_cell: c, worst_dt: dt[c]!, bbox: [Infinity, Infinity, -Infinity, -Infinity], dt_after: null, gain_after: null, cell_ids: [] });
    }
    const reg = regions[r]!;
    reg.cells++;
    reg.cell_ids.push(c);
    const b = reg.bbox;
    for (let k = off[c]!; k < off[c + 1]!; k++) {
      const x = pts[2 * nodes[k]!]!, y = pts[2 * nodes[k]! + 1]!;
      if (x < b[0]) b[0] = x;
      if (y < b[1]) b[1] = y;
      if (x > b[2]) b[2] = x;
      if (y > b[3]) b[3] = y;
    }
  }
  for (let r = 0; r < regions.length; r++) {
    const after = r + 1 < regions.length ? regions[r + 1]!.worst_dt : nextDt;
    regions[r]!.dt_after = Number.isFinite(after) ? after : null;
    regions[r]!.gain_after = Number.isFinite(after) && ref > 0 ? after / ref : null;
  }
  return regions;
}
