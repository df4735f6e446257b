/**
 * A small deterministic generator for simulated data: the same seed gives the same numbers on
 * every machine (mulberry32 for uniforms, Box-Muller for normal deviates). Not for cryptography.
 */
export class SeededRandom {
  private state: number;
  private spare = Number.NaN;
  constructor(seed: number) {
    // mix the seed so that neighbouring seeds give unrelated streams
    let s = (Math.floor(seed) ^ 0x9e3779b9) >>> 0;
    s = Math.imul(s ^ (s >>> 16), 0x85ebca6b) >>> 0;
    s = Math.imul(s ^ (s >>> 13), 0xc2b2ae35) >>> 0;
    this.state = (s ^ (s >>> 16)) >>> 0;
  }
  /** Uniform in [0, 1). */
  uniform(): number {
    let t = (this.state = (this.state + 0x6d2b79f5) >>> 0);
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  }
  /** Integer in [0, n). */
  below(n: number): number {
    return Math.floor(this.uniform() * n);
  }
  /** Standard normal deviate. */
  normal(): number {
    if (!Number.isNaN(this.spare)) {
      const v = this.spare;
      this.spare = Number.NaN;
      return v;
    }
    let u = 0;
    while (u === 0) u = this.uniform();
    const v = this.uniform();
    const r = Math.sqrt(-2 * Math.log(u));
    this.spare = r * Math.sin(2 * Math.PI * v);
    return r * Math.cos(2 * Math.PI * v);
  }
}
