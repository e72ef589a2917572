import {
  closeSync,
  existsSync,
  fsyncSync,
  ftruncateSync,
  mkdirSync,
  openSync,
  readFileSync,
  renameSync,
  writeSync,
} from 'node:fs';
import { dirname } from 'node:path';
import type { SweepEndReason, SweepPoint } from '../shared/domain/sweep';

/** How a sweep ended, as reported to the hub. */
export interface JournalEnd {
  reason: SweepEndReason;
  /** Points recorded for the sweep (seq 0 to count - 1). */
  count: number;
  /** Why it ended, in words. */
  message: string;
}

/** What the journal holds of one sweep the hub has not yet fully acknowledged. */
export interface JournalSweep {
  readonly sweepId: number;
  /** Points the hub has not acknowledged, in seq order. */
  readonly points: SweepPoint[];
  /** Highest seq the hub acknowledged, or -1. */
  ackedThroughSeq: number;
  /** Points recorded so far, acknowledged or not: the next seq expected. */
  pointCount: number;
  /** End of the sweep, or null while it runs (or if the bridge stopped during it). */
  end: JournalEnd | null;
}

/** One line of the journal file. */
export type JournalRecord =
  | { type: 'start'; sweepId: number }
  | ({ type: 'point'; sweepId: number } & SweepPoint)
  | ({ type: 'end'; sweepId: number } & JournalEnd)
  | { type: 'ack-points'; sweepId: number; throughSeq: number }
  | { type: 'ack-end'; sweepId: number };

/** Records appended beyond this many (and 4 times the live ones) trigger a rewrite. */
const COMPACT_AFTER_RECORDS = 50_000;

/**
 * Points and sweep ends kept until the hub acknowledges them, in memory and in an append-only
 * JSON-lines file, so that neither a lost hub nor a restarted bridge loses a reading. Each
 * change is one line written at once (it survives a bridge crash); end records are also
 * fsync'ed. When everything is acknowledged the file is truncated; on open, and when it has
 * grown far beyond what it still holds, it is rewritten with only the live records.
 */
export class Journal {
  private readonly sweeps = new Map<number, JournalSweep>();
  private fd: number;
  private recordsInFile = 0;
  /** Lines that could not be read on open (a line cut short by a crash, for instance). */
  readonly unreadableLines: number;

  private constructor(
    readonly file: string,
    records: unknown[],
    unreadable: number,
  ) {
    this.unreadableLines = unreadable;
    for (const r of records) this.apply(r as JournalRecord);
    mkdirSync(dirname(file), { recursive: true });
    this.fd = -1;
    this.rewrite();
  }

  /** Opens (or creates) the journal file and replays it. */
  static open(file: string): Journal {
    const records: unknown[] = [];
    let unreadable = 0;
    if (existsSync(file)) {
      for (const line of readFileSync(file, 'utf8').split('\n')) {
        if (!line.trim()) continue;
        try {
          const r = JSON.parse(line) as { type?: unknown; sweepId?: unknown };
          if (typeof r.type === 'string' && Number.isSafeInteger(r.sweepId)) records.push(r);
          else unreadable++;
        } catch {
          unreadable++;
        }
      }
    }
    return new Journal(file, records, unreadable);
  }

  /** Sweeps with anything unacknowledged, oldest first. */
  list(): JournalSweep[] {
    return [...this.sweeps.values()];
  }

  /** The sweep with this id, if the journal still holds it. */
  get(sweepId: number): JournalSweep | undefined {
    return this.sweeps.get(sweepId);
  }

  /** Number of points not yet acknowledged, over all sweeps. */
  get unackedPointCount(): number {
    let n = 0;
    for (const s of this.sweeps.values()) n += s.points.length;
    return n;
  }

  /** Records that a sweep started on the tracer. */
  begin(sweepId: number): void {
    this.record({ type: 'start', sweepId });
  }

  /** Records one point; it must be the sweep's next seq. */
  addPoint(sweepId: number, point: SweepPoint): void {
    this.record({ type: 'point', sweepId, ...point });
  }

  /** Records the end of a sweep (once; a second end is ignored). */
  end(sweepId: number, end: JournalEnd): void {
    if (this.sweeps.get(sweepId)?.end) return;
    this.record({ type: 'end', sweepId, ...end });
    fsyncSync(this.fd);
  }

  /** The hub stored every point of the sweep through this seq. */
  ackPoints(sweepId: number, throughSeq: number): void {
    const s = this.sweeps.get(sweepId);
    if (!s) return;
    // An acknowledgement beyond what was recorded cannot cover points not yet read.
    const through = Math.min(throughSeq, s.pointCount - 1);
    if (through <= s.ackedThroughSeq) return;
    this.record({ type: 'ack-points', sweepId, throughSeq: through });
  }

  /** The hub recorded the sweep's end: the journal forgets the sweep. */
  ackEnd(sweepId: number): void {
    if (!this.sweeps.has(sweepId)) return;
    this.record({ type: 'ack-end', sweepId });
    if (this.sweeps.size === 0) {
      // Everything acknowledged: nothing left worth keeping.
      ftruncateSync(this.fd, 0);
      this.recordsInFile = 0;
    }
  }

  /** Flushes and closes the file. */
  close(): void {
    if (this.fd < 0) return;
    fsyncSync(this.fd);
    closeSync(this.fd);
    this.fd = -1;
  }

  private record(r: JournalRecord): void {
    if (this.fd < 0) throw new Error(`journal ${this.file} is closed`);
    this.apply(r);
    writeSync(this.fd, JSON.stringify(r) + '\n');
    this.recordsInFile++;
    if (this.recordsInFile > COMPACT_AFTER_RECORDS) {
      const live = this.unackedPointCount + 3 * this.sweeps.size;
      if (this.recordsInFile > 4 * live) this.rewrite();
    }
  }

  private apply(r: JournalRecord): void {
    let s = this.sweeps.get(r.sweepId);
    if (r.type === 'ack-end') {
      this.sweeps.delete(r.sweepId);
      return;
    }
    if (!s) {
      // A sweep forgotten by ack-end never comes back by a stray ack.
      if (r.type === 'ack-points') return;
      s = { sweepId: r.sweepId, points: [], ackedThroughSeq: -1, pointCount: 0, end: null };
      this.sweeps.set(r.sweepId, s);
    }
    switch (r.type) {
      case 'start':
        break;
      case 'point': {
        if (r.seq !== s.pointCount) break;
        const { type: _type, sweepId: _id, ...point } = r;
        s.points.push(point);
        s.pointCount++;
        break;
      }
      case 'end':
        s.end ??= { reason: r.reason, count: r.count, message: r.message };
        break;
      case 'ack-points': {
        if (r.throughSeq <= s.ackedThroughSeq) break;
        s.ackedThroughSeq = r.throughSeq;
        s.pointCount = Math.max(s.pointCount, r.throughSeq + 1);
        let drop = 0;
        while (drop < s.points.length && s.points[drop].seq <= r.throughSeq) drop++;
        s.points.splice(0, drop);
        break;
      }
    }
  }

  /** Replaces the file with just the live records (written aside, then renamed over). */
  private rewrite(): void {
    const lines: string[] = [];
    for (const s of this.sweeps.values()) {
      lines.push(JSON.stringify({ type: 'start', sweepId: s.sweepId }));
      if (s.ackedThroughSeq >= 0) {
        const ack = { type: 'ack-points', sweepId: s.sweepId, throughSeq: s.ackedThroughSeq };
        lines.push(JSON.stringify(ack));
      }
      for (const p of s.points)
        lines.push(JSON.stringify({ type: 'point', sweepId: s.sweepId, ...p }));
      if (s.end) lines.push(JSON.stringify({ type: 'end', sweepId: s.sweepId, ...s.end }));
    }
    const aside = `${this.file}.compact`;
    const fd = openSync(aside, 'w');
    if (lines.length) writeSync(fd, lines.join('\n') + '\n');
    fsyncSync(fd);
    closeSync(fd);
    if (this.fd >= 0) closeSync(this.fd);
    renameSync(aside, this.file);
    this.fd = openSync(this.file, 'a');
    this.recordsInFile = lines.length;
  }
}
