import type { BridgeToHub } from '../shared/hub/messages';
import type { Journal } from './journal';

/**
 * Sends the journal to the hub: every unacknowledged point in seq order, in batches, then each
 * sweep's end once its points are out. It remembers what went out on the current connection
 * only; a new connection starts over from the journal, which drops what the hub acknowledged.
 */
export class PointSender {
  private readonly sentThroughSeq = new Map<number, number>();
  private readonly endsSent = new Set<number>();
  private timer: NodeJS.Timeout | null = null;

  constructor(
    private readonly journal: Journal,
    private readonly send: (m: BridgeToHub) => boolean,
    /** Longest wait before live points go out, ms. */
    private readonly batchMs = 50,
    /** Most points in one message. */
    private readonly batchMax = 200,
  ) {}

  /** A new hub connection: sends everything unacknowledged again, in order. */
  restart(): void {
    this.sentThroughSeq.clear();
    this.endsSent.clear();
    this.flush();
  }

  /** A point was journaled: it goes out within batchMs, or at once when a batch is full. */
  pointAdded(sweepId: number): void {
    const s = this.journal.get(sweepId);
    const sent = this.sentThroughSeq.get(sweepId) ?? -1;
    if (s && s.pointCount - 1 - sent >= this.batchMax) this.flush();
    else this.timer ??= setTimeout(() => this.flush(), this.batchMs);
  }

  /** Sends whatever is due now; stops quietly when the hub is not connected. */
  flush(): void {
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    for (const s of this.journal.list()) {
      const from = this.sentThroughSeq.get(s.sweepId) ?? -1;
      let i = firstAfter(s.points, from);
      while (i < s.points.length) {
        const points = s.points.slice(i, i + this.batchMax);
        if (!this.send({ type: 'points', sweepId: s.sweepId, points })) return;
        i += points.length;
        this.sentThroughSeq.set(s.sweepId, points[points.length - 1].seq);
      }
      if (s.end && !this.endsSent.has(s.sweepId)) {
        const { reason, count, message } = s.end;
        if (!this.send({ type: 'sweep-ended', sweepId: s.sweepId, reason, count, message })) return;
        this.endsSent.add(s.sweepId);
      }
    }
  }

  /** Cancels a pending batch. */
  stop(): void {
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
  }
}

/** Index of the first point with seq above the given one (points are in seq order). */
function firstAfter(points: readonly { seq: number }[], seq: number): number {
  let lo = 0;
  let hi = points.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (points[mid].seq <= seq) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}
