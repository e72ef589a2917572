import type { AnodeFamily } from './anode-family';
import { estimate, type Estimate } from './estimate';
import { refuse, type Refusal } from './refusal';

/** gm at one operating point at nominal and at reduced heater voltage. */
export interface HeaterComparison {
  /** Always true: tells a result from a refusal. */
  ok: true;
  /** The operating point compared: anode and grid voltage, V. */
  vaVolts: number;
  /** Grid voltage, V. */
  vg1Volts: number;
  /** gm with the nominal heater, µS. */
  nominalGmMicrosiemens: Estimate;
  /** gm with the reduced heater, µS. */
  reducedGmMicrosiemens: Estimate;
  /** Change of gm, % of nominal (negative: gm fell). */
  changePercent: Estimate;
}

/**
 * The reduced-heater comparison: gm at the same (Va, Vg1) from a family swept at nominal heater
 * voltage and one swept at reduced heater voltage. A sound cathode's gm hardly moves; a worn
 * one's falls sharply (common practice, no single source). Refuses where either family cannot
 * give gm there.
 */
export function compareReducedHeater(
  nominal: AnodeFamily,
  reduced: AnodeFamily,
  vaVolts: number,
  vg1Volts: number,
): HeaterComparison | Refusal {
  const a = nominal.operatingPoint(vaVolts, vg1Volts);
  if (!a.ok) return refuse(`nominal heater: ${a.reason}`);
  const b = reduced.operatingPoint(vaVolts, vg1Volts);
  if (!b.ok) return refuse(`reduced heater: ${b.reason}`);
  const gn = a.gmMicrosiemens;
  const gr = b.gmMicrosiemens;
  const ratio = gr.value / gn.value;
  return {
    ok: true,
    vaVolts,
    vg1Volts,
    nominalGmMicrosiemens: gn,
    reducedGmMicrosiemens: gr,
    changePercent: estimate(
      100 * (ratio - 1),
      100 * ratio * Math.hypot(gn.uncertainty / gn.value, gr.uncertainty / gr.value),
    ),
  };
}
