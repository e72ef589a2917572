import { hasScreen } from '../../../shared/catalog/valve-types';
import { MATCH_TOLERANCES } from '../../../shared/matching/match-tolerances';
import {
  korenPentodeIa,
  korenTriodeIa,
  type KorenPentodeParams,
  type KorenTriodeParams,
} from '../../../shared/physics/koren';
import type { ValveTypeView } from '../core/valve-types-api';

/** An operating point of the form: V. */
export interface FormPoint {
  vaVolts: number;
  vg1Volts: number;
}

/** A curve window of the form: V, mA. */
export interface FormWindow {
  vaMinVolts: number;
  vaMaxVolts: number;
  iaMinMilliamps: number;
  iaMaxMilliamps: number;
}

/** Share of the default plan's current and dissipation limits a default point may use. */
const LIMIT_SHARE = 0.7;

/** Set sizes the form offers: pairs, quads, sixes and eights. */
export const GROUP_SIZES = [2, 4, 6, 8] as const;

/** Tolerance presets as the trade commonly uses them (common practice, no single source). */
export const TOLERANCE_PRESETS = [
  { label: 'Tight', percent: MATCH_TOLERANCES.tightPercent, note: 'common practice 2–3 %' },
  { label: 'Usual', percent: MATCH_TOLERANCES.usualPercent, note: 'common practice' },
  { label: 'Loose', percent: MATCH_TOLERANCES.loosePercent, note: 'common practice' },
] as const;

/** Whether the type has a screen grid, so its points need Vg2. */
export function typeHasScreen(type: ValveTypeView): boolean {
  return hasScreen(type.valveClass);
}

/** Whether the type has two sections, so section matching and balance apply. */
export function typeHasSections(type: ValveTypeView): boolean {
  return type.sections >= 2;
}

/** Screen voltage the type's sweeps are taken at, V (null for triodes). */
export function defaultScreenVolts(type: ValveTypeView): number | null {
  if (!typeHasScreen(type)) return null;
  if (type.defaultPlan.vg2Volts > 0) return type.defaultPlan.vg2Volts;
  return type.operatingPoints[0]?.vg2Volts ?? null;
}

/** The idle point: the type's published reference operating point. */
export function idleDefault(type: ValveTypeView): FormPoint {
  const op = type.operatingPoints[0];
  if (op) return { vaVolts: op.vaVolts, vg1Volts: op.vg1Volts };
  const plan = type.defaultPlan;
  return { vaVolts: roundTo(plan.vaStopVolts * 0.6, 10), vg1Volts: plan.vg1Volts[1] ?? 0 };
}

/**
 * A drive point of more current than idle that the type's default sweep still measures: at 60 %
 * of the idle Va, the least negative grid (in steps of the plan's grid step) whose published
 * model current stays within 70 % of the plan's current and dissipation limits. Types without
 * a model, or where no such grid exists, get the idle grid voltage at that lower Va.
 */
export function driveDefault(type: ValveTypeView): FormPoint {
  const idle = idleDefault(type);
  const plan = type.defaultPlan;
  const vaVolts = Math.max(roundTo(idle.vaVolts * 0.6, 10), 10);
  const limitMilliamps =
    LIMIT_SHARE * Math.min(plan.iaMaxMilliamps, (plan.paMaxWatts * 1000) / vaVolts);
  const model = type.model;
  const step = Math.abs(plan.vg1Volts[1] ?? 0) || Math.max(Math.abs(idle.vg1Volts) / 8, 0.5);
  if (model && idle.vg1Volts < 0) {
    const vg2 = defaultScreenVolts(type) ?? 0;
    const ia = (vg1: number) =>
      model.kind === 'pentode'
        ? korenPentodeIa(model.params as unknown as KorenPentodeParams, vaVolts, vg1, vg2)
        : korenTriodeIa(model.params as unknown as KorenTriodeParams, vaVolts, vg1);
    for (let vg1 = roundTo(idle.vg1Volts / 2, step); vg1 > idle.vg1Volts; vg1 -= step) {
      if (ia(vg1) <= limitMilliamps) return { vaVolts, vg1Volts: clean(vg1) };
    }
  }
  return { vaVolts, vg1Volts: idle.vg1Volts };
}

/**
 * The region around the idle point where curves are compared: Va from 40 % of the idle Va up
 * to it, Ia from a tenth of the idle current (clear of cut-off) to twice it, within the plan's
 * curve limit.
 */
export function windowDefault(type: ValveTypeView): FormWindow {
  const idle = idleDefault(type);
  const plan = type.defaultPlan;
  const idleMilliamps = type.operatingPoints[0]?.iaMilliamps ?? plan.iaMaxMilliamps / 4;
  return {
    vaMinVolts: roundTo(idle.vaVolts * 0.4, 10),
    vaMaxVolts: Math.min(idle.vaVolts, plan.vaStopVolts),
    iaMinMilliamps: significant(idleMilliamps / 10),
    iaMaxMilliamps: significant(Math.min(idleMilliamps * 2, plan.iaMaxMilliamps)),
  };
}

/** The usual tolerance, %. */
export const DEFAULT_TOLERANCE_PERCENT = MATCH_TOLERANCES.usualPercent;

function roundTo(x: number, step: number): number {
  return clean(Math.round(x / step) * step);
}

function significant(x: number): number {
  return Number(x.toPrecision(2));
}

/** Rounds away float dust and the minus of -0. */
function clean(x: number): number {
  return Math.round(x * 1000) / 1000 || 0;
}
