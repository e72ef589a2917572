import type { Refusal } from '../analysis/refusal';

/** Ia, gm and the grid voltage at one operating point of one valve section. V, mA, µS. */
export interface SurfaceReading {
  /** Always true: tells a reading from a refusal. */
  ok: true;
  /** Grid-1 voltage of the point, V (found by the surface when the point was asked by current). */
  vg1Volts: number;
  /** Anode current, mA. */
  iaMilliamps: number;
  /** Mutual conductance at constant Va, µS. */
  gmMicrosiemens: number;
}

/**
 * What matching needs to know about one measured valve section: its anode family as a surface
 * Ia(Va, Vg1) at the screen voltage it was measured at. Kept this small on purpose so that the
 * source behind it (the analysis package today, a cached summary or a model in tests) can be
 * swapped without touching the matching code.
 */
export interface MatchSurface {
  /** Screen voltage the family was measured at, V (0 for triodes). */
  readonly vg2Volts: number;
  /** Ia and gm at (Va, Vg1), or why the family cannot answer there. */
  pointAt(vaVolts: number, vg1Volts: number): SurfaceReading | Refusal;
  /** Ia, gm and Vg1 at the grid voltage where Ia equals the given current at Va. */
  pointAtCurrent(vaVolts: number, iaMilliamps: number): SurfaceReading | Refusal;
  /** Ia at (Va, Vg1), mA, or null outside the measured region: the cheap query for grids. */
  iaAt(vaVolts: number, vg1Volts: number): number | null;
}
