/** Collects points and cells in generation order and hands out a Mesh. */
import { QUAD, TRIANGLE, type DataArray, type Mesh } from '../mesh/model.js';

export class MeshBuilder {
  private xy: number[] = [];
  private nodes: number[] = [];
  private offsets: number[] = [0];
  private types: number[] = [];

  get nPoints(): number {
    return this.xy.length / 2;
  }

  addPoint(x: number, y: number): number {
    this.xy.push(x, y);
    return this.xy.length / 2 - 1;
  }

  /** Append points (x,y interleaved); returns the index of the first. */
  addPoints(xy: ArrayLike<number>): number {
    const first = this.nPoints;
    for (let i = 0; i < xy.length; i++) this.xy.push(xy[i]!);
    return first;
  }

  x(i: number): number {
    return this.xy[2 * i]!;
  }

  y(i: number): number {
    return this.xy[2 * i + 1]!;
  }

  addTriangle(a: number, b: number, c: number): void {
    this.nodes.push(a, b, c);
    this.types.push(TRIANGLE);
    this.offsets.push(this.nodes.length);
  }

  addQuad(a: number, b: number, c: number, d: number): void {
    this.nodes.push(a, b, c, d);
    this.types.push(QUAD);
    this.offsets.push(this.nodes.length);
  }

  /**
   * Reorder the cells in streamwise slabs: by floor(centroid x / slab), keeping the generation
   * order within a slab.
   */
  orderCellsByCentroid(slab: number): void {
    const n = this.types.length;
    const key = new Float64Array(n);
    for (let c = 0; c < n; c++) {
      let sx = 0;
      const s = this.offsets[c]!;
      const e = this.offsets[c + 1]!;
      for (let k = s; k < e; k++) sx += this.xy[2 * this.nodes[k]!]!;
      key[c] = Math.floor(sx / (e - s) / slab);
    }
    const order = Array.from({ length: n }, (_, c) => c).sort((a, b) => key[a]! - key[b]! || a - b);
    const nodes: number[] = [];
    const offsets: number[] = [0];
    const types: number[] = [];
    for (const c of order) {
      for (let k = this.offsets[c]!; k < this.offsets[c + 1]!; k++) nodes.push(this.nodes[k]!);
      offsets.push(nodes.length);
      types.push(this.types[c]!);
    }
    this.nodes = nodes;
    this.offsets = offsets;
    this.types = types;
  }

  finish(format: string, pointData: DataArray[], cellData: DataArray[] = []): Mesh {
    return {
      points: Float64Array.from(this.xy),
      nPoints: this.nPoints,
      cellOffsets: Int32Array.from(this.offsets),
      cellNodes: Int32Array.from(this.nodes),
      cellTypes: Uint8Array.from(this.types),
      nCells: this.types.length,
      pointData,
      cellData,
      format,
      warnings: [],
    };
  }
}
