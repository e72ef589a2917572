/**
 * Seeded pseudo-random numbers (mulberry32 with an FNV-1a seed hash). Written here because
 * Math.random cannot be seeded, and a valve must come out the same for its seed on every run.
 */
export class SeededRandom {
  private state: number;

  /** A generator from a 32-bit integer seed. */
  constructor(seed: number) {
    this.state = seed >>> 0;
  }

  /** A generator seeded from text, for named streams such as "12AX7#3/noise". */
  static fromText(text: string): SeededRandom {
    let h = 0x811c9dc5;
    for (let i = 0; i < text.length; i++) {
      h ^= text.charCodeAt(i);
      h = Math.imul(h, 0x01000193);
    }
    return new SeededRandom(h);
  }

  /** Uniform deviate in [0, 1). */
  next(): number {
    this.state = (this.state + 0x6d2b79f5) >>> 0;
    let t = this.state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  }

  /** Standard normal deviate (Box-Muller; one of the pair is discarded for simplicity). */
  gaussian(): number {
    const u = 1 - this.next();
    const v = this.next();
    return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
  }

  /** Integer in [0, n). */
  below(n: number): number {
    return Math.floor(this.next() * n);
  }
}
