import type { DeviceMessage } from '../shared/protocol/messages';

type End = Extract<DeviceMessage, { type: 'end' }>;
type Heartbeat = Extract<DeviceMessage, { type: 'heartbeat' }>;

/** How long an END of a trip or fault waits for the ERR that explains it, ms. */
export const ERROR_AFTER_END_MS = 300;

/**
 * Where a run on the tracer (a sweep, or a check of a quick test) stands. heater: HTR sent,
 * waiting for its ACK (sweeps only); start: the command sent, waiting for its ACK; running:
 * accepted by the tracer; aborting: ABT sent; ending: the tracer ended it with a trip or fault,
 * and the ERR explaining why may follow.
 */
export type RunPhase = 'heater' | 'start' | 'running' | 'aborting' | 'ending';

/** What SweepControl and CheckControl keep alike of the run they look after. */
export interface TracerRun {
  phase: RunPhase;
  /** Heartbeats saying idle or fault while the run should go on (an END line went missing). */
  idleBeats: number;
  /** Whether ABT was sent on request. */
  abortRequested: boolean;
  /** The tracer's END, held while phase is 'ending'. */
  heldEnd: End | null;
  timer: NodeJS.Timeout | null;
}

/** A run just sent to the tracer. */
export function newRun(phase: 'heater' | 'start'): TracerRun {
  return { phase, idleBeats: 0, abortRequested: false, heldEnd: null, timer: null };
}

/** Stops the run's pending timer. */
export function disarm(run: TracerRun): void {
  if (run.timer) clearTimeout(run.timer);
  run.timer = null;
}

/** Replaces the run's pending timer with one that calls `fire` after `ms`. */
export function armTimer(run: TracerRun, ms: number, fire: () => void): void {
  disarm(run);
  run.timer = setTimeout(fire, ms);
}

/**
 * Counts a heartbeat against a running run: true when two in a row say idle or fault, so the
 * tracer ended without its END reaching the bridge (one such beat may have been queued just
 * before the run began, hence two).
 */
export function endWentMissing(run: TracerRun, beat: Heartbeat): boolean {
  if (run.phase !== 'running' && run.phase !== 'aborting') return false;
  run.idleBeats = beat.state === 'idle' || beat.state === 'fault' ? run.idleBeats + 1 : 0;
  return run.idleBeats >= 2;
}

/**
 * Holds the tracer's END of the run. True when the run can be settled at once (complete,
 * aborted, or the ERR is already in); otherwise the run waits ERROR_AFTER_END_MS in phase
 * 'ending' for an ERR that tracers may send after the END, then `settle` is called.
 */
export function holdEnd(
  run: TracerRun,
  end: End,
  errorKnown: boolean,
  settle: () => void,
): boolean {
  run.heldEnd = end;
  if (end.reason === 'complete' || end.reason === 'aborted' || errorKnown) return true;
  run.phase = 'ending';
  armTimer(run, ERROR_AFTER_END_MS, settle);
  return false;
}

/** "1 point", "12 points". */
export function points(n: number): string {
  return n === 1 ? '1 point' : `${n} points`;
}

/** "point 4", "points 4 to 9". */
export function pointRange(first: number, last: number): string {
  return first === last ? `point ${first}` : `points ${first} to ${last}`;
}
