import type { z } from 'zod';
import {
  defaultPlan,
  hasScreen,
  limitsFromType,
  type ValveTypeData,
} from '../../shared/catalog/valve-types';
import type { PlanLimits } from '../../shared/domain/plan-check';
import type { KorenPentodeParams, KorenTriodeParams } from '../../shared/physics/koren';
import type { ValveTypeRecord } from './valve-type.repository';
import type { ValveTypeInput, valveTypeViewSchema } from './valve-type.schemas';

/** A type as the API shows it. */
export type ValveTypeView = Omit<z.output<typeof valveTypeViewSchema>, 'model'> &
  Pick<ValveTypeData, 'model'>;

/** Maps stored rows (snake_case) to the API shape (camelCase). */
export function toValveTypeView(record: ValveTypeRecord): ValveTypeView {
  const { type: t, ratings: r } = record;
  const model: ValveTypeData['model'] =
    t.model_kind === 'triode'
      ? {
          kind: 'triode',
          params: JSON.parse(t.model_params_json!) as KorenTriodeParams,
          source: t.model_source ?? '',
        }
      : t.model_kind === 'pentode'
        ? {
            kind: 'pentode',
            params: JSON.parse(t.model_params_json!) as KorenPentodeParams,
            source: t.model_source ?? '',
          }
        : null;
  const data: ValveTypeData & Omit<ValveTypeView, 'defaultPlan'> = {
    id: t.id,
    designation: t.designation,
    equivalents: JSON.parse(t.equivalents_json) as string[],
    valveClass: t.valve_class,
    base: t.base,
    sections: t.sections,
    heaterVolts: t.heater_volts,
    heaterAmps: t.heater_amps,
    operatingPoints: record.operatingPoints.map((p) => ({
      vaVolts: p.va_volts,
      vg2Volts: p.vg2_volts,
      vg1Volts: p.vg1_volts,
      iaMilliamps: p.ia_milliamps,
      ig2Milliamps: p.ig2_milliamps,
      gmMicrosiemens: p.gm_microsiemens,
      raKiloohms: p.ra_kiloohms,
      mu: p.mu,
      source: p.source,
      confidence: p.confidence,
    })),
    ratings: {
      vaMaxVolts: r.va_max_volts,
      vg2MaxVolts: r.vg2_max_volts,
      paMaxWatts: r.pa_max_watts,
      pg2MaxWatts: r.pg2_max_watts,
      ikMaxMilliamps: r.ik_max_milliamps,
      vhkMaxVolts: r.vhk_max_volts,
      source: r.source,
      confidence: r.confidence,
    },
    model,
    notes: t.notes,
    hasScreen: hasScreen(t.valve_class),
    hasModel: model !== null,
    hasNominalCurves: record.nominal !== null,
    sources: [],
    updatedAt: t.updated_at,
  };
  const cited = [
    ...data.operatingPoints.map((p) => p.source),
    r.source,
    ...(model ? [model.source] : []),
    ...(record.nominal ? [record.nominal.source] : []),
  ];
  data.sources = [...new Set(cited)];
  return { ...data, defaultPlan: defaultPlan(data) };
}

/** A view back as input, for merging a partial change into the whole. */
export function toValveTypeInput(view: ValveTypeView): ValveTypeInput {
  return {
    designation: view.designation,
    equivalents: view.equivalents,
    valveClass: view.valveClass,
    base: view.base,
    sections: view.sections,
    heaterVolts: view.heaterVolts,
    heaterAmps: view.heaterAmps,
    operatingPoints: view.operatingPoints,
    ratings: view.ratings,
    model: view.model,
    notes: view.notes,
  };
}

/**
 * Plan limits from a type's maximum ratings as stored: the catalog's rule (Va, Vg2, Pa, grid
 * not positive, heater within 10 %) plus the cathode current rating, where given, as the bound
 * on anode current (Ik = Ia + Ig2, so Ia can never exceed it).
 */
export function limitsOfType(view: ValveTypeView): PlanLimits {
  return {
    ...limitsFromType(view),
    iaMaxMilliamps: view.ratings.ikMaxMilliamps ?? Number.POSITIVE_INFINITY,
  };
}
