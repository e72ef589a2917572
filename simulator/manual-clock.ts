import type { SimClock, SimTimer } from './sim-clock';

interface PendingTimer {
  atMs: number;
  order: number;
  fire: () => void;
  cancelled: boolean;
}

/**
 * A SimClock that only moves when told to, so tests of the tracer core run instantly and
 * deterministically. Timers fire in time order (ties in the order they were set).
 */
export class ManualClock implements SimClock {
  private timeMs = 0;
  private order = 0;
  private pending: PendingTimer[] = [];

  /** `speed` only scales wall-clock delays such as the watchdog; 1 unless a test says so. */
  constructor(readonly speed = 1) {}

  now(): number {
    return this.timeMs;
  }

  setTimer(delayMs: number, fire: () => void): SimTimer {
    const timer = {
      atMs: this.timeMs + Math.max(0, delayMs),
      order: this.order++,
      fire,
      cancelled: false,
    };
    this.pending.push(timer);
    return { cancel: () => (timer.cancelled = true) };
  }

  /** Moves time forward by `ms`, firing every timer that falls due on the way. */
  advance(ms: number): void {
    const endMs = this.timeMs + ms;
    for (;;) {
      this.pending = this.pending.filter((t) => !t.cancelled);
      let next: PendingTimer | undefined;
      for (const t of this.pending) {
        if (t.atMs > endMs) continue;
        if (!next || t.atMs < next.atMs || (t.atMs === next.atMs && t.order < next.order)) next = t;
      }
      if (!next) break;
      next.cancelled = true;
      this.timeMs = Math.max(this.timeMs, next.atMs);
      next.fire();
    }
    this.timeMs = endMs;
  }
}
