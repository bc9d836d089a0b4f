/**
 * Tag → index lookup for MSH node and element tags, which may be sparse and unordered.
 * A dense Int32Array when the largest tag is close to the count, else an open-addressing
 * hash table on float64 keys (tags are integers below 2^53).
 */

const TWO32 = 4294967296;

function hash(tag: number, mask: number): number {
  const lo = tag % TWO32;
  const hi = (tag - lo) / TWO32;
  let h = Math.imul((lo | 0) ^ Math.imul(hi | 0, 0x27d4eb2f), 0x9e3779b1);
  h ^= h >>> 15;
  return h & mask;
}

export class TagMap {
  readonly size: number;
  private readonly dense: Int32Array | null;
  private readonly keys: Float64Array | null;
  private readonly vals: Int32Array | null;
  private readonly mask: number;

  /**
   * Map `tags[i]` → i for i < n. Tags must be non-negative integers. Returns the first
   * repeated tag through `duplicate`, which must throw.
   */
  constructor(tags: ArrayLike<number>, n: number, duplicate: (tag: number) => Error) {
    this.size = n;
    let max = -1;
    for (let i = 0; i < n; i++) if (tags[i]! > max) max = tags[i]!;
    if (max < 2 * n + 1024) {
      const d = new Int32Array(max + 1).fill(-1);
      for (let i = 0; i < n; i++) {
        const t = tags[i]!;
        if (d[t] !== -1) throw duplicate(t);
        d[t] = i;
      }
      this.dense = d;
      this.keys = null;
      this.vals = null;
      this.mask = 0;
      return;
    }
    let cap = 16;
    while (cap < 2 * n) cap *= 2;
    const keys = new Float64Array(cap).fill(-1);
    const vals = new Int32Array(cap);
    const mask = cap - 1;
    for (let i = 0; i < n; i++) {
      const t = tags[i]!;
      let h = hash(t, mask);
      while (keys[h] !== -1) {
        if (keys[h] === t) throw duplicate(t);
        h = (h + 1) & mask;
      }
      keys[h] = t;
      vals[h] = i;
    }
    this.dense = null;
    this.keys = keys;
    this.vals = vals;
    this.mask = mask;
  }

  /** Index of `tag`, or -1. */
  get(tag: number): number {
    const d = this.dense;
    if (d !== null) return tag >= 0 && tag < d.length ? d[tag]! : -1;
    const keys = this.keys!;
    const mask = this.mask;
    let h = hash(tag, mask);
    for (;;) {
      const k = keys[h]!;
      if (k === tag) return this.vals![h]!;
      if (k === -1) return -1;
      h = (h + 1) & mask;
    }
  }
}
