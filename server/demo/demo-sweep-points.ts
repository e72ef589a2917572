import { defaultPlan } from '../../shared/catalog/valve-types';
import { readingEndsCurve } from '../../shared/domain/plan-check';
import { anodeSteps, type SweepPlan, type SweepPoint } from '../../shared/domain/sweep';
import { SeededRandom } from '../../simulator/seeded-random';
import { SimulatedValve } from '../../simulator/simulated-valve';
import { NOISE_FLOOR_MILLIAMPS } from '../../simulator/valve-socket';

/*
 * Relative noise of a current reading (standard deviation), as the simulated socket uses; the
 * socket keeps its own constant private, so it is repeated here.
 */
const NOISE_RELATIVE = 0.0015;

/** A complete anode-family sweep of one simulated valve, as the tracer would have sent it. */
export interface DemoSweep {
  /** The type's default plan the sweep ran. */
  plan: SweepPlan;
  /** Points in seq order, seq 0.. contiguous. */
  points: SweepPoint[];
}

/**
 * Runs the type's default anode-family plan (on section 1, or section 2 of a double triode) on
 * the individual valve "TYPE#SEED" straight on
 * the valve physics (sound cathode, fully warm), with seeded reading noise. Each curve ends at
 * the first reading that reaches the plan's current or dissipation limit, as on the tracer.
 */
export function demoSweepPoints(valveSpec: string, section: 1 | 2 = 1): DemoSweep {
  const valve = SimulatedValve.fromSpec(valveSpec);
  const plan = section === 2 ? { ...defaultPlan(valve.type), section } : defaultPlan(valve.type);
  const noise = SeededRandom.fromText(`${valve.label}/demo-noise${section === 2 ? '/2' : ''}`);
  const noisy = (milliamps: number) => {
    const sd = NOISE_RELATIVE * milliamps + NOISE_FLOOR_MILLIAMPS;
    return Math.max(0, Math.round((milliamps + noise.gaussian() * sd) * 1e4) / 1e4);
  };
  const points: SweepPoint[] = [];
  const steps = anodeSteps(plan);
  plan.vg1Volts.forEach((vg1Volts, curve) => {
    for (const vaVolts of steps) {
      const c = valve.currents(section - 1, vaVolts, vg1Volts, plan.vg2Volts);
      const iaMilliamps = noisy(c.iaMilliamps);
      const ig2Milliamps = valve.hasScreen && plan.vg2Volts > 0 ? noisy(c.ig2Milliamps) : 0;
      points.push({
        seq: points.length,
        curve,
        vaVolts,
        vg1Volts,
        vg2Volts: plan.vg2Volts,
        iaMilliamps,
        ig2Milliamps,
      });
      if (readingEndsCurve(plan, vaVolts, iaMilliamps)) break;
    }
  });
  return { plan, points };
}
