import type { SweepPoint } from '../../../shared/domain/sweep';
import type { SweepView } from '../../../shared/hub/messages';
import type { SweepMessage } from './live-connection';

/** What a watcher knows of one sweep: its latest state and its points in sequence order. */
export interface SweepWatchState {
  sweepId: number;
  sweep: SweepView | null;
  points: SweepPoint[];
}

/** A fresh state, optionally seeded with a sweep record already at hand (e.g. from a POST). */
export function initialSweepWatchState(
  sweepId: number,
  sweep: SweepView | null = null,
): SweepWatchState {
  return { sweepId, sweep, points: [] };
}

/**
 * Folds one hub message into the state. Points are keyed by sequence number: the hub replays
 * stored points on every (re)watch, so repeats must not draw twice.
 */
export function applySweepMessage(state: SweepWatchState, message: SweepMessage): SweepWatchState {
  if (message.type === 'sweep') return { ...state, sweep: message.sweep };
  if (message.points.length === 0) return state;
  const last = state.points.at(-1);
  const inOrder =
    (!last || message.points[0].seq > last.seq) &&
    message.points.every((p, i) => i === 0 || p.seq > message.points[i - 1].seq);
  if (inOrder) return { ...state, points: [...state.points, ...message.points] };
  const bySeq = new Map(state.points.map((p) => [p.seq, p]));
  for (const p of message.points) bySeq.set(p.seq, p);
  return { ...state, points: [...bySeq.values()].sort((a, b) => a.seq - b.seq) };
}
