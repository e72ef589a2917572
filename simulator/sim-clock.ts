/** A pending timer of a SimClock. */
export interface SimTimer {
  /** Stops the timer from firing; harmless after it fired. */
  cancel(): void;
}

/**
 * Device time for the simulated tracer, in ms. Simulated time runs `speed` times faster than
 * the wall clock, so sweeps and warm-up finish sooner while every delay keeps its proportions.
 */
export interface SimClock {
  /** Simulated ms per wall-clock ms. */
  readonly speed: number;
  /** Simulated time since the clock started, ms. */
  now(): number;
  /** Calls `fire` once after `delayMs` of simulated time. */
  setTimer(delayMs: number, fire: () => void): SimTimer;
}
