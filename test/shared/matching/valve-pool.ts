import { refuse } from '../../../shared/analysis/refusal';
import { findValveType } from '../../../shared/catalog/valve-types';
import type { SweepPoint } from '../../../shared/domain/sweep';
import {
  korenPentodeIa,
  korenTriodeIa,
  type KorenPentodeParams,
  type KorenTriodeParams,
} from '../../../shared/physics/koren';
import type { MatchSurface } from '../../../shared/matching/match-surface';
import type { SurfaceValve } from '../../../shared/matching/valve-features';

/** A seeded uniform generator on [0, 1) (mulberry32), so every pool is reproducible. */
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

/** A standard normal deviate (Box-Muller). */
export function gaussian(random: () => number): number {
  const u = 1 - random();
  const v = random();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
}

/** Fisher-Yates shuffle with a seeded generator; returns a new array. */
export function shuffled<T>(xs: readonly T[], random: () => number): T[] {
  const out = [...xs];
  for (let i = out.length - 1; i > 0; i--) {
    const j = Math.floor(random() * (i + 1));
    [out[i], out[j]] = [out[j], out[i]];
  }
  return out;
}

/** One valve's Koren law: the published set of its type with individual factors applied. */
export type ValveLaw =
  | { kind: 'triode'; params: KorenTriodeParams }
  | { kind: 'pentode'; params: KorenPentodeParams; vg2Volts: number };

/** The published Koren set of a catalogued type (Koren, Glass Audio 8(5), 1996). */
export function publishedLaw(designation: '12AX7' | 'EL34', vg2Volts = 250): ValveLaw {
  const model = findValveType(designation)!.model!;
  return model.kind === 'triode'
    ? { kind: 'triode', params: { ...model.params } }
    : { kind: 'pentode', params: { ...model.params }, vg2Volts };
}

/**
 * An individual valve: emission (KG1, which scales Ia everywhere by 1/factor) and MU scaled
 * by the given factors. These are the two ways real valves of one type differ most.
 */
export function individual(law: ValveLaw, kg1Factor: number, muFactor = 1): ValveLaw {
  const params = { ...law.params, kg1: law.params.kg1 * kg1Factor, mu: law.params.mu * muFactor };
  return law.kind === 'triode'
    ? { kind: 'triode', params }
    : { kind: 'pentode', params: params as KorenPentodeParams, vg2Volts: law.vg2Volts };
}

/** Ia of a law, mA. */
export function lawIa(law: ValveLaw, va: number, vg1: number): number {
  return law.kind === 'triode'
    ? korenTriodeIa(law.params, va, vg1)
    : korenPentodeIa(law.params, va, vg1, law.vg2Volts);
}

/** gm of a law by a central difference, µS (the model is smooth; h = 1 mV). */
export function lawGm(law: ValveLaw, va: number, vg1: number): number {
  const h = 1e-3;
  return ((lawIa(law, va, vg1 + h) - lawIa(law, va, vg1 - h)) / (2 * h)) * 1000;
}

/**
 * A law as a matching surface, answering over a stated grid range: the exact model, for tests
 * of the combinatorics where the analysis of sampled families would only add time.
 */
export function lawSurface(law: ValveLaw, vg1MinVolts = -100, vg1MaxVolts = 0): MatchSurface {
  const vg2 = law.kind === 'pentode' ? law.vg2Volts : 0;
  const at = (va: number, vg1: number) => ({
    ok: true as const,
    vg1Volts: vg1,
    iaMilliamps: lawIa(law, va, vg1),
    gmMicrosiemens: lawGm(law, va, vg1),
  });
  return {
    vg2Volts: vg2,
    pointAt: (va, vg1) =>
      vg1 < vg1MinVolts || vg1 > vg1MaxVolts ? refuse('outside the grid range') : at(va, vg1),
    pointAtCurrent: (va, ia) => {
      let lo = vg1MinVolts;
      let hi = vg1MaxVolts;
      if (!(lawIa(law, va, lo) <= ia && lawIa(law, va, hi) >= ia)) return refuse('not reached');
      for (let i = 0; i < 80; i++) {
        const mid = (lo + hi) / 2;
        if (lawIa(law, va, mid) < ia) lo = mid;
        else hi = mid;
      }
      return at(va, (lo + hi) / 2);
    },
    iaAt: (va, vg1) => (vg1 < vg1MinVolts || vg1 > vg1MaxVolts ? null : lawIa(law, va, vg1)),
  };
}

/** How a family is sampled in these tests, as a tracer would within the type's ratings. */
export interface FamilyPlan {
  /** Grid voltages, one curve each, V. */
  vg1Volts: number[];
  /** Last anode voltage, V. */
  vaMaxVolts: number;
  /** Anode step, V. */
  vaStepVolts: number;
  /** A curve ends at the first reading at or above this current, mA. */
  iaMaxMilliamps: number;
  /** A curve ends at the first reading with Va·Ia at or above this, W. */
  paMaxWatts: number;
  /** Gaussian noise on Ia, in fractions of iaMaxMilliamps (0: none). */
  noiseFraction?: number;
}

/** 12AX7 plan as the catalogue's default plan has it: 0-300 V in 5 V, 0 to -4 V, 3 mA, 0.75 W. */
export const PLAN_12AX7: FamilyPlan = {
  vg1Volts: [0, -0.5, -1, -1.5, -2, -2.5, -3, -3.5, -4],
  vaMaxVolts: 300,
  vaStepVolts: 5,
  iaMaxMilliamps: 3,
  paMaxWatts: 0.75,
};

/** EL34 plan at Vg2 250 V: 0-400 V in 10 V, 0 to -25 V, 250 mA, 18.75 W (75 % of Pa max). */
export const PLAN_EL34: FamilyPlan = {
  vg1Volts: [0, -2.5, -5, -7.5, -10, -12.5, -15, -17.5, -20, -22.5, -25],
  vaMaxVolts: 400,
  vaStepVolts: 10,
  iaMaxMilliamps: 250,
  paMaxWatts: 18.75,
};

/** Samples a law's anode family, curves stopped at the current or dissipation limit. */
export function sampleFamily(law: ValveLaw, plan: FamilyPlan, seed = 1): SweepPoint[] {
  const random = seededRandom(seed);
  const sigma = (plan.noiseFraction ?? 0) * plan.iaMaxMilliamps;
  const vg2 = law.kind === 'pentode' ? law.vg2Volts : 0;
  const points: SweepPoint[] = [];
  plan.vg1Volts.forEach((vg1, curve) => {
    for (let va = 0; va <= plan.vaMaxVolts + 1e-9; va += plan.vaStepVolts) {
      const ia = Math.max(0, lawIa(law, va, vg1) + (sigma ? sigma * gaussian(random) : 0));
      points.push({
        seq: points.length,
        curve,
        vaVolts: va,
        vg1Volts: vg1,
        vg2Volts: vg2,
        iaMilliamps: ia,
        ig2Milliamps: 0,
      });
      if (ia >= plan.iaMaxMilliamps || va * ia >= 1000 * plan.paMaxWatts) break;
    }
  });
  return points;
}

/** A valve of a random pool: its law and the id it goes by. */
export interface PoolValve {
  /** Id, e.g. "v07". */
  id: string;
  /** Its law. */
  law: ValveLaw;
  /** Law of section 2, for double triodes. */
  law2?: ValveLaw;
}

/**
 * A pool of independent valves of one type: emission spread ±spread (uniform, in KG1) and a
 * tenth of that in MU, the way a box of new valves of one make differs.
 */
export function randomPool(
  base: ValveLaw,
  size: number,
  random: () => number,
  spread = 0.15,
): PoolValve[] {
  return Array.from({ length: size }, (_, i) => ({
    id: `v${String(i).padStart(2, '0')}`,
    law: individual(base, 1 + spread * (2 * random() - 1), 1 + 0.1 * spread * (2 * random() - 1)),
  }));
}

/** A pool valve as a matching surface valve (exact model). */
export function surfaceValve(v: PoolValve): SurfaceValve {
  return {
    id: v.id,
    label: `Valve ${v.id}`,
    section1: lawSurface(v.law),
    section2: v.law2 ? lawSurface(v.law2) : null,
  };
}
