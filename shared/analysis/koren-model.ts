import {
  korenPentodeIa,
  korenPentodeIg2,
  korenTriodeIa,
  type KorenPentodeParams,
  type KorenTriodeParams,
} from '../physics/koren';

/** A Koren model of either kind with its parameters (Koren, Glass Audio 8(5), 1996). */
export type KorenModel =
  { kind: 'triode'; params: KorenTriodeParams } | { kind: 'pentode'; params: KorenPentodeParams };

/** Anode and screen current of a Koren model, mA, at Va, Vg1, Vg2 (V; Vg2 unused by triodes). */
export function korenCurrents(
  model: KorenModel,
  vaVolts: number,
  vg1Volts: number,
  vg2Volts: number,
): { iaMilliamps: number; ig2Milliamps: number } {
  if (model.kind === 'triode') {
    return { iaMilliamps: korenTriodeIa(model.params, vaVolts, vg1Volts), ig2Milliamps: 0 };
  }
  return {
    iaMilliamps: korenPentodeIa(model.params, vaVolts, vg1Volts, vg2Volts),
    ig2Milliamps: korenPentodeIg2(model.params, vg1Volts, vg2Volts),
  };
}
