import { appendFileSync, mkdtempSync, readFileSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { startBridge } from '../../bridge/bridge';
import { Journal } from '../../bridge/journal';
import type { SweepPoint } from '../../shared/domain/sweep';
import { openTestBench, SAFE_PLAN, type TestBench } from './test-bench';
import { until } from './until';

function point(seq: number): SweepPoint {
  return {
    seq,
    curve: 0,
    vaVolts: seq * 10,
    vg1Volts: -1,
    vg2Volts: 0,
    iaMilliamps: seq / 10,
    ig2Milliamps: 0,
  };
}

function lines(file: string): string[] {
  return readFileSync(file, 'utf8').split('\n').filter(Boolean);
}

describe('journal file', () => {
  let dir: string;
  let file: string;
  beforeEach(() => {
    dir = mkdtempSync(join(tmpdir(), 'emberline-journal-'));
    file = join(dir, 'sub', 'journal.jsonl');
  });
  afterEach(() => rmSync(dir, { recursive: true, force: true }));

  it('keeps unacknowledged points and ends across reopening', () => {
    const j = Journal.open(file);
    j.begin(1);
    for (let i = 0; i < 5; i++) j.addPoint(1, point(i));
    j.end(1, { reason: 'complete', count: 5, message: 'complete, 5 points' });
    j.begin(2);
    j.addPoint(2, point(0));
    j.close();

    const again = Journal.open(file);
    expect(again.list().map((s) => s.sweepId)).toEqual([1, 2]);
    expect(again.get(1)!.points).toEqual([0, 1, 2, 3, 4].map(point));
    expect(again.get(1)!.end).toEqual({
      reason: 'complete',
      count: 5,
      message: 'complete, 5 points',
    });
    expect(again.get(2)!.end).toBeNull();
    expect(again.get(2)!.pointCount).toBe(1);
    again.close();
  });

  it('forgets what the hub acknowledged, and empties the file once everything is', () => {
    const j = Journal.open(file);
    j.begin(1);
    for (let i = 0; i < 5; i++) j.addPoint(1, point(i));
    j.ackPoints(1, 2);
    expect(j.get(1)!.points.map((p) => p.seq)).toEqual([3, 4]);
    j.close();

    const again = Journal.open(file);
    expect(again.get(1)!.points.map((p) => p.seq)).toEqual([3, 4]);
    expect(again.get(1)!.pointCount).toBe(5);
    // Reopening compacted the file: the acknowledged points are no longer in it.
    expect(lines(file).filter((l) => l.includes('"point"'))).toHaveLength(2);
    again.addPoint(1, point(5));
    again.end(1, { reason: 'complete', count: 6, message: 'done' });
    again.ackPoints(1, 5);
    again.ackEnd(1);
    expect(again.list()).toEqual([]);
    expect(statSync(file).size).toBe(0);
    again.addPoint(3, point(0));
    again.close();
    expect(lines(file)).toHaveLength(1);
  });

  it('never lets an acknowledgement run ahead of the points recorded', () => {
    const j = Journal.open(file);
    j.begin(1);
    j.addPoint(1, point(0));
    j.ackPoints(1, 50);
    j.addPoint(1, point(1));
    expect(j.get(1)!.points.map((p) => p.seq)).toEqual([1]);
    j.close();
  });

  it('skips a last line cut short by a crash and keeps the rest', () => {
    const j = Journal.open(file);
    j.begin(4);
    j.addPoint(4, point(0));
    j.addPoint(4, point(1));
    j.close();
    appendFileSync(file, '{"type":"point","sweepId":4,"seq":2,"cur');

    const again = Journal.open(file);
    expect(again.unreadableLines).toBe(1);
    expect(again.get(4)!.points.map((p) => p.seq)).toEqual([0, 1]);
    again.addPoint(4, point(2));
    again.close();
    expect(
      Journal.open(file)
        .get(4)!
        .points.map((p) => p.seq),
    ).toEqual([0, 1, 2]);
  });
});

describe('bridge journal across restarts', () => {
  let bench: TestBench | null = null;
  afterEach(async () => {
    await bench?.close();
    bench = null;
  });

  it('a restarted bridge resends what the stopped one had not had acknowledged', async () => {
    bench = await openTestBench();
    const { hub, tracer } = bench;
    await bench.ready();
    hub.autoAck = false;
    hub.send({ type: 'start-sweep', sweepId: 31, plan: SAFE_PLAN });
    await hub.waitFor('sweep-started');
    for (let i = 0; i < 5; i++) tracer.point(i * 10, 0.1 * i);
    await until('5 points at the hub', () => hub.seqsReceived(31).length === 5);
    await bench.bridge.stop();
    expect(lines(bench.options.journalFile!).length).toBeGreaterThanOrEqual(7);

    hub.autoAck = true;
    bench.bridge = startBridge(bench.options);
    const ended = await until('the end resent', () => hub.messages('sweep-ended', 2)[0]);
    expect(ended).toMatchObject({ sweepId: 31, reason: 'aborted', count: 5 });
    expect(ended.message).toContain('bridge was stopped');
    expect(hub.seqsReceived(31, 2)).toEqual([0, 1, 2, 3, 4]);
    await until('journal emptied by the acks', () => bench!.bridge.journal.list().length === 0);
    expect(statSync(bench.options.journalFile!).size).toBe(0);
  });
});
