import type { SweepPlan, SweepPoint } from '../../shared/domain/sweep';

/**
 * Readings of an ideal triode, Ia = K·(Vg1 + Va/mu)^1.5 for a positive argument, else 0
 * (Child, Phys. Rev. 32, 1911; Langmuir, Phys. Rev. 2, 1913), without noise. Then
 * gm = 1.5·K·√x, ra = mu/gm and mu is exact: analytic check values for the analysis views.
 * K in mA/V^1.5; the plan gives the grid steps and the Va steps.
 */
export function childLangmuirPoints(k: number, mu: number, plan: SweepPlan): SweepPoint[] {
  const out: SweepPoint[] = [];
  plan.vg1Volts.forEach((vg1, curve) => {
    for (let va = plan.vaStartVolts; va <= plan.vaStopVolts + 1e-9; va += plan.vaStepVolts) {
      const x = vg1 + va / mu;
      out.push({
        seq: out.length,
        curve,
        vaVolts: va,
        vg1Volts: vg1,
        vg2Volts: 0,
        iaMilliamps: x > 0 ? k * x ** 1.5 : 0,
        ig2Milliamps: 0,
      });
    }
  });
  return out;
}

/** The ideal triode's small-signal figures at (Va, Vg1): mA, mA/V, kΩ. */
export function childLangmuirFigures(k: number, mu: number, vaVolts: number, vg1Volts: number) {
  const x = vg1Volts + vaVolts / mu;
  const gm = 1.5 * k * Math.sqrt(x);
  return { iaMilliamps: k * x ** 1.5, gmMilliampsPerVolt: gm, raKiloohms: mu / gm, mu };
}

/**
 * An anode-family plan for these readings: Va 0 to 450 V in 5 V steps, Vg1 0 to -3 V in
 * 0.25 V steps (a test choice).
 */
export const CHILD_LANGMUIR_PLAN: SweepPlan = {
  kind: 'anode',
  vaStartVolts: 0,
  vaStopVolts: 450,
  vaStepVolts: 5,
  vg1Volts: Array.from({ length: 13 }, (_, i) => -0.25 * i),
  vg2Volts: 0,
  heaterVolts: 12.6,
  iaMaxMilliamps: 10,
  paMaxWatts: 3,
  iaTripMilliamps: 12,
  warmupSeconds: 20,
  settleMs: 2,
};

/**
 * K chosen so that at Va 250 V, Vg1 -1 V (x = 1.5) a mu-100 triode has gm 1.25 mA/V, so
 * ra = 80 kΩ and Ia = 1.25 mA: the operating point of the team reference sheet's worked
 * common-cathode gain example (mu 100, ra 80 kΩ, RL 150 kΩ: A = 65.2).
 */
export const WORKED_K = 1.25 / (1.5 * Math.sqrt(1.5));
