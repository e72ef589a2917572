import { refuse, type Refusal } from '../analysis/refusal';
import { defaultPlan, findValveType, hasScreen, type ValveTypeData } from '../catalog/valve-types';
import { DEFAULT_TOLERANCE_PERCENT } from './match-tolerances';

interface MatchPointBase {
  /** Name shown in reports, e.g. "idle" (default: "point 1", "point 2" ...). */
  label?: string;
  /** Anode voltage, V. */
  vaVolts: number;
  /** Screen voltage, V: required for types with a screen, absent for triodes. */
  vg2Volts?: number;
}

/** An operating point at fixed bias: Ia and gm are compared at this Va and Vg1. */
export interface FixedBiasPoint extends MatchPointBase {
  /** Grid-1 voltage, V. */
  vg1Volts: number;
}

/**
 * An operating point at equal current: each valve is taken at the Vg1 that gives this Ia at Va,
 * and gm is compared there (common practice matches gm at equal Ia; team reference §6).
 */
export interface EqualCurrentPoint extends MatchPointBase {
  /** Anode current, mA. */
  iaMilliamps: number;
}

/** One operating point the match is judged at. */
export type MatchPoint = FixedBiasPoint | EqualCurrentPoint;

/** A region of the anode family over which whole curves are compared. V, mA. */
export interface MatchWindow {
  /** Lowest anode voltage, V. */
  vaMinVolts: number;
  /** Highest anode voltage, V. */
  vaMaxVolts: number;
  /** Lowest anode current that counts, mA (keeps the comparison away from cut-off). */
  iaMinMilliamps: number;
  /** Highest anode current that counts, mA. */
  iaMaxMilliamps: number;
  /** Grid-1 voltages of the compared curves, V (default: those of the type's default plan). */
  vg1Volts?: number[];
  /** Number of anode voltages across the window, ends included (default 13). */
  vaSteps?: number;
}

/** What makes valves a match, as a user states it. Weights are relative; % are of group means. */
export interface MatchingCriteria {
  /** Valve type designation, e.g. "12AX7"; gives defaults and tells triodes from pentodes. */
  valveType: string;
  /** Operating points, e.g. idle and drive (default without a window: the type's typical point). */
  operatingPoints?: MatchPoint[];
  /** A window of Va and Ia on the family over which the curves are compared. */
  window?: MatchWindow;
  /** Weight of Ia differences at the points (default 1). */
  iaWeight?: number;
  /** Weight of gm differences at the points (default 1). */
  gmWeight?: number;
  /** Weight of the curve agreement over the window (default 1 when a window is given). */
  curveWeight?: number;
  /** Largest spread that makes a group acceptable, % (default: the usual 5 %, common practice). */
  tolerancePercent?: number;
  /** Valves per group: 2 for pairs, 4 for quads, any whole number from 2. */
  groupSize: number;
  /** Double triodes: match on section 1 only, or on both sections, each against its own. */
  sections?: 'first' | 'both';
  /** Double triodes: valves whose sections differ by more than this are left out, %. */
  maxSectionImbalancePercent?: number;
  /** Double triodes: weight of each valve's own section imbalance in the distance (default 0). */
  sectionBalanceWeight?: number;
}

/** An operating point with everything filled in. */
export interface ResolvedPoint {
  /** Name shown in reports. */
  label: string;
  /** Anode voltage, V. */
  vaVolts: number;
  /** Screen voltage, V (null for triodes). */
  vg2Volts: number | null;
  /** Fixed bias: compare Ia and gm at vg1Volts. Equal current: compare gm at iaMilliamps. */
  kind: 'fixed-bias' | 'equal-current';
  /** Grid-1 voltage of a fixed-bias point, V (NaN at equal-current points). */
  vg1Volts: number;
  /** Anode current of an equal-current point, mA (NaN at fixed-bias points). */
  iaMilliamps: number;
}

/** The window grid with everything filled in. */
export interface ResolvedWindow {
  /** Anode voltages of the grid, V, ascending. */
  vaVolts: number[];
  /** Grid voltages of the grid, V, as given. */
  vg1Volts: number[];
  /** Lowest anode current that counts, mA. */
  iaMinMilliamps: number;
  /** Highest anode current that counts, mA. */
  iaMaxMilliamps: number;
}

/** Criteria checked and completed with defaults; what the matching code works from. */
export interface ResolvedCriteria {
  /** The type as given. */
  valveType: string;
  /** The catalogued type, where Emberline knows it. */
  type: ValveTypeData | null;
  /** Operating points (possibly none when a window is given). */
  points: ResolvedPoint[];
  /** Window grid, or null. */
  window: ResolvedWindow | null;
  /** Weight of Ia differences (0 when no fixed-bias point exists). */
  iaWeight: number;
  /** Weight of gm differences (0 when no point exists). */
  gmWeight: number;
  /** Weight of the curve agreement (0 without a window). */
  curveWeight: number;
  /** Largest acceptable spread, %. */
  tolerancePercent: number;
  /** Valves per group. */
  groupSize: number;
  /** Which sections are compared. */
  sections: 'first' | 'both';
  /** Section imbalance filter, % (Infinity: none). */
  maxSectionImbalancePercent: number;
  /** Weight of the section imbalance in the distance. */
  sectionBalanceWeight: number;
}

/** Screen voltages of a point and a family agree within the larger of 1 V and 1 %. */
export function screenVoltsAgree(a: number, b: number): boolean {
  return Math.abs(a - b) <= Math.max(1, 0.01 * Math.max(Math.abs(a), Math.abs(b)));
}

/** Checks criteria and fills in defaults; a refusal says what to fix. */
export function resolveCriteria(
  criteria: MatchingCriteria,
): { ok: true; criteria: ResolvedCriteria } | Refusal {
  const type = findValveType(criteria.valveType) ?? null;
  const screen = type ? hasScreen(type.valveClass) : null;
  const name = type?.designation ?? criteria.valveType;
  const n = criteria.groupSize;
  if (!Number.isInteger(n) || n < 2) {
    return refuse(`group size must be a whole number of 2 or more; got ${n}`);
  }
  let given = criteria.operatingPoints ?? [];
  // Neither points nor a window: match at the type's reference point, as grading does.
  if (criteria.operatingPoints === undefined && !criteria.window) {
    if (!type) {
      return refuse(
        `${name} is not in the catalogue: give the operating points or a window to match at`,
      );
    }
    const op = type.operatingPoints[0];
    given = [
      {
        label: 'typical',
        vaVolts: op.vaVolts,
        vg1Volts: op.vg1Volts,
        ...(op.vg2Volts === null ? {} : { vg2Volts: op.vg2Volts }),
      },
    ];
  }
  if (given.length === 0 && !criteria.window) {
    return refuse('give at least one operating point or a window to match at');
  }
  const points: ResolvedPoint[] = [];
  for (const [i, p] of given.entries()) {
    const label = p.label?.trim() || `point ${i + 1}`;
    const fixed = 'vg1Volts' in p;
    const equal = 'iaMilliamps' in p;
    if (fixed === equal) {
      return refuse(`${label}: give either Vg1 (fixed bias) or Ia (equal current), not both`);
    }
    const vg1 = fixed ? (p as FixedBiasPoint).vg1Volts : NaN;
    const ia = equal ? (p as EqualCurrentPoint).iaMilliamps : NaN;
    if (!(p.vaVolts > 0) || (fixed && !Number.isFinite(vg1)) || (equal && !(ia > 0))) {
      return refuse(`${label}: Va must be above 0 V, Vg1 a number and Ia above 0 mA`);
    }
    if (screen === true && !(typeof p.vg2Volts === 'number' && p.vg2Volts > 0)) {
      return refuse(`${label}: ${name} has a screen grid, so the point needs Vg2`);
    }
    if (screen === false && p.vg2Volts !== undefined && p.vg2Volts !== 0) {
      return refuse(`${label}: ${name} has no screen grid, so the point takes no Vg2`);
    }
    points.push({
      label,
      vaVolts: p.vaVolts,
      vg2Volts: typeof p.vg2Volts === 'number' && p.vg2Volts > 0 ? p.vg2Volts : null,
      kind: fixed ? 'fixed-bias' : 'equal-current',
      vg1Volts: vg1,
      iaMilliamps: ia,
    });
  }
  const window = resolveWindow(criteria.window, type, name);
  if (window && !window.ok) return window;
  const grid = window ? window.window : null;
  const weight = (w: number | undefined, fallback: number) => w ?? fallback;
  const iaWeight = points.some((p) => p.kind === 'fixed-bias') ? weight(criteria.iaWeight, 1) : 0;
  const gmWeight = points.length ? weight(criteria.gmWeight, 1) : 0;
  const curveWeight = grid ? weight(criteria.curveWeight, 1) : 0;
  const sectionBalanceWeight = criteria.sectionBalanceWeight ?? 0;
  for (const [what, w] of [
    ['Ia weight', iaWeight],
    ['gm weight', gmWeight],
    ['curve weight', curveWeight],
    ['section balance weight', sectionBalanceWeight],
  ] as const) {
    if (!(w >= 0 && Number.isFinite(w))) return refuse(`${what} must be 0 or more; got ${w}`);
  }
  if (iaWeight + gmWeight + curveWeight <= 0) {
    return refuse('at least one of the Ia, gm and curve weights must be above 0');
  }
  const tolerancePercent = criteria.tolerancePercent ?? DEFAULT_TOLERANCE_PERCENT;
  if (!(tolerancePercent > 0 && Number.isFinite(tolerancePercent))) {
    return refuse(`the tolerance must be above 0 %; got ${tolerancePercent}`);
  }
  const maxImbalance = criteria.maxSectionImbalancePercent ?? Number.POSITIVE_INFINITY;
  if (!(maxImbalance >= 0)) {
    return refuse(`the largest section imbalance must be 0 % or more; got ${maxImbalance}`);
  }
  const sections = criteria.sections ?? 'first';
  const usesSecond =
    sections === 'both' || Number.isFinite(maxImbalance) || sectionBalanceWeight > 0;
  if (type && type.sections < 2 && usesSecond) {
    return refuse(`${name} has one section: section matching and balance do not apply`);
  }
  return {
    ok: true,
    criteria: {
      valveType: criteria.valveType,
      type,
      points,
      window: grid,
      iaWeight,
      gmWeight,
      curveWeight,
      tolerancePercent,
      groupSize: n,
      sections,
      maxSectionImbalancePercent: maxImbalance,
      sectionBalanceWeight,
    },
  };
}

function resolveWindow(
  w: MatchWindow | undefined,
  type: ValveTypeData | null,
  name: string,
): { ok: true; window: ResolvedWindow } | Refusal | null {
  if (!w) return null;
  if (!(w.vaMinVolts >= 0 && w.vaMaxVolts > w.vaMinVolts)) {
    return refuse('window: Va must run from 0 V or more up to a higher voltage');
  }
  if (!(w.iaMinMilliamps >= 0 && w.iaMaxMilliamps > w.iaMinMilliamps)) {
    return refuse('window: Ia must run from 0 mA or more up to a higher current');
  }
  const steps = w.vaSteps ?? 13;
  if (!Number.isInteger(steps) || steps < 2) {
    return refuse(`window: the number of anode voltages must be a whole number of 2 or more`);
  }
  const vg1Volts = w.vg1Volts ?? (type ? defaultPlan(type).vg1Volts : null);
  if (!vg1Volts || vg1Volts.length === 0 || !vg1Volts.every(Number.isFinite)) {
    return refuse(`window: ${name} is not in the catalogue, so give the grid voltages to compare`);
  }
  const vaVolts = Array.from(
    { length: steps },
    (_, k) => w.vaMinVolts + ((w.vaMaxVolts - w.vaMinVolts) * k) / (steps - 1),
  );
  return {
    ok: true,
    window: {
      vaVolts,
      // The default plan's first step is -0 V; reports should read 0.
      vg1Volts: vg1Volts.map((v) => (v === 0 ? 0 : v)),
      iaMinMilliamps: w.iaMinMilliamps,
      iaMaxMilliamps: w.iaMaxMilliamps,
    },
  };
}
