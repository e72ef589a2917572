import type { AnodeFamily } from '../../../shared/analysis/anode-family';
import type { KorenModel } from '../../../shared/analysis/koren-model';
import type { ValveClass } from '../../../shared/catalog/valve-types';
import type { ValveTypeView } from '../core/valve-types-api';

/** Where a model fit starts from, and a phrase saying so. */
export interface FitStart {
  /** Starting parameters; the fit keeps their kind. */
  model: KorenModel;
  /** E.g. "the published 12AX7 set (Koren, Glass Audio 8(5), 1996)". */
  source: string;
}

const SCREEN_CLASSES: readonly ValveClass[] = ['tetrode', 'beam-tetrode', 'pentode'];

/** Whether a type (or, without one, a family measured with a screen voltage) is a pentode. */
export function fitsAsPentode(type: ValveTypeView | null, vg2Volts: number): boolean {
  return type ? SCREEN_CLASSES.includes(type.valveClass) : vg2Volts > 0;
}

/**
 * Starting values for a Koren fit: the type's published set where it has one of the right kind;
 * otherwise middle-of-the-road values, with MU from the type's data sheet or (triodes) from the
 * measured curves, since the fit only searches MU within a factor of three of its start.
 */
export function fitStart(type: ValveTypeView | null, family: AnodeFamily): FitStart {
  const pentode = fitsAsPentode(type, family.vg2Volts);
  const published = type?.model;
  if (published && (published.kind === 'pentode') === pentode) {
    return {
      model:
        published.kind === 'pentode'
          ? { kind: 'pentode', params: { ...published.params } }
          : { kind: 'triode', params: { ...published.params } },
      source: `the published ${type.designation} set (${published.source})`,
    };
  }
  const sheetMu = type?.operatingPoints.find((p) => p.mu !== null)?.mu ?? null;
  const measuredMu = pentode ? null : measuredMuNearCentre(family);
  const mu = sheetMu ?? measuredMu ?? (pentode ? 10 : 20);
  const muFrom =
    sheetMu !== null ? 'the data sheet' : measuredMu !== null ? 'these curves' : 'a typical value';
  const kind = pentode ? 'pentode' : 'triode';
  return {
    model: pentode
      ? { kind: 'pentode', params: { mu, ex: 1.35, kg1: 1000, kg2: 4500, kp: 50, kvb: 20 } }
      : { kind: 'triode', params: { mu, ex: 1.4, kg1: 1000, kp: 300, kvb: 300 } },
    source: `typical ${kind} values with MU ${Number(mu.toPrecision(3))} from ${muFrom}`,
  };
}

/** mu of the middle curve at 70 % of its measured Va span, or null where the family refuses. */
function measuredMuNearCentre(family: AnodeFamily): number | null {
  const curve = family.curves[Math.floor(family.curves.length / 2)];
  const va = curve.vaMinVolts + 0.7 * (curve.vaMaxVolts - curve.vaMinVolts);
  const op = family.operatingPoint(va, curve.vg1Volts);
  return op.ok && op.mu.value > 0 && Number.isFinite(op.mu.value) ? op.mu.value : null;
}
