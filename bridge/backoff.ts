/** Reconnect delays: initialMs doubling up to maxMs; each delay is drawn from [d/2, d] (jitter). */
export class Backoff {
  private attempt = 0;

  constructor(
    /** First delay before jitter, ms. */
    readonly initialMs = 500,
    /** Largest delay before jitter, ms. */
    readonly maxMs = 10_000,
    private readonly random: () => number = Math.random,
  ) {}

  /** Delay before the next attempt, ms; each call doubles the next one up to maxMs. */
  next(): number {
    const d = Math.min(this.maxMs, this.initialMs * 2 ** this.attempt);
    if (d < this.maxMs) this.attempt++;
    // Half fixed, half random: two bridges restarted together do not retry in lockstep.
    return Math.round(d / 2 + (this.random() * d) / 2);
  }

  /** The largest delay, ms, for a peer that should not be retried quickly (still jittered). */
  longest(): number {
    return Math.round(this.maxMs / 2 + (this.random() * this.maxMs) / 2);
  }

  /** Starts again from initialMs, after a connection that worked. */
  reset(): void {
    this.attempt = 0;
  }
}
