/**
 * Small-signal figures of a common-cathode stage (textbook formulas; see Langford-Smith,
 * Radiotron Designer's Handbook, 4th ed., 1953). Units: kΩ, V, mA, µS.
 */

/** A common-cathode stage for gain. */
export interface CommonCathodeStage {
  /** Amplification factor of the valve at the operating point. */
  mu: number;
  /** Anode resistance at the operating point, kΩ. */
  raKiloohms: number;
  /** Anode load (AC), kΩ. */
  loadKiloohms: number;
  /** Cathode resistor, kΩ (default 0). */
  cathodeKiloohms?: number;
  /** Whether the cathode resistor is bypassed for signal (default true). */
  bypassed?: boolean;
}

/**
 * Voltage gain magnitude: mu·RL/(RL + ra) with the cathode bypassed, mu·RL/(RL + ra + (mu+1)·Rk)
 * with it unbypassed (current feedback).
 */
export function commonCathodeGain(stage: CommonCathodeStage): number {
  const rk = stage.bypassed === false ? (stage.cathodeKiloohms ?? 0) : 0;
  const { mu, raKiloohms: ra, loadKiloohms: rl } = stage;
  return (mu * rl) / (rl + ra + (mu + 1) * rk);
}

/** Cathode-bias resistor for a grid voltage at a cathode current, kΩ: Rk = -Vg1/Ik (V/mA). */
export function cathodeResistorKiloohms(vg1Volts: number, ikMilliamps: number): number {
  return -vg1Volts / ikMilliamps;
}

/** Amplification factor from gm (µS) and ra (kΩ): mu = gm·ra (µS·kΩ/1000). */
export function muFromGmRa(gmMicrosiemens: number, raKiloohms: number): number {
  return (gmMicrosiemens * raKiloohms) / 1000;
}
