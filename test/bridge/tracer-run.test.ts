import { afterEach, describe, expect, it, vi } from 'vitest';
import {
  endWentMissing,
  ERROR_AFTER_END_MS,
  holdEnd,
  newRun,
  pointRange,
  points,
} from '../../bridge/tracer-run';
import type { DeviceMessage } from '../../shared/protocol/messages';

type Heartbeat = Extract<DeviceMessage, { type: 'heartbeat' }>;
type End = Extract<DeviceMessage, { type: 'end' }>;

const beat = (state: Heartbeat['state']): Heartbeat =>
  ({
    type: 'heartbeat',
    state,
    highVoltage: state === 'sweeping',
    heaterVolts: 12.6,
    warmupLeftSeconds: 0,
  }) as Heartbeat;
const end = (reason: End['reason']): End => ({ type: 'end', sweepId: 7, reason, count: 3 }) as End;

describe('a run on the tracer', () => {
  afterEach(() => vi.useRealTimers());

  it('counts its END lost after two idle heartbeats in a row while it runs, not one', () => {
    const run = newRun('start');
    expect(endWentMissing(run, beat('idle'))).toBe(false); // not running yet: not counted
    run.phase = 'running';
    expect(endWentMissing(run, beat('idle'))).toBe(false);
    expect(endWentMissing(run, beat('sweeping'))).toBe(false); // the count starts again
    expect(endWentMissing(run, beat('fault'))).toBe(false);
    expect(endWentMissing(run, beat('idle'))).toBe(true);
  });

  it('settles a complete or aborted END at once, and waits for the ERR of a trip', () => {
    vi.useFakeTimers();
    const settle = vi.fn();
    expect(holdEnd(newRun('start'), end('complete'), false, settle)).toBe(true);
    expect(holdEnd(newRun('start'), end('aborted'), false, settle)).toBe(true);
    expect(holdEnd(newRun('start'), end('limit'), true, settle)).toBe(true);
    const tripped = newRun('start');
    tripped.phase = 'running';
    expect(holdEnd(tripped, end('limit'), false, settle)).toBe(false);
    expect(tripped.phase).toBe('ending');
    expect(tripped.heldEnd?.reason).toBe('limit');
    vi.advanceTimersByTime(ERROR_AFTER_END_MS - 1);
    expect(settle).not.toHaveBeenCalled();
    vi.advanceTimersByTime(1);
    expect(settle).toHaveBeenCalledOnce();
  });

  it('words counts and ranges of points', () => {
    expect(points(1)).toBe('1 point');
    expect(points(12)).toBe('12 points');
    expect(pointRange(4, 4)).toBe('point 4');
    expect(pointRange(4, 9)).toBe('points 4 to 9');
  });
});
