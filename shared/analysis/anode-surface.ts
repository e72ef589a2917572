import { korenCurrents, type KorenModel } from './koren-model';
import { formatNumber, formatSpanVolts, refuse, type Refusal } from './refusal';

/** Anode and screen current at one point, mA. */
export interface Currents {
  /** Always true: tells a result from a refusal. */
  ok: true;
  /** Anode current, mA. */
  iaMilliamps: number;
  /** Screen current, mA (0 for triodes). */
  ig2Milliamps: number;
}

/** A span of anode voltage, V. */
export interface VaSpan {
  /** Always true: tells a result from a refusal. */
  ok: true;
  /** Lowest anode voltage, V. */
  minVolts: number;
  /** Highest anode voltage, V. */
  maxVolts: number;
}

/**
 * Anode and screen current as a function of Va and Vg1 over a known region: a measured family
 * or a model. The load-line analysis works on this, so it runs on either.
 */
export interface AnodeSurface {
  /** Most negative and most positive grid voltage of the region, V. */
  vg1Range(): { minVolts: number; maxVolts: number };
  /** Anode-voltage span of the region at a grid voltage, V, or why there is none. */
  vaRangeAt(vg1Volts: number): VaSpan | Refusal;
  /** Currents at (Va, Vg1), or a refusal outside the region. */
  currentsAt(vaVolts: number, vg1Volts: number): Currents | Refusal;
}

/** Region over which a model surface answers. */
export interface ModelRegion {
  /** Screen voltage for pentodes, V. */
  vg2Volts?: number;
  /** Highest anode voltage, V. */
  vaMaxVolts: number;
  /** Most negative grid voltage, V. */
  vg1MinVolts: number;
  /** Most positive grid voltage, V. */
  vg1MaxVolts: number;
}

/** A Koren model as a surface over a stated region (it refuses outside it, like measured data). */
export function korenSurface(model: KorenModel, region: ModelRegion): AnodeSurface {
  const vg2 = region.vg2Volts ?? 0;
  const gridOk = (vg1: number) => vg1 >= region.vg1MinVolts && vg1 <= region.vg1MaxVolts;
  const gridReason = (vg1: number) =>
    `Vg1 ${formatNumber(vg1)} V is outside the model's stated grid range ` +
    `(${formatSpanVolts(region.vg1MinVolts, region.vg1MaxVolts)})`;
  return {
    vg1Range: () => ({ minVolts: region.vg1MinVolts, maxVolts: region.vg1MaxVolts }),
    vaRangeAt: (vg1) =>
      gridOk(vg1)
        ? { ok: true, minVolts: 0, maxVolts: region.vaMaxVolts }
        : refuse(gridReason(vg1)),
    currentsAt: (va, vg1) => {
      if (!gridOk(vg1)) return refuse(gridReason(vg1));
      if (va < 0 || va > region.vaMaxVolts) {
        return refuse(
          `Va ${formatNumber(va)} V is outside the model's stated range ` +
            `(${formatSpanVolts(0, region.vaMaxVolts)})`,
        );
      }
      return { ok: true, ...korenCurrents(model, va, vg1, vg2) };
    },
  };
}
