import { hasScreen, limitsFromType, type ValveTypeData } from '../catalog/valve-types';
import { strictestLimits, type PlanLimits } from '../domain/plan-check';
import type { SweepPlan } from '../domain/sweep';
import type {
  CheckFeature,
  CheckPlan,
  ElectrodePair,
  LeakagePairSetting,
} from '../protocol/check-plan';
import { checkProblems } from './check-limits';
import { expectedStrappedMilliamps } from './expected-emission';
import { QUICK_TEST_PARTS, type QuickTestPart } from './quick-test-part';

/** Settings of a quick test a workshop may change; the defaults are below. */
export interface QuickTestOptions {
  /** Heater warm-up before the first reading, s. */
  warmupSeconds: number;
  /** Test voltage of the leakage and shorts check, V (heater-cathode: at most the Vhk rating). */
  leakageTestVolts: number;
  /** Wait after the heater is lowered, before the reduced-heater reading, s. */
  heaterSettleSeconds: number;
}

/**
 * Defaults. Warm-up 20 s: common practice, indirectly heated cathodes emit after about 10-20 s.
 * Heater settle 60 s: several times the cathode's thermal time constant (tens of seconds), so
 * the reading is of the cooler cathode, not of one still cooling. 100 V is our leakage voltage.
 */
export const DEFAULT_QUICK_TEST_OPTIONS: QuickTestOptions = {
  warmupSeconds: 20,
  leakageTestVolts: 100,
  heaterSettleSeconds: 60,
};

/** Heater reduction of the reduced-heater test: common practice, 10 % (6.3 V to about 5.7 V). */
export const REDUCED_HEATER_FACTOR = 0.9;

/** Wait before a step whose heater is already at temperature, s (supplies settle). */
const STEP_SETTLE_SECONDS = 2;

/** Candidate emission voltages, V, highest first: the highest the type can take is used. */
const EMISSION_VOLTS = [30, 20, 15, 10, 5];
/** Share of the rated anode dissipation a strapped emission reading may reach. */
const EMISSION_DISSIPATION_SHARE = 0.5;
/** Share of the current limit a sound valve's expected emission may reach. */
const EMISSION_CURRENT_SHARE = 0.4;

/** What one step of a quick test measures. */
export type QuickTestRole =
  'leakage' | 'gm' | 'grid-current' | 'emission' | 'gm-nominal-heater' | 'gm-reduced-heater';

/** One check of a quick test, with the part it serves. */
export interface QuickTestStep {
  /** Part the step belongs to. */
  part: QuickTestPart;
  /** What it measures. */
  role: QuickTestRole;
  /** The check sent to the bench. */
  check: CheckPlan;
}

/** The nominal figures a quick test is judged against, and where they come from. */
export interface QuickTestReference {
  /** Type designation. */
  valveType: string;
  /** Operating point: anode voltage, V. */
  vaVolts: number;
  /** Operating point: screen voltage, V (0 for triodes). */
  vg2Volts: number;
  /** Operating point: grid-1 voltage, V. */
  vg1Volts: number;
  /** Nominal heater voltage, V. */
  heaterVolts: number;
  /** Reduced heater voltage of the reduced-heater test, V. */
  reducedHeaterVolts: number;
  /** Data-sheet anode current at the operating point, mA. */
  iaMilliamps: number;
  /** Data-sheet gm at the operating point, uS (null where not published). */
  gmMicrosiemens: number | null;
  /** Source of the operating point, as the catalogue cites it. */
  source: string;
  /** Voltage of the emission check, V, or null when there is none. */
  emissionVolts: number | null;
  /** A sound valve's emission at emissionVolts by the type's published model, mA. */
  expectedEmissionMilliamps: number | null;
}

/** The steps of a quick test, the parts left out and why, and the reference figures. */
export interface QuickTestPlan {
  steps: QuickTestStep[];
  skipped: { part: QuickTestPart; reason: string }[];
  reference: QuickTestReference;
}

/** What planning a quick test needs. */
export interface QuickTestPlanInput {
  /** The valve type, with its first operating point as the reference. */
  type: ValveTypeData;
  /** Parts wanted (run in QUICK_TEST_PARTS order). */
  parts: readonly QuickTestPart[];
  /** Stricter of the bench's and the tracer's limits; the type's ratings are added here. */
  limits: PlanLimits;
  /** Optional functions the tracer announced. */
  features: readonly CheckFeature[];
  /** The tracer's highest leakage test voltage, V, or null. */
  leakageMaxVolts: number | null;
  /** Settings (defaults: DEFAULT_QUICK_TEST_OPTIONS). */
  options?: Partial<QuickTestOptions>;
}

/** The grid step either side of the operating point for gm, V: 5 % of the bias, at least 0.1 V. */
export function gmGridStepVolts(vg1Volts: number): number {
  return Math.max(0.1, Math.round(Math.abs(vg1Volts) * 0.05 * 10) / 10);
}

/**
 * Plans a quick test of a type within the type's maximum ratings and the given limits. A part
 * the tracer cannot do, or whose figures would break a limit, is left out with the reason.
 */
export function planQuickTest(input: QuickTestPlanInput): QuickTestPlan {
  const { type } = input;
  // A setting given as undefined keeps its default.
  const given = Object.entries(input.options ?? {}).filter(([, v]) => v !== undefined);
  const options: QuickTestOptions = { ...DEFAULT_QUICK_TEST_OPTIONS, ...Object.fromEntries(given) };
  const op = type.operatingPoints[0];
  if (!op) throw new Error(`valve type ${type.designation} has no typical operating point`);
  const limits = strictestLimits(input.limits, limitsFromType(type));
  const vg2 = op.vg2Volts ?? 0;
  const heater = type.heaterVolts;
  const reducedHeater = round2(heater * REDUCED_HEATER_FACTOR);
  const paMax = Math.min(type.ratings.paMaxWatts, limits.paMaxWatts);
  const iaMax = Math.min(limits.iaMaxMilliamps, round2(Math.max(3 * op.iaMilliamps, 2)));
  const iaTrip = Math.min(limits.iaMaxMilliamps, round2(iaMax * 1.5));
  const emissionVolts = chooseEmissionVolts(type, limits);
  const expectedEmission =
    emissionVolts === null ? null : expectedStrappedMilliamps(type, emissionVolts);

  const steps: QuickTestStep[] = [];
  const skipped: QuickTestPlan['skipped'] = [];
  let heated = false;
  /* The first step that heats the valve waits the whole warm-up; later ones only let the
   * supplies settle, the heater being hot already. */
  const warmup = (): number => {
    const seconds = heated ? STEP_SETTLE_SECONDS : options.warmupSeconds;
    heated = true;
    return seconds;
  };
  const transfer = (heaterVolts: number, warmupSeconds: number): SweepPlan => {
    const d = gmGridStepVolts(op.vg1Volts);
    const grids = [op.vg1Volts - d, op.vg1Volts, op.vg1Volts + d].filter(
      (v) => v >= limits.vg1MinVolts && v <= limits.vg1MaxVolts,
    );
    return {
      kind: 'transfer',
      vaStartVolts: op.vaVolts,
      vaStopVolts: op.vaVolts,
      vaStepVolts: 1,
      // Lowest current first: a curve that reaches its limit loses only its last point.
      vg1Volts: grids.map(round2),
      vg2Volts: vg2,
      heaterVolts,
      iaMaxMilliamps: iaMax,
      paMaxWatts: paMax,
      iaTripMilliamps: iaTrip,
      warmupSeconds,
      settleMs: 100,
    };
  };
  const add = (part: QuickTestPart, role: QuickTestRole, check: CheckPlan): boolean => {
    const problems = checkProblems(check, limits, input.leakageMaxVolts);
    if (problems.length > 0) {
      skipped.push({ part, reason: `outside the limits: ${problems.join('; ')}` });
      return false;
    }
    steps.push({ part, role, check });
    return true;
  };
  const lacks = (part: QuickTestPart, feature: CheckFeature): boolean => {
    if (input.features.includes(feature)) return false;
    skipped.push({ part, reason: `the tracer has no ${feature} function` });
    return true;
  };

  for (const part of QUICK_TEST_PARTS.filter((p) => input.parts.includes(p))) {
    switch (part) {
      case 'leakage': {
        if (lacks(part, 'leakage')) break;
        const volts = Math.min(
          options.leakageTestVolts,
          input.leakageMaxVolts ?? options.leakageTestVolts,
          limits.vaMaxVolts,
        );
        const pairs = leakagePairs(type, volts);
        add(part, 'leakage', {
          kind: 'leakage',
          heaterVolts: heater,
          warmupSeconds: warmup(),
          settleMs: 200,
          pairs,
        });
        break;
      }
      case 'gm':
        if (op.gmMicrosiemens === null) {
          skipped.push({ part, reason: `${type.designation} has no published gm to compare with` });
          break;
        }
        add(part, 'gm', { kind: 'transfer', plan: transfer(heater, warmup()) });
        break;
      case 'grid-current':
        if (lacks(part, 'grid-current')) break;
        add(part, 'grid-current', {
          kind: 'grid-current',
          vaVolts: op.vaVolts,
          vg1Volts: op.vg1Volts,
          vg2Volts: vg2,
          heaterVolts: heater,
          iaTripMilliamps: iaTrip,
          paMaxWatts: paMax,
          warmupSeconds: warmup(),
          settleMs: 200,
        });
        break;
      case 'emission':
        if (lacks(part, 'emission')) break;
        if (emissionVolts === null || expectedEmission === null) {
          skipped.push({
            part,
            reason: type.model
              ? `no emission voltage of ${EMISSION_VOLTS.join(', ')} V keeps ${type.designation} ` +
                'within half its rated dissipation'
              : `${type.designation} has no published model to give the expected emission`,
          });
          break;
        }
        add(part, 'emission', {
          kind: 'emission',
          vaVolts: emissionVolts,
          heaterVolts: heater,
          iaTripMilliamps: Math.min(limits.iaMaxMilliamps, round2(2 * expectedEmission)),
          paMaxWatts: paMax,
          warmupSeconds: warmup(),
          settleMs: 50,
        });
        break;
      case 'reduced-heater': {
        const hasNominal = steps.some((s) => s.role === 'gm');
        if (!hasNominal) {
          const ok = add(part, 'gm-nominal-heater', {
            kind: 'transfer',
            plan: transfer(heater, warmup()),
          });
          if (!ok) break;
        }
        add(part, 'gm-reduced-heater', {
          kind: 'transfer',
          plan: transfer(reducedHeater, options.heaterSettleSeconds),
        });
        break;
      }
    }
  }
  return {
    steps,
    skipped,
    reference: {
      valveType: type.designation,
      vaVolts: op.vaVolts,
      vg2Volts: vg2,
      vg1Volts: op.vg1Volts,
      heaterVolts: heater,
      reducedHeaterVolts: reducedHeater,
      iaMilliamps: op.iaMilliamps,
      gmMicrosiemens: op.gmMicrosiemens,
      source: op.source,
      emissionVolts,
      expectedEmissionMilliamps: expectedEmission === null ? null : round4(expectedEmission),
    },
  };
}

/**
 * Pairs of the leakage check: heater-cathode at the test voltage but no more than the type's
 * Vhk rating (left out where none is published, as for directly heated valves), the grid and
 * anode pairs, and the screen pairs of tetrodes and pentodes within the screen rating.
 */
function leakagePairs(type: ValveTypeData, volts: number): LeakagePairSetting[] {
  const out: LeakagePairSetting[] = [];
  const vhk = type.ratings.vhkMaxVolts;
  if (vhk !== null) out.push({ pair: 'heater-cathode', volts: Math.min(volts, Math.abs(vhk)) });
  const anode = Math.min(volts, type.ratings.vaMaxVolts);
  const grid: ElectrodePair[] = ['grid1-cathode', 'grid1-anode', 'anode-cathode'];
  for (const pair of grid) out.push({ pair, volts: anode });
  if (hasScreen(type.valveClass)) {
    const screen = Math.min(volts, type.ratings.vg2MaxVolts ?? volts);
    for (const pair of ['screen-cathode', 'screen-grid1', 'screen-anode'] as const) {
      out.push({ pair, volts: screen });
    }
  }
  return out;
}

/** The highest emission voltage whose expected current stays well inside the limits, V. */
function chooseEmissionVolts(type: ValveTypeData, limits: PlanLimits): number | null {
  for (const volts of EMISSION_VOLTS) {
    const ma = expectedStrappedMilliamps(type, volts);
    if (ma === null) return null;
    const watts = (volts * ma) / 1000;
    if (
      watts <= EMISSION_DISSIPATION_SHARE * type.ratings.paMaxWatts &&
      ma <= EMISSION_CURRENT_SHARE * limits.iaMaxMilliamps
    ) {
      return volts;
    }
  }
  return null;
}

function round2(x: number): number {
  return Math.round(x * 100) / 100;
}

function round4(x: number): number {
  return Math.round(x * 1e4) / 1e4;
}
