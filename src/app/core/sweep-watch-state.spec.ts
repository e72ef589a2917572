import { pointsOf, SMALL_PLAN, sweepView } from '../../testing/fixtures';
import { applySweepMessage, initialSweepWatchState } from './sweep-watch-state';

describe('applySweepMessage', () => {
  const points = pointsOf(SMALL_PLAN, 4);

  it('appends points that continue the sequence', () => {
    let state = initialSweepWatchState(7);
    state = applySweepMessage(state, { type: 'points', sweepId: 7, points: points.slice(0, 3) });
    state = applySweepMessage(state, { type: 'points', sweepId: 7, points: points.slice(3, 6) });
    expect(state.points.map((p) => p.seq)).toEqual([0, 1, 2, 3, 4, 5]);
  });

  it('keeps one copy of points the hub replays after a reconnect', () => {
    let state = initialSweepWatchState(7);
    state = applySweepMessage(state, { type: 'points', sweepId: 7, points: points.slice(0, 5) });
    state = applySweepMessage(state, { type: 'points', sweepId: 7, points: points.slice(0, 8) });
    expect(state.points.map((p) => p.seq)).toEqual([0, 1, 2, 3, 4, 5, 6, 7]);
  });

  it('takes the latest sweep record', () => {
    const state = applySweepMessage(initialSweepWatchState(7, sweepView({ status: 'pending' })), {
      type: 'sweep',
      sweep: sweepView({ status: 'complete' }),
    });
    expect(state.sweep?.status).toBe('complete');
  });
});
