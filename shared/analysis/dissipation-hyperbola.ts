/**
 * The anode dissipation limit as a curve to draw: Ia = Pa,max/Va, mA, at count anode voltages
 * evenly spaced from vaFromVolts to vaToVolts (V; vaFromVolts > 0), with Pa,max in W.
 */
export function dissipationHyperbola(
  paMaxWatts: number,
  vaFromVolts: number,
  vaToVolts: number,
  count = 50,
): { vaVolts: number; iaMilliamps: number }[] {
  const out = [];
  for (let n = 0; n < count; n++) {
    const va = vaFromVolts + ((vaToVolts - vaFromVolts) * n) / Math.max(count - 1, 1);
    out.push({ vaVolts: va, iaMilliamps: (1000 * paMaxWatts) / va });
  }
  return out;
}
