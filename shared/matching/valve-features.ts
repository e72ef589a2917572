import type { Refusal } from '../analysis/refusal';
import type { MatchSurface } from './match-surface';
import { screenVoltsAgree, type ResolvedCriteria } from './matching-criteria';

/** A valve to match, its sections already turned into surfaces. */
export interface SurfaceValve {
  /** Unique id; ties anywhere in matching are broken by it. */
  id: string;
  /** Label shown to the user. */
  label: string;
  /** Designation the valve was catalogued under, if known: checked against the criteria. */
  valveType?: string;
  /** Section 1 (the only section of single valves). */
  section1: MatchSurface;
  /** Section 2 of double triodes, where measured. */
  section2?: MatchSurface | null;
}

/** Ia, gm and Vg1 of one section at one operating point. V, mA, µS. */
export interface PointReading {
  /** Grid-1 voltage, V. */
  vg1Volts: number;
  /** Anode current, mA. */
  iaMilliamps: number;
  /** Mutual conductance, µS. */
  gmMicrosiemens: number;
}

/** What one section contributes to matching. */
export interface SectionReadings {
  /** One reading per operating point, in the order of the criteria. */
  points: PointReading[];
  /** Ia at the window grid (Va outer, Vg1 inner), mA; NaN where the family does not answer. */
  windowIaMilliamps: Float64Array;
}

/** Everything matching needs of one valve. Extract once per valve and criteria, then group. */
export interface ValveFeatures {
  /** Unique id. */
  id: string;
  /** Label shown to the user. */
  label: string;
  /** Section 1 readings. */
  section1: SectionReadings;
  /** Section 2 readings, or null where not measured (or not readable at the points). */
  section2: SectionReadings | null;
  /** Why section 2 could not be read, where it was given but failed. */
  section2Problem: string | null;
}

/** Why a valve cannot take part, with a reason a user can act on. */
export interface FeatureRefusal extends Refusal {
  /** 'no-data': the family does not answer; 'wrong-type': catalogued as another type. */
  kind: 'no-data' | 'wrong-type';
}

/** Reads a valve at the operating points and over the window of the criteria. */
export function extractFeatures(
  valve: SurfaceValve,
  criteria: ResolvedCriteria,
): { ok: true; features: ValveFeatures } | FeatureRefusal {
  if (valve.valveType !== undefined && !sameType(valve.valveType, criteria)) {
    const wanted = criteria.type?.designation ?? criteria.valveType;
    return {
      ok: false,
      kind: 'wrong-type',
      reason: `catalogued as ${valve.valveType}, not ${wanted}`,
    };
  }
  const first = readSection(valve.section1, criteria);
  if (!first.ok) return { ok: false, kind: 'no-data', reason: first.reason };
  let section2: SectionReadings | null = null;
  let section2Problem: string | null = null;
  if (valve.section2) {
    const second = readSection(valve.section2, criteria);
    if (second.ok) section2 = second.readings;
    else section2Problem = `section 2: ${second.reason}`;
  }
  return {
    ok: true,
    features: {
      id: valve.id,
      label: valve.label,
      section1: first.readings,
      section2,
      section2Problem,
    },
  };
}

function sameType(name: string, criteria: ResolvedCriteria): boolean {
  const key = name.trim().toUpperCase();
  const t = criteria.type;
  if (!t) return key === criteria.valveType.trim().toUpperCase();
  return [t.designation, ...t.equivalents].some((d) => d.toUpperCase() === key);
}

function readSection(
  surface: MatchSurface,
  criteria: ResolvedCriteria,
): { ok: true; readings: SectionReadings } | Refusal {
  const points: PointReading[] = [];
  for (const p of criteria.points) {
    if (p.vg2Volts !== null && !screenVoltsAgree(p.vg2Volts, surface.vg2Volts)) {
      return {
        ok: false,
        reason:
          `${p.label}: the family was measured at Vg2 ${round(surface.vg2Volts)} V, ` +
          `the point asks for ${round(p.vg2Volts)} V`,
      };
    }
    const r =
      p.kind === 'fixed-bias'
        ? surface.pointAt(p.vaVolts, p.vg1Volts)
        : surface.pointAtCurrent(p.vaVolts, p.iaMilliamps);
    if (!r.ok) return { ok: false, reason: `${p.label}: ${r.reason}` };
    points.push({
      vg1Volts: r.vg1Volts,
      iaMilliamps: r.iaMilliamps,
      gmMicrosiemens: r.gmMicrosiemens,
    });
  }
  const w = criteria.window;
  const windowIaMilliamps = new Float64Array(w ? w.vaVolts.length * w.vg1Volts.length : 0);
  if (w) {
    let k = 0;
    let inside = 0;
    for (const va of w.vaVolts) {
      for (const vg1 of w.vg1Volts) {
        const ia = surface.iaAt(va, vg1);
        windowIaMilliamps[k++] = ia ?? NaN;
        if (ia !== null && ia >= w.iaMinMilliamps && ia <= w.iaMaxMilliamps) inside++;
      }
    }
    if (inside === 0) {
      return { ok: false, reason: 'the family does not reach the window anywhere on its grid' };
    }
  }
  return { ok: true, readings: { points, windowIaMilliamps } };
}

function round(x: number): number {
  return Math.round(x * 10) / 10;
}
