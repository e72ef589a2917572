import type { SweepEndReason, SweepKind } from '../shared/domain/sweep';
import type { CheckKind, DeviceState, HostCommand, LineStats } from '../shared/protocol';
import type { FaultName } from './fault-name';

/** The last reading taken, for the control API. */
export interface LastReading {
  /** Sweep id. */
  sweepId: number;
  /** Anode voltage, V. */
  vaVolts: number;
  /** Grid-1 voltage, V. */
  vg1Volts: number;
  /** Screen voltage, V. */
  vg2Volts: number;
  /** Anode current, mA. */
  iaMilliamps: number;
  /** Screen current, mA. */
  ig2Milliamps: number;
  /** Grid-1 current, uA (negative: reverse, positive-ion current); on the wire only in GC. */
  gridCurrentMicroamps: number;
  /** Cathode emission, fraction of a sound cathode's at nominal heater. */
  emission: number;
}

/** Everything the control API reports about the tracer (GET /state). */
export interface TracerSnapshot {
  /** Valve in the socket, "TYPE#SEED". */
  valve: string;
  /** Its catalog designation. */
  valveType: string;
  /** Its seed (0 = nominal valve). */
  seed: number;
  /** Fault in effect. */
  fault: FaultName;
  /** State as the heartbeat reports it. */
  state: DeviceState;
  /** Whether the unplug fault has cut the link. */
  unplugged: boolean;
  /** Simulated time since start, ms. */
  uptimeMs: number;
  /** Simulated ms per wall-clock ms. */
  speed: number;
  /** Watchdog period, wall-clock ms. */
  watchdogMs: number;
  /** Heater supply, V. */
  heaterVolts: number;
  /** Whether the anode or screen supply is live. */
  highVoltage: boolean;
  /** Warm-up left, s. */
  warmupLeftSeconds: number;
  /** Cathode emission now, fraction of a sound cathode's at nominal heater. */
  emission: number;
  /** The running sweep or check, if any. */
  sweep: {
    id: number;
    kind: SweepKind | CheckKind;
    phase: 'warming' | 'measuring';
    /** Points sent so far. */
    points: number;
    /** Points the plan asks for at most. */
    plannedPoints: number;
  } | null;
  /** The last reading taken, with the grid current (which only the GAS check reports). */
  lastReading: LastReading | null;
  /** Counters since start. */
  counters: {
    /** Host lines by outcome (see LineStats), plus the total dropped. */
    hostLines: LineStats & { dropped: number };
    /** Commands acted on, by type. */
    commands: Record<HostCommand['type'], number>;
    /** Lines sent to the host. */
    linesSent: number;
    /** Sent lines with a bit flipped by the corrupt fault. */
    linesCorrupted: number;
    /** Lines not sent because the unplug fault had cut the link. */
    linesSuppressed: number;
    /** Sweeps acknowledged. */
    sweepsStarted: number;
    /** Checks (LKG, EMI, GAS) acknowledged. */
    checksStarted: number;
    /** Sweeps and checks ended, by reason. */
    sweepsEnded: Record<SweepEndReason, number>;
    /** PT lines sent. */
    pointsSent: number;
    /** ERR lines sent. */
    errors: number;
    /** Times the watchdog switched outputs off. */
    watchdogExpiries: number;
  };
}
