import type { SweepPlan, SweepPoint } from '../domain/sweep';
import type { DeviceMessage } from './messages';

/*
 * Checks: short measurements the quick tests are made of, run on the tracer one at a time like
 * a sweep (an id, an ACK, a warm-up, result lines, an END). Three of them need the optional
 * protocol extensions of PROTOCOL.md (LKG, EMI, GAS); a transfer check is a plain SWP.
 * Units are in the names: V, mA, uA (microamps), W, s, ms, kOhm.
 */

/** Electrode pairs the leakage and shorts check can measure between. */
export const ELECTRODE_PAIRS = [
  'heater-cathode',
  'grid1-cathode',
  'grid1-anode',
  'anode-cathode',
  'screen-cathode',
  'screen-grid1',
  'screen-anode',
] as const;

/** One pair of electrodes, e.g. 'heater-cathode'. */
export type ElectrodePair = (typeof ELECTRODE_PAIRS)[number];

/** Optional tracer functions beyond protocol version 1's core, as announced in EXT. */
export const CHECK_FEATURES = ['leakage', 'emission', 'grid-current', 'section-select'] as const;

/** One optional tracer function. */
export type CheckFeature = (typeof CHECK_FEATURES)[number];

/** What a tracer announces in its EXT answer. */
export interface DeviceExtensions {
  /** Optional functions it supports. */
  features: CheckFeature[];
  /** Resistance in the grid-1 feed through which the grid-current check measures, kOhm. */
  gridFeedKiloohms: number;
  /** Highest test voltage of the leakage check, V. */
  leakageMaxVolts: number;
}

/** One pair and the voltage to test it at. */
export interface LeakagePairSetting {
  /** Electrodes to measure between. */
  pair: ElectrodePair;
  /** Test voltage, V (magnitude; the tracer applies it with the polarity of normal operation). */
  volts: number;
}

/**
 * Leakage and shorts: with the heater on, each pair in turn gets its test voltage through the
 * tracer's current-limiting resistor while the other electrodes float; the current is read.
 */
export interface LeakageCheckPlan {
  kind: 'leakage';
  /** Heater voltage, V. */
  heaterVolts: number;
  /** Heater warm-up before the first pair, s (leakage is measured hot). */
  warmupSeconds: number;
  /** Settling time after the test voltage is applied to each pair, ms. */
  settleMs: number;
  /** Pairs in the order to test them (1 to 7, each at most once). */
  pairs: LeakagePairSetting[];
}

/**
 * Emission: every grid strapped to the anode (the valve as a diode) at a low anode voltage; one
 * reading of the anode current (then the whole cathode current).
 */
export interface EmissionCheckPlan {
  kind: 'emission';
  /** Anode voltage, V (the grids are at the same voltage). */
  vaVolts: number;
  /** Heater voltage, V. */
  heaterVolts: number;
  /** Trip current: a reading above it ends the check with LIMIT, mA. */
  iaTripMilliamps: number;
  /** Trip dissipation: a reading with Va x Ia above it ends the check with LIMIT, W. */
  paMaxWatts: number;
  /** Heater warm-up before the reading, s. */
  warmupSeconds: number;
  /** Settling time before the reading, ms. */
  settleMs: number;
}

/**
 * Grid current: the valve at an operating point with grid 1 fed through the tracer's grid-feed
 * resistor; one reading of Ia and of the grid-1 current (reverse current means gas).
 */
export interface GridCurrentCheckPlan {
  kind: 'grid-current';
  /** Anode voltage, V. */
  vaVolts: number;
  /** Grid-1 voltage as set at the supply end of the grid-feed resistor, V. */
  vg1Volts: number;
  /** Screen voltage, V (0 for triodes). */
  vg2Volts: number;
  /** Heater voltage, V. */
  heaterVolts: number;
  /** Trip current, mA. */
  iaTripMilliamps: number;
  /** Trip dissipation, W. */
  paMaxWatts: number;
  /** Heater warm-up before the reading, s. */
  warmupSeconds: number;
  /** Settling time before the reading, ms. */
  settleMs: number;
}

/** A short transfer sweep run as a check (a plain SWP on the wire), e.g. for gm. */
export interface TransferCheckPlan {
  kind: 'transfer';
  /** The sweep plan; its kind is 'transfer'. */
  plan: SweepPlan;
}

/** Any check the hub can ask a bench for. */
export type CheckPlan =
  LeakageCheckPlan | EmissionCheckPlan | GridCurrentCheckPlan | TransferCheckPlan;

/** Kind of a check. */
export type CheckKind = CheckPlan['kind'];

/** One reading of a leakage check. */
export interface LeakageReading {
  kind: 'leakage';
  /** Electrodes measured between. */
  pair: ElectrodePair;
  /** Test voltage applied, V. */
  volts: number;
  /** Current, uA (the full-scale value when overRange). */
  microamps: number;
  /** Whether the current was beyond the measuring range: a short. */
  overRange: boolean;
}

/** The reading of an emission check. */
export interface EmissionReading {
  kind: 'emission';
  /** Anode (and strapped grids) voltage, V. */
  vaVolts: number;
  /** Current, mA (the full-scale value when overRange). */
  milliamps: number;
  /** Whether the current was beyond the measuring range. */
  overRange: boolean;
}

/** The reading of a grid-current check. */
export interface GridCurrentReading {
  kind: 'grid-current';
  /** Anode voltage, V. */
  vaVolts: number;
  /** Grid-1 supply voltage, V. */
  vg1Volts: number;
  /** Screen voltage, V. */
  vg2Volts: number;
  /** Anode current, mA. */
  iaMilliamps: number;
  /** Grid-1 current, uA; negative is reverse (positive-ion) current, the sign of gas. */
  ig1Microamps: number;
  /** Grid-feed resistance the current flowed through, kOhm. */
  gridKiloohms: number;
}

/** One point of a transfer check. */
export type PointReading = { kind: 'point' } & SweepPoint;

/** Any reading a check reports. */
export type CheckReading = LeakageReading | EmissionReading | GridCurrentReading | PointReading;

/** The optional feature a check kind needs, or null for a plain SWP. */
export function featureOfCheck(kind: CheckKind): CheckFeature | null {
  return kind === 'transfer' ? null : kind;
}

/** A check as the tracer command that runs it (the same id on the wire). */
export function checkCommand(checkId: number, check: CheckPlan): CheckCommandOf {
  switch (check.kind) {
    case 'transfer':
      return { type: 'sweep', sweepId: checkId, plan: check.plan };
    case 'leakage': {
      const { kind: _kind, ...plan } = check;
      return { type: 'leakage', checkId, plan };
    }
    case 'emission': {
      const { kind: _kind, ...plan } = check;
      return { type: 'emission', checkId, plan };
    }
    case 'grid-current': {
      const { kind: _kind, ...plan } = check;
      return { type: 'grid-current', checkId, plan };
    }
  }
}

/** Tracer commands that start a check. */
export type CheckCommandOf =
  | { type: 'sweep'; sweepId: number; plan: SweepPlan }
  | { type: 'leakage'; checkId: number; plan: Omit<LeakageCheckPlan, 'kind'> }
  | { type: 'emission'; checkId: number; plan: Omit<EmissionCheckPlan, 'kind'> }
  | { type: 'grid-current'; checkId: number; plan: Omit<GridCurrentCheckPlan, 'kind'> };

/** Tag of the command that starts a check, as its ACK and NAK lines name it. */
export function checkCommandTag(kind: CheckKind): 'SWP' | 'LKG' | 'EMI' | 'GAS' {
  return ({ transfer: 'SWP', leakage: 'LKG', emission: 'EMI', 'grid-current': 'GAS' } as const)[
    kind
  ];
}

/** A device result line as a check reading with its check id, or null for other messages. */
export function checkReadingOf(
  m: DeviceMessage,
): { checkId: number; reading: CheckReading } | null {
  switch (m.type) {
    case 'point': {
      const { type: _type, sweepId, ...point } = m;
      return { checkId: sweepId, reading: { kind: 'point', ...point } };
    }
    case 'leakage': {
      const { type: _type, checkId, ...rest } = m;
      return { checkId, reading: { kind: 'leakage', ...rest } };
    }
    case 'emission': {
      const { type: _type, checkId, ...rest } = m;
      return { checkId, reading: { kind: 'emission', ...rest } };
    }
    case 'grid-current': {
      const { type: _type, checkId, ...rest } = m;
      return { checkId, reading: { kind: 'grid-current', ...rest } };
    }
    default:
      return null;
  }
}
