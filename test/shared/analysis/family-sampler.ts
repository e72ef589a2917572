import type { SweepPoint } from '../../../shared/domain/sweep';
import { korenCurrents, type KorenModel } from '../../../shared/analysis/koren-model';
import type { AnodeSurface } from '../../../shared/analysis/anode-surface';

/** A seeded uniform generator on [0, 1) (mulberry32), so noisy fixtures are reproducible. */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** A standard normal deviate from a uniform generator (Box-Muller). */
export function gaussian(random: () => number): number {
  const u = 1 - random();
  const v = random();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
}

/** How a tracer samples a family in these tests. */
export interface SamplingPlan {
  /** Grid voltages, one curve each, V. */
  vg1Volts: number[];
  /** Screen voltage, V (0 for triodes). */
  vg2Volts?: number;
  /** Last anode voltage, V. */
  vaMaxVolts: number;
  /** Mean anode step, V; each step is drawn uniformly within ±40 % of it. */
  vaStepVolts: number;
  /** A curve ends at the first reading at or above this current, mA (the reading is kept). */
  iaMaxMilliamps: number;
  /** A curve ends at the first reading with Va·Ia at or above this, W. */
  paMaxWatts: number;
  /** Measurement noise, or none. */
  noise?: 'tracer';
}

/** Currents of a valve at (Va, Vg1, Vg2), mA. */
export type ValveLaw = (va: number, vg1: number, vg2: number) => { ia: number; ig2: number };

/**
 * Samples a family as a tracer would: unevenly spaced Va from 0, curves stopped at the current
 * or dissipation limit. Noise 'tracer': gaussian with sigma 0.2 % of full scale (the family's
 * current limit), then 12-bit quantisation of a converter range of twice that, clamped at zero.
 */
export function sampleFamily(law: ValveLaw, plan: SamplingPlan, seed = 1): SweepPoint[] {
  const random = seededRandom(seed);
  const fullScale = plan.iaMaxMilliamps;
  const range = 2 * fullScale;
  const lsb = range / 4096;
  const measure = (x: number) => {
    if (!plan.noise) return x;
    const noisy = x + 0.002 * fullScale * gaussian(random);
    return Math.min(Math.max(Math.round(noisy / lsb) * lsb, 0), range);
  };
  const vg2 = plan.vg2Volts ?? 0;
  const points: SweepPoint[] = [];
  plan.vg1Volts.forEach((vg1, curve) => {
    let va = 0;
    for (;;) {
      const truth = law(va, vg1, vg2);
      const ia = measure(truth.ia);
      const ig2 = measure(truth.ig2);
      points.push({
        seq: points.length,
        curve,
        vaVolts: va,
        vg1Volts: vg1,
        vg2Volts: vg2,
        iaMilliamps: ia,
        ig2Milliamps: ig2,
      });
      if (ia >= plan.iaMaxMilliamps || va * ia >= 1000 * plan.paMaxWatts) break;
      const next = va + plan.vaStepVolts * (0.6 + 0.8 * random());
      if (next > plan.vaMaxVolts) break;
      va = Math.round(next * 100) / 100;
    }
  });
  return points;
}

/** The ideal (Child-Langmuir) triode Ia = K·(Vg + Va/mu)^1.5, mA, K in mA/V^1.5. */
export function childLangmuir(k: number, mu: number): ValveLaw {
  return (va, vg) => {
    const x = vg + va / mu;
    return { ia: x > 0 ? k * x ** 1.5 : 0, ig2: 0 };
  };
}

/**
 * Operating points inside a sampled family, where the analysis is expected to be accurate: the
 * two curves around the point and one more on each side are all measured at its Va (with 5 % of
 * the Va span to spare before each curve ends, and Va at most 90 % of the sweep's end) and all conduct at least 10 % of the local full
 * scale there, the next lower curve at least 5 % (no cut-off among the curves the derivatives
 * lean on); Ia at the point is at least 20 % of it. The local full
 * scale is the current limit or the dissipation limit at that Va, whichever is lower. Va on a
 * grid of 5 % of the span from vaMinVolts (pentodes: above the knee), Vg1 on each curve and
 * half-way between neighbours.
 */
export function interiorPoints(
  law: ValveLaw,
  plan: SamplingPlan,
  vaMinVolts = 0.1 * plan.vaMaxVolts,
): [number, number][] {
  const vgs = [...plan.vg1Volts].sort((a, b) => a - b);
  const vg2 = plan.vg2Volts ?? 0;
  const span = plan.vaMaxVolts;
  const ends = vgs.map((vg) => {
    for (let va = 0; va <= span; va += span / 1000) {
      const ia = law(va, vg, vg2).ia;
      if (ia >= plan.iaMaxMilliamps || va * ia >= 1000 * plan.paMaxWatts) return va;
    }
    return span;
  });
  const out: [number, number][] = [];
  for (let step = 1; step <= 18; step++) {
    const va = (span * step) / 20;
    if (va < vaMinVolts) continue;
    const scale = Math.min(plan.iaMaxMilliamps, (1000 * plan.paMaxWatts) / va);
    for (let j = 1; j + 2 < vgs.length; j++) {
      const around = [j - 1, j, j + 1, j + 2];
      if (around.some((k) => ends[k] < va + 0.05 * span)) continue;
      if (around.some((k) => law(va, vgs[k], vg2).ia < 0.1 * scale)) continue;
      if (j >= 2 && law(va, vgs[j - 2], vg2).ia < 0.05 * scale) continue;
      for (const vg of [vgs[j], (vgs[j] + vgs[j + 1]) / 2]) {
        if (law(va, vg, vg2).ia >= 0.2 * scale) out.push([va, vg]);
      }
    }
  }
  return out;
}

/** A Koren model as a valve law (currents in mA). */
export function korenLaw(model: KorenModel): ValveLaw {
  return (va, vg1, vg2) => {
    const c = korenCurrents(model, va, vg1, vg2);
    return { ia: c.iaMilliamps, ig2: c.ig2Milliamps };
  };
}

/** The same points in a shuffled order, reproducibly. */
export function shuffled<T>(items: readonly T[], seed: number): T[] {
  const random = seededRandom(seed);
  const out = [...items];
  for (let i = out.length - 1; i > 0; i--) {
    const j = Math.floor(random() * (i + 1));
    [out[i], out[j]] = [out[j], out[i]];
  }
  return out;
}

/** A valve law as an analysis surface over a stated region (refusing outside, like data). */
export function lawSurface(
  law: ValveLaw,
  region: { vaMaxVolts: number; vg1MinVolts: number; vg1MaxVolts: number; vg2Volts?: number },
): AnodeSurface {
  const vg2 = region.vg2Volts ?? 0;
  const inGrid = (vg1: number) => vg1 >= region.vg1MinVolts && vg1 <= region.vg1MaxVolts;
  return {
    vg1Range: () => ({ minVolts: region.vg1MinVolts, maxVolts: region.vg1MaxVolts }),
    vaRangeAt: (vg1) =>
      inGrid(vg1)
        ? { ok: true, minVolts: 0, maxVolts: region.vaMaxVolts }
        : { ok: false, reason: `Vg1 ${vg1} V outside the test region` },
    currentsAt: (va, vg1) => {
      if (!inGrid(vg1) || va < 0 || va > region.vaMaxVolts) {
        return { ok: false, reason: `(${va} V, ${vg1} V) outside the test region` };
      }
      const c = law(va, vg1, vg2);
      return { ok: true, iaMilliamps: c.ia, ig2Milliamps: c.ig2 };
    },
  };
}
