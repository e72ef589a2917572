import type { PlanLimits } from '../domain/plan-check';
import type { KorenPentodeParams, KorenTriodeParams } from '../physics/koren';
import type { SweepPlan } from '../domain/sweep';

/**
 * Published figures for the valve types Emberline knows out of the box. Every figure carries its
 * source as cited; "from memory" marks figures the team's reference sheet gives only from memory.
 * Model parameters: N. Koren, Glass Audio 8(5), 1996 (his published library).
 */

/** Construction class of a valve type. */
export type ValveClass = 'diode' | 'triode' | 'double-triode' | 'tetrode' | 'beam-tetrode' | 'pentode' | 'rectifier';

/** A typical operating point from a data sheet. V, mA, µS (gm), kΩ (ra). */
export interface TypicalOperatingPoint {
  /** Anode voltage, V. */
  vaVolts: number;
  /** Screen voltage, V (null for triodes). */
  vg2Volts: number | null;
  /** Grid-1 voltage, V. */
  vg1Volts: number;
  /** Anode current, mA. */
  iaMilliamps: number;
  /** Screen current, mA (null where not published). */
  ig2Milliamps: number | null;
  /** Mutual conductance, µS. */
  gmMicrosiemens: number | null;
  /** Anode resistance, kΩ. */
  raKiloohms: number | null;
  /** Amplification factor (null where not published). */
  mu: number | null;
  /** Source and confidence, as cited. */
  source: string;
}

/** Maximum ratings. V, W. */
export interface MaximumRatings {
  /** Anode voltage, V. */
  vaMaxVolts: number;
  /** Screen voltage, V (null for triodes). */
  vg2MaxVolts: number | null;
  /** Anode dissipation, W (per section for double triodes). */
  paMaxWatts: number;
  /** Screen dissipation, W (null for triodes). */
  pg2MaxWatts: number | null;
  /** Heater-cathode voltage, V (null where not published). */
  vhkMaxVolts: number | null;
  /** Source and confidence, as cited. */
  source: string;
}

/** A valve type with its published data. */
export interface ValveTypeData {
  /** Designation, e.g. "12AX7". */
  designation: string;
  /** Equivalent designations. */
  equivalents: string[];
  /** Construction class. */
  valveClass: ValveClass;
  /** Base, e.g. "B9A", "octal". */
  base: string;
  /** Number of sections in the envelope. */
  sections: number;
  /** Heater voltage, V (the first listed where a type has two). */
  heaterVolts: number;
  /** Heater current at heaterVolts, A. */
  heaterAmps: number;
  /** Typical operating points, first is the reference point for grading. */
  operatingPoints: TypicalOperatingPoint[];
  /** Maximum ratings. */
  ratings: MaximumRatings;
  /** Published Koren model, where one exists. */
  model: { kind: 'triode'; params: KorenTriodeParams; source: string } | { kind: 'pentode'; params: KorenPentodeParams; source: string } | null;
}

const KOREN = 'Koren, Glass Audio 8(5), 1996';

export const VALVE_TYPES: readonly ValveTypeData[] = [
  {
    designation: '12AX7',
    equivalents: ['ECC83'],
    valveClass: 'double-triode',
    base: 'B9A',
    sections: 2,
    heaterVolts: 12.6,
    heaterAmps: 0.15,
    operatingPoints: [
      { vaVolts: 250, vg2Volts: null, vg1Volts: -2, iaMilliamps: 1.2, ig2Milliamps: null, gmMicrosiemens: 1600, raKiloohms: 62.5, mu: 100, source: 'RCA data sheet; high' },
      { vaVolts: 100, vg2Volts: null, vg1Volts: -1, iaMilliamps: 0.5, ig2Milliamps: null, gmMicrosiemens: 1250, raKiloohms: 80, mu: 100, source: 'RCA data sheet; high' },
    ],
    ratings: { vaMaxVolts: 300, vg2MaxVolts: null, paMaxWatts: 1.0, pg2MaxWatts: null, vhkMaxVolts: 180, source: 'RCA; high' },
    model: { kind: 'triode', params: { mu: 100, ex: 1.4, kg1: 1060, kp: 600, kvb: 300 }, source: KOREN },
  },
  {
    designation: '12AU7',
    equivalents: ['ECC82'],
    valveClass: 'double-triode',
    base: 'B9A',
    sections: 2,
    heaterVolts: 12.6,
    heaterAmps: 0.15,
    operatingPoints: [
      { vaVolts: 250, vg2Volts: null, vg1Volts: -8.5, iaMilliamps: 10.5, ig2Milliamps: null, gmMicrosiemens: 2200, raKiloohms: 7.7, mu: 17, source: 'RCA Receiving Tube Manual; mu, ra high, rest from memory' },
    ],
    ratings: { vaMaxVolts: 300, vg2MaxVolts: null, paMaxWatts: 2.75, pg2MaxWatts: null, vhkMaxVolts: 200, source: 'RCA; from memory' },
    model: { kind: 'triode', params: { mu: 21.5, ex: 1.3, kg1: 1180, kp: 84, kvb: 300 }, source: KOREN },
  },
  {
    designation: '12AT7',
    equivalents: ['ECC81'],
    valveClass: 'double-triode',
    base: 'B9A',
    sections: 2,
    heaterVolts: 12.6,
    heaterAmps: 0.15,
    operatingPoints: [
      { vaVolts: 250, vg2Volts: null, vg1Volts: -2, iaMilliamps: 10, ig2Milliamps: null, gmMicrosiemens: 5500, raKiloohms: 10.9, mu: 60, source: 'data sheet; high' },
    ],
    ratings: { vaMaxVolts: 300, vg2MaxVolts: null, paMaxWatts: 2.5, pg2MaxWatts: null, vhkMaxVolts: 90, source: 'data sheet; Pa from memory' },
    model: { kind: 'triode', params: { mu: 60, ex: 1.35, kg1: 460, kp: 300, kvb: 300 }, source: KOREN },
  },
  {
    designation: '6SN7GT',
    equivalents: [],
    valveClass: 'double-triode',
    base: 'octal',
    sections: 2,
    heaterVolts: 6.3,
    heaterAmps: 0.6,
    operatingPoints: [
      { vaVolts: 250, vg2Volts: null, vg1Volts: -8, iaMilliamps: 9, ig2Milliamps: null, gmMicrosiemens: 2600, raKiloohms: 7.7, mu: 20, source: 'RCA data; high' },
    ],
    ratings: { vaMaxVolts: 300, vg2MaxVolts: null, paMaxWatts: 2.5, pg2MaxWatts: null, vhkMaxVolts: 200, source: 'RCA; high' },
    model: null,
  },
  {
    designation: 'EF86',
    equivalents: [],
    valveClass: 'pentode',
    base: 'B9A',
    sections: 1,
    heaterVolts: 6.3,
    heaterAmps: 0.2,
    operatingPoints: [
      { vaVolts: 250, vg2Volts: 140, vg1Volts: -2.2, iaMilliamps: 3.0, ig2Milliamps: 0.6, gmMicrosiemens: 2200, raKiloohms: 2500, mu: null, source: 'Philips data; medium' },
    ],
    ratings: { vaMaxVolts: 300, vg2MaxVolts: 200, paMaxWatts: 1, pg2MaxWatts: 0.2, vhkMaxVolts: 100, source: 'Philips; Pa high, rest from memory' },
    model: null,
  },
  {
    designation: 'EL84',
    equivalents: ['6BQ5'],
    valveClass: 'pentode',
    base: 'B9A',
    sections: 1,
    heaterVolts: 6.3,
    heaterAmps: 0.76,
    operatingPoints: [
      { vaVolts: 250, vg2Volts: 250, vg1Volts: -7.3, iaMilliamps: 48, ig2Milliamps: 5.5, gmMicrosiemens: 11300, raKiloohms: 38, mu: null, source: 'Philips/Mullard data; medium' },
    ],
    ratings: { vaMaxVolts: 300, vg2MaxVolts: 300, paMaxWatts: 12, pg2MaxWatts: 2, vhkMaxVolts: 100, source: 'Philips; Pa, Va high' },
    model: null,
  },
  {
    designation: '6V6GT',
    equivalents: [],
    valveClass: 'beam-tetrode',
    base: 'octal',
    sections: 1,
    heaterVolts: 6.3,
    heaterAmps: 0.45,
    operatingPoints: [
      { vaVolts: 250, vg2Volts: 250, vg1Volts: -12.5, iaMilliamps: 45, ig2Milliamps: 4.5, gmMicrosiemens: 4100, raKiloohms: 50, mu: null, source: 'RCA data; medium-high' },
    ],
    ratings: { vaMaxVolts: 315, vg2MaxVolts: 285, paMaxWatts: 12, pg2MaxWatts: 2, vhkMaxVolts: 200, source: 'RCA; medium' },
    model: null,
  },
  {
    designation: '6L6GC',
    equivalents: [],
    valveClass: 'beam-tetrode',
    base: 'octal',
    sections: 1,
    heaterVolts: 6.3,
    heaterAmps: 0.9,
    operatingPoints: [
      { vaVolts: 350, vg2Volts: 250, vg1Volts: -18, iaMilliamps: 54, ig2Milliamps: 2.5, gmMicrosiemens: 5200, raKiloohms: 33, mu: null, source: 'GE Essential Characteristics 1973; Ig2, gm, ra from memory' },
    ],
    ratings: { vaMaxVolts: 500, vg2MaxVolts: 450, paMaxWatts: 30, pg2MaxWatts: 5, vhkMaxVolts: 200, source: 'GE 1973; Va, Pa high' },
    model: { kind: 'pentode', params: { mu: 8.7, ex: 1.35, kg1: 1460, kg2: 4500, kp: 48, kvb: 12 }, source: KOREN },
  },
  {
    designation: 'EL34',
    equivalents: ['6CA7'],
    valveClass: 'pentode',
    base: 'octal',
    sections: 1,
    heaterVolts: 6.3,
    heaterAmps: 1.5,
    operatingPoints: [
      { vaVolts: 250, vg2Volts: 250, vg1Volts: -13.5, iaMilliamps: 100, ig2Milliamps: 14.9, gmMicrosiemens: 11000, raKiloohms: 15, mu: null, source: 'Philips/Mullard data; medium' },
    ],
    ratings: { vaMaxVolts: 800, vg2MaxVolts: 425, paMaxWatts: 25, pg2MaxWatts: 8, vhkMaxVolts: 100, source: 'Philips; Pa, Pg2 high' },
    model: { kind: 'pentode', params: { mu: 11, ex: 1.35, kg1: 650, kg2: 4200, kp: 60, kvb: 24 }, source: KOREN },
  },
  {
    designation: '300B',
    equivalents: [],
    valveClass: 'triode',
    base: '4-pin UX',
    sections: 1,
    heaterVolts: 5.0,
    heaterAmps: 1.2,
    operatingPoints: [
      { vaVolts: 300, vg2Volts: null, vg1Volts: -61, iaMilliamps: 60, ig2Milliamps: null, gmMicrosiemens: 5500, raKiloohms: 0.7, mu: 3.85, source: 'Western Electric data sheet; high' },
    ],
    ratings: { vaMaxVolts: 400, vg2MaxVolts: null, paMaxWatts: 36, pg2MaxWatts: null, vhkMaxVolts: null, source: 'Western Electric; from memory' },
    model: { kind: 'triode', params: { mu: 3.95, ex: 1.4, kg1: 1550, kp: 65, kvb: 300 }, source: KOREN },
  },
];

/** Looks a type up by designation or equivalent, case-insensitive. */
export function findValveType(name: string): ValveTypeData | undefined {
  const key = name.trim().toUpperCase();
  return VALVE_TYPES.find((t) => t.designation.toUpperCase() === key || t.equivalents.some((e) => e.toUpperCase() === key));
}

/** Whether a class has a screen grid (tetrodes and pentodes). */
export function hasScreen(c: ValveClass): boolean {
  return c === 'tetrode' || c === 'beam-tetrode' || c === 'pentode';
}

/**
 * A default anode-family plan for a type: Va from 0 to its maximum (capped at 400 V), grid
 * steps around the reference operating point, dissipation held to 75 % of the rated maximum
 * (common practice: idle at or below about 70-80 % of Pa max) unless the reference point needs
 * more, never above the rating.
 */
export function defaultPlan(t: ValveTypeData): SweepPlan {
  const op = t.operatingPoints[0];
  const vaStop = Math.min(t.ratings.vaMaxVolts, 400);
  const gridSpan = Math.max(2 * Math.abs(op.vg1Volts), 2);
  const step = niceStep(gridSpan / 9);
  const curves = Math.min(12, Math.floor(gridSpan / step + 1e-9) + 1);
  // Grid supplies of home-built tracers commonly reach -100 V; deeper curves are left out.
  const vg1Volts = Array.from({ length: curves }, (_, i) => round2(-i * step) || 0).filter((v) => v >= -100);
  // Common practice idles a valve at or below 70-80 % of Pa max; a sweep must still reach the
  // reference operating point, which some data sheets put at the full rating (EL34: 25 W).
  const opWatts = (op.vaVolts * op.iaMilliamps) / 1000;
  const paMax = round2(Math.min(t.ratings.paMaxWatts, Math.max(t.ratings.paMaxWatts * 0.75, opWatts * 1.05)));
  // Leave headroom between the curve limit and the trip, inside a 250 mA measuring range, so a
  // curve that overshoots its limit by one step ends the curve rather than the sweep.
  const iaMax = Math.min(round2(Math.max(op.iaMilliamps * 2.5, (paMax * 1000) / vaStop)), 160);
  return {
    kind: 'anode',
    vaStartVolts: 0,
    vaStopVolts: vaStop,
    vaStepVolts: niceStep(vaStop / 50),
    vg1Volts,
    vg2Volts: op.vg2Volts ?? 0,
    heaterVolts: t.heaterVolts,
    iaMaxMilliamps: iaMax,
    paMaxWatts: paMax,
    iaTripMilliamps: Math.min(round2(iaMax * 1.5), 250),
    warmupSeconds: 20,
    settleMs: 2,
  };
}

/** Limits from a type's maximum ratings, for checkPlan. */
export function limitsFromType(t: ValveTypeData): PlanLimits {
  return {
    vaMaxVolts: t.ratings.vaMaxVolts,
    vg2MaxVolts: t.ratings.vg2MaxVolts ?? 0,
    vg1MinVolts: Number.NEGATIVE_INFINITY,
    vg1MaxVolts: 0,
    iaMaxMilliamps: Number.POSITIVE_INFINITY,
    paMaxWatts: t.ratings.paMaxWatts,
    heaterMaxVolts: t.heaterVolts * 1.1,
  };
}

function niceStep(x: number): number {
  const e = Math.pow(10, Math.floor(Math.log10(x)));
  const m = x / e;
  const nice = [1, 2, 2.5, 5, 10].reduce((best, c) => (Math.abs(c - m) < Math.abs(best - m) ? c : best));
  return round2(nice * e);
}

function round2(x: number): number {
  return Math.round(x * 100) / 100;
}
