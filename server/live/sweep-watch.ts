import type { SweepPoint } from '../../shared/domain/sweep';
import type { HubToBrowser } from '../../shared/hub/messages';

/** What a watch needs of a browser's socket (a `ws` WebSocket fits). */
export interface WatchSocket {
  /** Bytes queued in user space, not yet handed to the kernel. */
  readonly bufferedAmount: number;
  /** 1 while open. */
  readonly readyState: number;
  send(data: string): void;
  close(code: number, reason: string): void;
}

/** Flow-control settings of a watch. */
export interface WatchOptions {
  /** Above this many queued bytes no more points are sent; default 1 MiB. */
  pauseAboveBytes?: number;
  /** A paused watch resumes below this; default 256 KiB. */
  resumeBelowBytes?: number;
  /** A client that stays above `pauseAboveBytes` this long is closed with 1013; default 30 s. */
  stuckMs?: number;
  /** How often a paused watch looks at the queue again, ms; default 50. */
  pollMs?: number;
  /** Points a message; default 1000. */
  chunkPoints?: number;
  /** Live points held while catching up, before falling back to another catch-up; default 5000. */
  holdPoints?: number;
}

/** Reads stored points of a sweep with seq >= fromSeq, in seq order. */
export type LoadPoints = (sweepId: number, fromSeq: number) => Promise<SweepPoint[]>;

/**
 * One browser watching one sweep: stored points first, then live ones, with backpressure.
 *
 * Backpressure: while the socket has more than `pauseAboveBytes` queued, live points are not
 * sent but only remembered as "resend from seq N" (one number, so memory cannot grow). Once the
 * queue falls below `resumeBelowBytes` the watch catches up from the database, from seq N on,
 * and goes live again. A client that does not drain within `stuckMs` is closed with 1013 (try
 * again later). Catching up may resend points the client already has: clients key points by
 * (sweepId, seq), so a repeat replaces, never doubles.
 */
export class SweepWatch {
  private state: 'syncing' | 'live' | 'paused' = 'syncing';
  private fromSeq = 0;
  private held: SweepPoint[] = [];
  /** Set when held points overflowed during a catch-up: another catch-up from here follows. */
  private againFrom: number | null = null;
  private stopped = false;
  private readonly o: Required<WatchOptions>;

  constructor(
    readonly sweepId: number,
    private readonly socket: WatchSocket,
    private readonly load: LoadPoints,
    options: WatchOptions = {},
  ) {
    this.o = {
      pauseAboveBytes: options.pauseAboveBytes ?? 1 << 20,
      resumeBelowBytes: options.resumeBelowBytes ?? 1 << 18,
      stuckMs: options.stuckMs ?? 30_000,
      pollMs: options.pollMs ?? 50,
      chunkPoints: options.chunkPoints ?? 1000,
      holdPoints: options.holdPoints ?? 5000,
    };
  }

  /** Current state, for tests and diagnostics. */
  get mode(): 'syncing' | 'live' | 'paused' {
    return this.state;
  }

  /** Sends everything stored, then goes live. Call once, right after creating the watch. */
  start(): Promise<void> {
    return this.catchUp();
  }

  /** Stops the watch; nothing more is sent. */
  stop(): void {
    this.stopped = true;
    this.held = [];
  }

  /** New points just stored for this sweep. */
  offer(points: readonly SweepPoint[]): void {
    if (this.stopped || points.length === 0) return;
    const low = Math.min(...points.map((p) => p.seq));
    if (this.state === 'paused') {
      this.fromSeq = Math.min(this.fromSeq, low);
    } else if (this.state === 'syncing') {
      if (this.againFrom !== null) {
        this.againFrom = Math.min(this.againFrom, low);
      } else if (this.held.length + points.length > this.o.holdPoints) {
        this.againFrom = Math.min(low, ...this.held.map((p) => p.seq));
        this.held = [];
      } else {
        this.held.push(...points);
      }
    } else if (this.socket.bufferedAmount > this.o.pauseAboveBytes) {
      this.state = 'paused';
      this.fromSeq = low;
      this.waitForRoom(this.o.resumeBelowBytes)
        .then((ok) => (ok ? this.catchUp() : undefined))
        .catch(() => {
          // The store failed under us: better a reconnect than a silently stalled stream.
          this.stop();
          this.socket.close(1011, 'could not read stored points');
        });
    } else {
      this.sendPoints(points);
    }
  }

  private async catchUp(): Promise<void> {
    for (;;) {
      this.state = 'syncing';
      this.held = [];
      this.againFrom = null;
      const stored = await this.load(this.sweepId, this.fromSeq);
      if (this.stopped) return;
      for (let i = 0; i < stored.length; i += this.o.chunkPoints) {
        if (!(await this.waitForRoom(this.o.pauseAboveBytes))) return;
        this.sendPoints(stored.slice(i, i + this.o.chunkPoints));
      }
      if (this.againFrom !== null) {
        this.fromSeq = this.againFrom;
        continue;
      }
      const sent = new Set(stored.map((p) => p.seq));
      const rest = this.held.filter((p) => !sent.has(p.seq)).sort((a, b) => a.seq - b.seq);
      this.held = [];
      this.state = 'live';
      this.offer(rest);
      return;
    }
  }

  /** Resolves true once the socket's queue is below `bytes`; false if closed or stopped. */
  private async waitForRoom(bytes: number): Promise<boolean> {
    const since = Date.now();
    while (this.socket.bufferedAmount > bytes) {
      if (this.stopped || this.socket.readyState !== 1) return false;
      if (Date.now() - since > this.o.stuckMs) {
        this.stop();
        this.socket.close(1013, 'client too slow; reconnect');
        return false;
      }
      await new Promise((resolve) => setTimeout(resolve, this.o.pollMs));
    }
    return !this.stopped && this.socket.readyState === 1;
  }

  private sendPoints(points: readonly SweepPoint[]): void {
    if (points.length === 0 || this.socket.readyState !== 1) return;
    const message: HubToBrowser = { type: 'points', sweepId: this.sweepId, points: [...points] };
    this.socket.send(JSON.stringify(message));
  }
}
