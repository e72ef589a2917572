/**
 * The highest seq such that every seq from 0 up to it is stored: what a cumulative ack may
 * promise. Seqs that arrive ahead of a gap wait in a set until the gap fills, so memory is
 * bounded by the number of out-of-order points, never by how long the sweep runs.
 */
export class SeqWatermark {
  private through = -1;
  private readonly ahead = new Set<number>();

  /** Starts from the seqs already stored, in any order. */
  constructor(stored: Iterable<number> = []) {
    for (const seq of stored) this.add(seq);
  }

  /** Highest contiguous seq from 0, or -1 when seq 0 is not stored yet. */
  get throughSeq(): number {
    return this.through;
  }

  /** Records that `seq` is stored. */
  add(seq: number): void {
    if (seq <= this.through) return;
    this.ahead.add(seq);
    while (this.ahead.delete(this.through + 1)) this.through++;
  }
}
