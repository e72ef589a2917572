import type { KorenModel } from './koren-model';

/**
 * Derivatives of a Koren model's anode current with respect to the logarithms of its
 * parameters, mA: [∂Ia/∂ln MU, ∂Ia/∂ln EX, ∂Ia/∂ln KG1, ∂Ia/∂ln KP, ∂Ia/∂ln KVB], at (Va, Vg1,
 * Vg2) in V. Analytic, for the least-squares fit (which runs in log-parameter space). KG2 does
 * not enter the anode current.
 */
export function korenGradient(
  model: KorenModel,
  iaMilliamps: number,
  vaVolts: number,
  vg1Volts: number,
  vg2Volts: number,
): [number, number, number, number, number] {
  const { mu, ex, kp, kvb } = model.params;
  if (!(iaMilliamps > 0)) return [0, 0, 0, 0, 0];
  // E1 = (scale/KP)·softplus(z), z = KP·q; scale is Va (triode) or Vg2 (pentode).
  const triode = model.kind === 'triode';
  const r = triode ? Math.sqrt(kvb + vaVolts * vaVolts) : vg2Volts;
  const q = 1 / mu + vg1Volts / r;
  const z = kp * q;
  const sp = z > 30 ? z : Math.log1p(Math.exp(z));
  const sg = 1 / (1 + Math.exp(-z));
  const e1 = ((triode ? vaVolts : vg2Volts) / kp) * sp;
  // d ln E1 / d ln p, using scale·sigmoid/E1 = KP·sigmoid/softplus.
  const ratio = (kp * sg) / sp;
  const dMu = -ratio / mu;
  const dKp = ratio * q - 1;
  // KVB: in the triode it softens Vg/sqrt(KVB + Va²) inside E1; in the pentode it is the knee
  // of atan(Va/KVB), outside E1.
  let dKvb: number;
  if (triode) {
    dKvb = ex * ((-ratio * vg1Volts * kvb) / (2 * r * r * r));
  } else {
    const u = vaVolts / kvb;
    const a = Math.atan(u);
    dKvb = a > 0 ? -u / (1 + u * u) / a : 0;
  }
  return [
    iaMilliamps * ex * dMu,
    iaMilliamps * ex * Math.log(e1),
    -iaMilliamps,
    iaMilliamps * ex * dKp,
    iaMilliamps * dKvb,
  ];
}
