import type { DeviceCapabilities, SweepEndReason, SweepPlan } from '../domain/sweep';
import {
  CHECK_FEATURES,
  ELECTRODE_PAIRS,
  type CheckFeature,
  type DeviceExtensions,
  type ElectrodePair,
  type EmissionCheckPlan,
  type GridCurrentCheckPlan,
  type LeakageCheckPlan,
} from './check-plan';

/** Version of the wire protocol described in PROTOCOL.md. */
export const PROTOCOL_VERSION = 1;

/** Commands the host (bridge) sends to the tracer. */
export type HostCommand =
  | { type: 'identify' }
  | { type: 'status' }
  | { type: 'keepalive' }
  | { type: 'heater'; volts: number }
  | { type: 'sweep'; sweepId: number; plan: SweepPlan }
  | { type: 'abort'; sweepId: number }
  | { type: 'off' }
  | { type: 'zero' }
  /** Optional extension: asks which optional functions the tracer has (EXT). */
  | { type: 'extensions' }
  /** Optional extension: leakage and shorts check (LKG). */
  | { type: 'leakage'; checkId: number; plan: Omit<LeakageCheckPlan, 'kind'> }
  /** Optional extension: emission check, grids strapped to the anode (EMI). */
  | { type: 'emission'; checkId: number; plan: Omit<EmissionCheckPlan, 'kind'> }
  /** Optional extension: grid-current (gas) check at an operating point (GAS). */
  | { type: 'grid-current'; checkId: number; plan: Omit<GridCurrentCheckPlan, 'kind'> };

/** Operating state reported by the tracer. */
export type DeviceState = 'idle' | 'warming' | 'sweeping' | 'fault';

/** Error codes a tracer reports (see PROTOCOL.md). */
export type DeviceErrorCode =
  | 'E10' // unknown command
  | 'E11' // bad field in a command
  | 'E12' // busy: a sweep is running
  | 'E20' // over-limit reading: sweep tripped
  | 'E21' // plan outside device limits
  | 'E30' // heater open circuit
  | 'E31' // short circuit detected
  | 'E40'; // watchdog expired: host went quiet

/** Messages the tracer sends to the host. */
export type DeviceMessage =
  | { type: 'ident'; protocolVersion: number; model: string; serial: string; firmware: string }
  | { type: 'caps'; caps: Omit<DeviceCapabilities, 'protocolVersion' | 'model' | 'serial' | 'firmware'> }
  | { type: 'ack'; command: string; sweepId?: number }
  | { type: 'nak'; command: string; code: DeviceErrorCode; text: string }
  | {
      type: 'point';
      sweepId: number;
      seq: number;
      curve: number;
      vaVolts: number;
      vg1Volts: number;
      vg2Volts: number;
      iaMilliamps: number;
      ig2Milliamps: number;
    }
  | { type: 'end'; sweepId: number; reason: SweepEndReason; count: number }
  | { type: 'error'; code: DeviceErrorCode; text: string }
  | {
      type: 'heartbeat';
      uptimeMs: number;
      state: DeviceState;
      heaterVolts: number;
      highVoltage: boolean;
      warmupLeftSeconds: number;
    }
  | { type: 'zeroed'; iaOffsetMilliamps: number; ig2OffsetMilliamps: number }
  /** Optional extension: answer to EXT. */
  | { type: 'extensions'; extensions: DeviceExtensions }
  /** Optional extension: one pair of a leakage check (LK); current in uA. */
  | {
      type: 'leakage';
      checkId: number;
      pair: ElectrodePair;
      volts: number;
      microamps: number;
      overRange: boolean;
    }
  /** Optional extension: the reading of an emission check (EM). */
  | { type: 'emission'; checkId: number; vaVolts: number; milliamps: number; overRange: boolean }
  /** Optional extension: the reading of a grid-current check (GC); grid current in uA. */
  | {
      type: 'grid-current';
      checkId: number;
      vaVolts: number;
      vg1Volts: number;
      vg2Volts: number;
      iaMilliamps: number;
      ig1Microamps: number;
      gridKiloohms: number;
    };

const END_CODES: Record<SweepEndReason, string> = {
  complete: 'DONE',
  aborted: 'ABORT',
  limit: 'LIMIT',
  fault: 'FAULT',
  'link-lost': 'WDT',
};
const END_REASONS = Object.fromEntries(Object.entries(END_CODES).map(([k, v]) => [v, k])) as Record<string, SweepEndReason>;
const STATE_CODES: Record<DeviceState, string> = { idle: 'IDLE', warming: 'WARM', sweeping: 'SWEEP', fault: 'FAULT' };
const STATES = Object.fromEntries(Object.entries(STATE_CODES).map(([k, v]) => [v, k])) as Record<string, DeviceState>;
const PAIR_CODES: Record<ElectrodePair, string> = {
  'heater-cathode': 'HK',
  'grid1-cathode': 'G1K',
  'grid1-anode': 'G1A',
  'anode-cathode': 'AK',
  'screen-cathode': 'G2K',
  'screen-grid1': 'G2G1',
  'screen-anode': 'G2A',
};
const PAIRS = Object.fromEntries(ELECTRODE_PAIRS.map((p) => [PAIR_CODES[p], p])) as Record<
  string,
  ElectrodePair
>;
const FEATURE_CODES: Record<CheckFeature, string> = {
  leakage: 'LKG',
  emission: 'EMI',
  'grid-current': 'GAS',
  'section-select': 'SEC',
};
const FEATURES = Object.fromEntries(CHECK_FEATURES.map((f) => [FEATURE_CODES[f], f])) as Record<
  string,
  CheckFeature
>;
/** Most pairs one LKG line may list. */
export const MAX_LEAKAGE_PAIRS = ELECTRODE_PAIRS.length;
const ERROR_CODES = new Set(['E10', 'E11', 'E12', 'E20', 'E21', 'E30', 'E31', 'E40']);

/** Formats a number for the wire: fixed decimals, no exponent, no negative zero. */
export function num(x: number, decimals = 3): string {
  let s = x.toFixed(decimals);
  if (s.includes('.')) s = s.replace(/0+$/, '').replace(/\.$/, '');
  return s === '-0' ? '0' : s;
}

/** Makes free text safe for a field: no separators, no framing characters, printable ASCII. */
export function text(s: string): string {
  return s.replace(/[^\x20-\x7e]|[$*,;]/g, '_').slice(0, 60);
}

/** Encodes a host command into a frame body (without '$', checksum or line end). */
export function encodeCommand(c: HostCommand): string {
  switch (c.type) {
    case 'identify':
      return 'IDN';
    case 'status':
      return 'STA';
    case 'keepalive':
      return 'KAL';
    case 'heater':
      return `HTR,${num(c.volts, 2)}`;
    case 'sweep': {
      const p = c.plan;
      return [
        'SWP',
        c.sweepId,
        p.kind === 'anode' ? 'A' : 'T',
        num(p.vaStartVolts, 2),
        num(p.vaStopVolts, 2),
        num(p.vaStepVolts, 2),
        num(p.vg2Volts, 2),
        num(p.heaterVolts, 2),
        num(p.iaMaxMilliamps, 2),
        num(p.paMaxWatts, 2),
        num(p.iaTripMilliamps, 2),
        num(p.warmupSeconds, 0),
        num(p.settleMs, 0),
        p.vg1Volts.map((v) => num(v, 2)).join(';'),
        // Section 2 only to a tracer that announced SEC; section 1 keeps the core's 14 fields.
        ...(p.section === 2 ? ['2'] : []),
      ].join(',');
    }
    case 'abort':
      return `ABT,${c.sweepId}`;
    case 'off':
      return 'OFF';
    case 'zero':
      return 'ZRO';
    case 'extensions':
      return 'EXT';
    case 'leakage': {
      const p = c.plan;
      return [
        'LKG',
        c.checkId,
        num(p.heaterVolts, 2),
        num(p.warmupSeconds, 0),
        num(p.settleMs, 0),
        p.pairs.map((x) => PAIR_CODES[x.pair]).join(';'),
        p.pairs.map((x) => num(x.volts, 1)).join(';'),
      ].join(',');
    }
    case 'emission': {
      const p = c.plan;
      return [
        'EMI',
        c.checkId,
        num(p.vaVolts, 2),
        num(p.heaterVolts, 2),
        num(p.iaTripMilliamps, 2),
        num(p.paMaxWatts, 2),
        num(p.warmupSeconds, 0),
        num(p.settleMs, 0),
      ].join(',');
    }
    case 'grid-current': {
      const p = c.plan;
      return [
        'GAS',
        c.checkId,
        num(p.vaVolts, 2),
        num(p.vg1Volts, 2),
        num(p.vg2Volts, 2),
        num(p.heaterVolts, 2),
        num(p.iaTripMilliamps, 2),
        num(p.paMaxWatts, 2),
        num(p.warmupSeconds, 0),
        num(p.settleMs, 0),
      ].join(',');
    }
  }
}

/** Encodes a device message into a frame body. */
export function encodeDeviceMessage(m: DeviceMessage): string {
  switch (m.type) {
    case 'ident':
      return ['IDN', m.protocolVersion, text(m.model), text(m.serial), text(m.firmware)].join(',');
    case 'caps': {
      const c = m.caps;
      return [
        'CAP',
        num(c.vaMaxVolts, 1),
        num(c.vg2MaxVolts, 1),
        num(c.vg1MinVolts, 1),
        num(c.vg1MaxVolts, 1),
        num(c.iaMaxMilliamps, 1),
        num(c.heaterMaxVolts, 2),
        num(c.heaterMaxAmps, 2),
        c.pulse ? 1 : 0,
        num(c.watchdogMs, 0),
      ].join(',');
    }
    case 'ack':
      return m.sweepId === undefined ? `ACK,${m.command}` : `ACK,${m.command},${m.sweepId}`;
    case 'nak':
      return `NAK,${m.command},${m.code},${text(m.text)}`;
    case 'point':
      return [
        'PT',
        m.sweepId,
        m.seq,
        m.curve,
        num(m.vaVolts, 2),
        num(m.vg1Volts, 3),
        num(m.vg2Volts, 2),
        num(m.iaMilliamps, 4),
        num(m.ig2Milliamps, 4),
      ].join(',');
    case 'end':
      return `END,${m.sweepId},${END_CODES[m.reason]},${m.count}`;
    case 'error':
      return `ERR,${m.code},${text(m.text)}`;
    case 'heartbeat':
      return ['HB', m.uptimeMs, STATE_CODES[m.state], num(m.heaterVolts, 2), m.highVoltage ? 1 : 0, num(m.warmupLeftSeconds, 0)].join(',');
    case 'zeroed':
      return `ZRO,${num(m.iaOffsetMilliamps, 4)},${num(m.ig2OffsetMilliamps, 4)}`;
    case 'extensions': {
      const x = m.extensions;
      return [
        'EXT',
        x.features.map((f) => FEATURE_CODES[f]).join(';'),
        num(x.gridFeedKiloohms, 1),
        num(x.leakageMaxVolts, 1),
      ].join(',');
    }
    case 'leakage':
      return [
        'LK',
        m.checkId,
        PAIR_CODES[m.pair],
        num(m.volts, 1),
        num(m.microamps, 4),
        m.overRange ? 1 : 0,
      ].join(',');
    case 'emission':
      return ['EM', m.checkId, num(m.vaVolts, 2), num(m.milliamps, 4), m.overRange ? 1 : 0].join(
        ',',
      );
    case 'grid-current':
      return [
        'GC',
        m.checkId,
        num(m.vaVolts, 2),
        num(m.vg1Volts, 3),
        num(m.vg2Volts, 2),
        num(m.iaMilliamps, 4),
        num(m.ig1Microamps, 4),
        num(m.gridKiloohms, 1),
      ].join(',');
  }
}

const NUMBER = /^-?\d+(\.\d+)?$/;
const INTEGER = /^\d+$/;

function n(field: string | undefined): number {
  if (field === undefined || !NUMBER.test(field)) throw new Error('bad number');
  return Number(field);
}

function int(field: string | undefined): number {
  if (field === undefined || !INTEGER.test(field) || field.length > 12) throw new Error('bad integer');
  return Number(field);
}

function flag(field: string | undefined): boolean {
  if (field !== '0' && field !== '1') throw new Error('bad flag');
  return field === '1';
}

function arity(f: string[], count: number): void {
  if (f.length !== count) throw new Error('wrong field count');
}

/** Decodes a frame body into a host command, or null when it is not a valid command. */
export function decodeCommand(body: string): HostCommand | null {
  const f = body.split(',');
  try {
    switch (f[0]) {
      case 'IDN':
        arity(f, 1);
        return { type: 'identify' };
      case 'STA':
        arity(f, 1);
        return { type: 'status' };
      case 'KAL':
        arity(f, 1);
        return { type: 'keepalive' };
      case 'OFF':
        arity(f, 1);
        return { type: 'off' };
      case 'ZRO':
        arity(f, 1);
        return { type: 'zero' };
      case 'EXT':
        arity(f, 1);
        return { type: 'extensions' };
      case 'LKG': {
        arity(f, 7);
        const codes = f[5].split(';');
        const volts = f[6].split(';').map(n);
        if (codes.length !== volts.length || codes.length > MAX_LEAKAGE_PAIRS) {
          throw new Error('bad pair list');
        }
        const pairs = codes.map((code, i) => ({ pair: pairOf(code), volts: volts[i] }));
        if (new Set(codes).size !== codes.length) throw new Error('repeated pair');
        return {
          type: 'leakage',
          checkId: int(f[1]),
          plan: { heaterVolts: n(f[2]), warmupSeconds: n(f[3]), settleMs: n(f[4]), pairs },
        };
      }
      case 'EMI':
        arity(f, 8);
        return {
          type: 'emission',
          checkId: int(f[1]),
          plan: {
            vaVolts: n(f[2]),
            heaterVolts: n(f[3]),
            iaTripMilliamps: n(f[4]),
            paMaxWatts: n(f[5]),
            warmupSeconds: n(f[6]),
            settleMs: n(f[7]),
          },
        };
      case 'GAS':
        arity(f, 10);
        return {
          type: 'grid-current',
          checkId: int(f[1]),
          plan: {
            vaVolts: n(f[2]),
            vg1Volts: n(f[3]),
            vg2Volts: n(f[4]),
            heaterVolts: n(f[5]),
            iaTripMilliamps: n(f[6]),
            paMaxWatts: n(f[7]),
            warmupSeconds: n(f[8]),
            settleMs: n(f[9]),
          },
        };
      case 'HTR':
        arity(f, 2);
        return { type: 'heater', volts: n(f[1]) };
      case 'ABT':
        arity(f, 2);
        return { type: 'abort', sweepId: int(f[1]) };
      case 'SWP': {
        if (f.length !== 14 && f.length !== 15) throw new Error('wrong field count');
        if (f[2] !== 'A' && f[2] !== 'T') throw new Error('bad kind');
        if (f.length === 15 && f[14] !== '1' && f[14] !== '2') throw new Error('bad section');
        const vg1 = f[13].split(';').map(n);
        return {
          type: 'sweep',
          sweepId: int(f[1]),
          plan: {
            kind: f[2] === 'A' ? 'anode' : 'transfer',
            vaStartVolts: n(f[3]),
            vaStopVolts: n(f[4]),
            vaStepVolts: n(f[5]),
            vg2Volts: n(f[6]),
            heaterVolts: n(f[7]),
            iaMaxMilliamps: n(f[8]),
            paMaxWatts: n(f[9]),
            iaTripMilliamps: n(f[10]),
            warmupSeconds: n(f[11]),
            settleMs: n(f[12]),
            vg1Volts: vg1,
            ...(f[14] === '2' ? { section: 2 as const } : {}),
          },
        };
      }
      default:
        return null;
    }
  } catch {
    return null;
  }
}

/** Decodes a frame body into a device message, or null when it is not a valid message. */
export function decodeDeviceMessage(body: string): DeviceMessage | null {
  const f = body.split(',');
  try {
    switch (f[0]) {
      case 'IDN':
        arity(f, 5);
        return { type: 'ident', protocolVersion: int(f[1]), model: f[2], serial: f[3], firmware: f[4] };
      case 'CAP':
        arity(f, 10);
        return {
          type: 'caps',
          caps: {
            vaMaxVolts: n(f[1]),
            vg2MaxVolts: n(f[2]),
            vg1MinVolts: n(f[3]),
            vg1MaxVolts: n(f[4]),
            iaMaxMilliamps: n(f[5]),
            heaterMaxVolts: n(f[6]),
            heaterMaxAmps: n(f[7]),
            pulse: flag(f[8]),
            watchdogMs: int(f[9]),
          },
        };
      case 'ACK':
        if (f.length === 2) return { type: 'ack', command: tag(f[1]) };
        arity(f, 3);
        return { type: 'ack', command: tag(f[1]), sweepId: int(f[2]) };
      case 'NAK':
        arity(f, 4);
        return { type: 'nak', command: tag(f[1]), code: code(f[2]), text: f[3] };
      case 'PT':
        arity(f, 9);
        return {
          type: 'point',
          sweepId: int(f[1]),
          seq: int(f[2]),
          curve: int(f[3]),
          vaVolts: n(f[4]),
          vg1Volts: n(f[5]),
          vg2Volts: n(f[6]),
          iaMilliamps: n(f[7]),
          ig2Milliamps: n(f[8]),
        };
      case 'END': {
        arity(f, 4);
        const reason = END_REASONS[f[2]];
        if (!reason) throw new Error('bad reason');
        return { type: 'end', sweepId: int(f[1]), reason, count: int(f[3]) };
      }
      case 'ERR':
        arity(f, 3);
        return { type: 'error', code: code(f[1]), text: f[2] };
      case 'HB': {
        arity(f, 6);
        const state = STATES[f[2]];
        if (!state) throw new Error('bad state');
        return {
          type: 'heartbeat',
          uptimeMs: int(f[1]),
          state,
          heaterVolts: n(f[3]),
          highVoltage: flag(f[4]),
          warmupLeftSeconds: n(f[5]),
        };
      }
      case 'ZRO':
        arity(f, 3);
        return { type: 'zeroed', iaOffsetMilliamps: n(f[1]), ig2OffsetMilliamps: n(f[2]) };
      case 'EXT': {
        arity(f, 4);
        // Codes this host does not know are a newer tracer's: skipped, not an error.
        const codes = f[1] === '' ? [] : f[1].split(';');
        if (codes.some((c) => !/^[A-Z0-9]{2,4}$/.test(c))) throw new Error('bad feature');
        const features = [...new Set(codes.map((c) => FEATURES[c]).filter((x) => x !== undefined))];
        return {
          type: 'extensions',
          extensions: { features, gridFeedKiloohms: n(f[2]), leakageMaxVolts: n(f[3]) },
        };
      }
      case 'LK':
        arity(f, 6);
        return {
          type: 'leakage',
          checkId: int(f[1]),
          pair: pairOf(f[2]),
          volts: n(f[3]),
          microamps: n(f[4]),
          overRange: flag(f[5]),
        };
      case 'EM':
        arity(f, 5);
        return {
          type: 'emission',
          checkId: int(f[1]),
          vaVolts: n(f[2]),
          milliamps: n(f[3]),
          overRange: flag(f[4]),
        };
      case 'GC':
        arity(f, 8);
        return {
          type: 'grid-current',
          checkId: int(f[1]),
          vaVolts: n(f[2]),
          vg1Volts: n(f[3]),
          vg2Volts: n(f[4]),
          iaMilliamps: n(f[5]),
          ig1Microamps: n(f[6]),
          gridKiloohms: n(f[7]),
        };
      default:
        return null;
    }
  } catch {
    return null;
  }
}

function pairOf(code: string): ElectrodePair {
  const pair = PAIRS[code];
  if (!pair) throw new Error('bad pair');
  return pair;
}

function tag(s: string): string {
  if (!/^[A-Z]{2,3}$/.test(s)) throw new Error('bad tag');
  return s;
}

function code(s: string): DeviceErrorCode {
  if (!ERROR_CODES.has(s)) throw new Error('bad code');
  return s as DeviceErrorCode;
}
