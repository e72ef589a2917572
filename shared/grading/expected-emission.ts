import type { ValveTypeData } from '../catalog/valve-types';
import { korenPentodeIa, korenPentodeIg2, korenTriodeIa } from '../physics/koren';

/**
 * Cathode current of a type's published model with every grid strapped to the anode, mA, at
 * `vaVolts`: the triode model at Vg = Va; the pentode model's Ia + Ig2 at Vg1 = Vg2 = Va. This
 * is the model taken beyond the region it was fitted to (positive grids), so it serves as the
 * figure a sound valve of the type is compared with, not as a data-sheet value. Null without a
 * published model.
 */
export function expectedStrappedMilliamps(type: ValveTypeData, vaVolts: number): number | null {
  const model = type.model;
  if (!model) return null;
  if (model.kind === 'triode') return korenTriodeIa(model.params, vaVolts, vaVolts);
  return (
    korenPentodeIa(model.params, vaVolts, vaVolts, vaVolts) +
    korenPentodeIg2(model.params, vaVolts, vaVolts)
  );
}
