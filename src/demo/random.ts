/**
 * Seeded pseudo-random numbers for the demo generators (mulberry32 mixing), so that every run
 * produces the same mesh. Not for anything that needs statistical quality.
 */
export class Rng {
  private state: number;

  constructor(seed: number) {
    this.state = seed | 0;
  }

  /** Uniform in [0, 1). */
  next(): number {
    this.state = (this.state + 0x6d2b79f5) | 0;
    let t = this.state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  }

  /** Uniform integer in [0, n). */
  below(n: number): number {
    return Math.floor(this.next() * n);
  }
}
