import { describe, expect, it } from 'vitest';
import type { SweepPoint } from '../../../shared/domain/sweep';
import { SweepWatch, type WatchSocket } from '../../../server/live/sweep-watch';
import { eventually, makePoints } from '../test-hub';

/** A socket whose send queue the test controls; records what was sent. */
class QueueSocket implements WatchSocket {
  bufferedAmount = 0;
  readyState = 1;
  readonly sent: number[][] = [];
  closedWith: number | null = null;
  send(data: string): void {
    this.sent.push(JSON.parse(data).points.map((p: SweepPoint) => p.seq));
  }
  close(code: number): void {
    this.closedWith = code;
    this.readyState = 3;
  }
  get seqs(): number[] {
    return this.sent.flat();
  }
}

/** A point store: seqs stored so far, and every load asked of it. */
function store(initial: number[]) {
  const seqs = new Set(initial);
  const loads: number[] = [];
  let gate: Promise<void> = Promise.resolve();
  return {
    seqs,
    loads,
    hold() {
      let open!: () => void;
      gate = new Promise((r) => (open = r));
      return () => open();
    },
    load: async (_sweepId: number, fromSeq: number) => {
      loads.push(fromSeq);
      const snapshot = makePoints([...seqs].filter((s) => s >= fromSeq).sort((a, b) => a - b));
      await gate;
      return snapshot;
    },
  };
}

const options = { pauseAboveBytes: 1000, resumeBelowBytes: 100, pollMs: 5, chunkPoints: 2 };

describe('SweepWatch', () => {
  it('sends the stored points in chunks, then held live points without repeats', async () => {
    const s = store([0, 1, 2, 3, 4]);
    const socket = new QueueSocket();
    const watch = new SweepWatch(1, socket, s.load, options);
    const release = s.hold();
    const started = watch.start();
    watch.offer(makePoints([4, 5])); // stored meanwhile: 4 is in the snapshot, 5 is not
    release();
    await started;
    expect(socket.sent).toEqual([[0, 1], [2, 3], [4], [5]]);
    expect(watch.mode).toBe('live');
    watch.offer(makePoints([6]));
    expect(socket.seqs).toEqual([0, 1, 2, 3, 4, 5, 6]);
  });

  it('stops sending while the socket is backed up and catches up from the store', async () => {
    const s = store([0, 1]);
    const socket = new QueueSocket();
    const watch = new SweepWatch(1, socket, s.load, options);
    await watch.start();
    socket.bufferedAmount = 5000;
    for (const seq of [4, 5, 2, 3]) {
      s.seqs.add(seq);
      watch.offer(makePoints([seq]));
    }
    expect(watch.mode).toBe('paused');
    expect(socket.seqs).toEqual([0, 1]);
    socket.bufferedAmount = 0;
    await eventually(() => watch.mode === 'live', 'live again');
    expect(s.loads).toEqual([0, 2]);
    expect(socket.seqs).toEqual([0, 1, 2, 3, 4, 5]);
  });

  it('keeps one number, not the points, however many arrive while paused', async () => {
    const s = store([]);
    const socket = new QueueSocket();
    const watch = new SweepWatch(1, socket, s.load, { ...options, stuckMs: 60_000 });
    await watch.start();
    socket.bufferedAmount = 5000;
    for (let seq = 0; seq < 20000; seq++) watch.offer(makePoints([seq]));
    expect(watch.mode).toBe('paused');
    expect((watch as unknown as { held: unknown[] }).held).toEqual([]);
    watch.stop();
  });

  it('falls back to another catch-up when too many live points arrive during one', async () => {
    const s = store([0]);
    const socket = new QueueSocket();
    const watch = new SweepWatch(1, socket, s.load, { ...options, holdPoints: 3 });
    const release = s.hold();
    const started = watch.start();
    for (const seq of [1, 2, 3, 4, 5]) {
      s.seqs.add(seq);
      watch.offer(makePoints([seq]));
    }
    release();
    await started;
    expect(s.loads).toEqual([0, 1]);
    expect(new Set(socket.seqs)).toEqual(new Set([0, 1, 2, 3, 4, 5]));
    expect(watch.mode).toBe('live');
  });

  it('closes a client that never drains with code 1013', async () => {
    const s = store([0, 1, 2, 3]);
    const socket = new QueueSocket();
    socket.bufferedAmount = 5000;
    const watch = new SweepWatch(1, socket, s.load, { ...options, stuckMs: 50 });
    await watch.start();
    expect(socket.closedWith).toBe(1013);
    expect(socket.sent).toEqual([]);
  });
});
