import { findValveType, type ValveTypeData } from '../shared/catalog/valve-types';
import {
  korenPentodeIa,
  korenPentodeIg2,
  korenTriodeIa,
  type KorenPentodeParams,
  type KorenTriodeParams,
} from '../shared/physics/koren';
import { SeededRandom } from './seeded-random';
import { formatValveSpec, makeValveSpec, parseValveSpec, type ValveSpec } from './valve-spec';

/** The model of one section of a simulated valve, with this individual's parameters. */
export type SectionModel =
  { kind: 'triode'; params: KorenTriodeParams } | { kind: 'pentode'; params: KorenPentodeParams };

/** Anode and screen current of a section at full emission, mA. */
export interface SectionCurrents {
  /** Anode current, mA. */
  iaMilliamps: number;
  /** Screen current, mA (0 for triodes). */
  ig2Milliamps: number;
}

/*
 * Spread of new valves around the data-sheet model. Common practice (no single source): new
 * valves spread roughly +-20-30 % in current around data-sheet values, while mu is set by the
 * geometry and stays within a few %. Deviations are gaussian with these standard deviations,
 * clipped at the stated bounds.
 */
const CURRENT_SIGMA = 0.12;
const CURRENT_BOUND = 0.3;
const MU_SIGMA = 0.015;
const MU_BOUND = 0.04;
const KNEE_SIGMA = 0.05;
const KNEE_BOUND = 0.12;
const KVB_SIGMA = 0.08;
const KVB_BOUND = 0.2;
const SCREEN_SIGMA = 0.15;
const SCREEN_BOUND = 0.4;
/* Section balance of a double triode: the second section differs from the first by a few %. */
const BALANCE_CURRENT_SIGMA = 0.025;
const BALANCE_CURRENT_BOUND = 0.07;
const BALANCE_MU_SIGMA = 0.006;
const BALANCE_MU_BOUND = 0.015;

/**
 * One individual valve: a catalog type with a Koren model, and per-valve parameter deviations
 * drawn from a PRNG seeded by "TYPE#SEED", so the same seed always gives the same valve. Seed 0
 * is the nominal valve: the published parameters, both sections alike.
 */
export class SimulatedValve {
  /** "TYPE#SEED". */
  readonly label: string;
  /** Catalog data of the type. */
  readonly type: ValveTypeData;
  /** Seed of this individual. */
  readonly seed: number;
  /** Model of each section; a plan measures section 0 (the data sheet's section 1). */
  readonly sections: readonly SectionModel[];

  private constructor(spec: ValveSpec) {
    const type = findValveType(spec.typeName);
    if (!type?.model) throw new Error(`valve type ${spec.typeName} cannot be simulated`);
    this.type = type;
    this.seed = spec.seed;
    this.label = formatValveSpec(spec);
    const model = type.model;
    const nominal: SectionModel =
      model.kind === 'triode'
        ? { kind: 'triode', params: { ...model.params } }
        : { kind: 'pentode', params: { ...model.params } };
    if (spec.seed === 0) {
      this.sections = Array.from({ length: type.sections }, () => cloneSection(nominal));
      return;
    }
    const rng = SeededRandom.fromText(this.label);
    const first = deviate(nominal, rng);
    const sections = [first];
    for (let i = 1; i < type.sections; i++) sections.push(balance(first, rng));
    this.sections = sections;
  }

  /** The valve for a spec or "TYPE#SEED" text; throws with a reason for unknown types. */
  static fromSpec(spec: ValveSpec | string): SimulatedValve {
    const checked =
      typeof spec === 'string' ? parseValveSpec(spec) : makeValveSpec(spec.typeName, spec.seed);
    return new SimulatedValve(checked);
  }

  /** Whether the valve has a screen grid (its screen current is measured). */
  get hasScreen(): boolean {
    return this.sections[0].kind === 'pentode';
  }

  /** Currents of a section at full emission, mA, at the given electrode voltages (V). */
  currents(section: number, vaVolts: number, vg1Volts: number, vg2Volts: number): SectionCurrents {
    const model = this.sections[section];
    if (!model) throw new Error(`${this.label} has no section ${section + 1}`);
    if (model.kind === 'triode') {
      return { iaMilliamps: korenTriodeIa(model.params, vaVolts, vg1Volts), ig2Milliamps: 0 };
    }
    const p = model.params;
    return {
      iaMilliamps: korenPentodeIa(p, vaVolts, vg1Volts, vg2Volts),
      ig2Milliamps: vg2Volts > 0 ? korenPentodeIg2(p, vg1Volts, vg2Volts) : 0,
    };
  }
}

function factor(rng: SeededRandom, sigma: number, bound: number): number {
  return 1 + Math.max(-bound, Math.min(bound, sigma * rng.gaussian()));
}

function cloneSection(s: SectionModel): SectionModel {
  return s.kind === 'triode'
    ? { kind: 'triode', params: { ...s.params } }
    : { kind: 'pentode', params: { ...s.params } };
}

/* Current scales as 1/KG1 in both models, so the current spread goes into KG1. */
function deviate(s: SectionModel, rng: SeededRandom): SectionModel {
  const current = factor(rng, CURRENT_SIGMA, CURRENT_BOUND);
  const mu = factor(rng, MU_SIGMA, MU_BOUND);
  const knee = factor(rng, KNEE_SIGMA, KNEE_BOUND);
  const kvb = factor(rng, KVB_SIGMA, KVB_BOUND);
  const screen = factor(rng, SCREEN_SIGMA, SCREEN_BOUND);
  const base = {
    mu: s.params.mu * mu,
    ex: s.params.ex,
    kg1: s.params.kg1 / current,
    kp: s.params.kp * knee,
    kvb: s.params.kvb * kvb,
  };
  if (s.kind === 'triode') return { kind: 'triode', params: base };
  return { kind: 'pentode', params: { ...base, kg2: s.params.kg2 / (current * screen) } };
}

function balance(s: SectionModel, rng: SeededRandom): SectionModel {
  const current = factor(rng, BALANCE_CURRENT_SIGMA, BALANCE_CURRENT_BOUND);
  const mu = factor(rng, BALANCE_MU_SIGMA, BALANCE_MU_BOUND);
  const out = cloneSection(s);
  out.params.kg1 /= current;
  out.params.mu *= mu;
  return out;
}
