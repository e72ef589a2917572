import type { DeviceCapabilities, SweepEndReason, SweepPlan, SweepPoint } from '../domain/sweep';
import type { QuickTestGrade } from '../grading/grade-quick-test';
import type { QuickTestPart } from '../grading/quick-test-part';
import type { QuickTestReference } from '../grading/quick-test-plan';
import type { PartOutcome } from '../grading/quick-test-results';
import type { CheckPlan, CheckReading, DeviceExtensions } from '../protocol/check-plan';
import type { DeviceErrorCode, DeviceState } from '../protocol/messages';
import type { LineStats } from '../protocol/line-reader';

/**
 * Messages on the hub's two WebSocket endpoints, as JSON text frames.
 *   /ws/bridge  - a bridge, authenticated by its bench token at upgrade.
 *   /ws/live    - a browser, authenticated by the user's JWT at upgrade.
 */

/** What a bridge reports of its tracer. */
export interface BenchDeviceStatus {
  /** Whether the serial link to the tracer is up and the handshake done. */
  deviceOnline: boolean;
  /** Tracer state, or null while the link is down. */
  state: DeviceState | null;
  /** Whether anode or screen supply is live. */
  highVoltage: boolean;
  /** Heater voltage, V. */
  heaterVolts: number;
  /** Seconds of heater warm-up left, 0 when warm. */
  warmupLeftSeconds: number;
  /** Sweep running on the tracer, or null. */
  sweepId: number | null;
  /** Serial line counters (dropped lines and why). */
  lineStats: LineStats;
  /** Check (a quick-test step) running on the tracer, or null (optional for older bridges). */
  checkId?: number | null;
}

/** Bridge to hub. */
export type BridgeToHub =
  | {
      type: 'hello';
      bridgeVersion: string;
      capabilities: DeviceCapabilities | null;
      status: BenchDeviceStatus;
      /** Optional functions of the tracer (its EXT answer); absent or null: none (older bridges). */
      extensions?: DeviceExtensions | null;
    }
  | { type: 'status'; status: BenchDeviceStatus }
  /** Points of a sweep, in sequence order; may repeat points already sent (resend after reconnect). */
  | { type: 'points'; sweepId: number; points: SweepPoint[] }
  /** The device accepted the plan and started (warm-up first). */
  | { type: 'sweep-started'; sweepId: number }
  /** The sweep ended; count is the number of points the device reported. */
  | { type: 'sweep-ended'; sweepId: number; reason: SweepEndReason; count: number; message: string }
  /** The bridge or the device refused the plan. */
  | { type: 'sweep-refused'; sweepId: number; message: string }
  /** The tracer accepted a check (a quick-test step) and started it (warm-up first). */
  | { type: 'check-started'; checkId: number }
  /** One reading of a running check, as it arrives (progress; check-ended repeats them all). */
  | { type: 'check-reading'; checkId: number; reading: CheckReading }
  /** A check ended, with every reading it took and the tracer's error code behind a fault. */
  | {
      type: 'check-ended';
      checkId: number;
      reason: SweepEndReason;
      message: string;
      errorCode: DeviceErrorCode | null;
      readings: CheckReading[];
    }
  /** The bridge or the tracer refused a check; nothing was switched on for it. */
  | { type: 'check-refused'; checkId: number; message: string };

/** Hub to bridge. */
export type HubToBridge =
  | { type: 'welcome'; benchId: number; benchName: string }
  | { type: 'start-sweep'; sweepId: number; plan: SweepPlan }
  | { type: 'abort-sweep'; sweepId: number }
  | { type: 'outputs-off' }
  /** Cumulative acknowledgement: every point with seq <= throughSeq is stored. */
  | { type: 'ack-points'; sweepId: number; throughSeq: number }
  /** The hub has recorded the end of this sweep: the bridge may forget it. */
  | { type: 'ack-end'; sweepId: number }
  /** Runs one check (a quick-test step); the id shares the tracer's sweep id space. */
  | { type: 'start-check'; checkId: number; check: CheckPlan }
  /** Aborts a check; unknown or not running: outputs off all the same. */
  | { type: 'abort-check'; checkId: number };

/** Summary of a bench as browsers see it. */
export interface BenchView {
  /** Bench id. */
  id: number;
  /** Bench name. */
  name: string;
  /** Whether its bridge is connected to the hub. */
  bridgeOnline: boolean;
  /** Device capabilities from the last handshake, or null. */
  capabilities: DeviceCapabilities | null;
  /** Latest device status, or null if never connected. */
  status: BenchDeviceStatus | null;
  /** Limits an admin set for this bench (the hub sends them; optional for older senders). */
  limits?: BenchLimits;
  /** ISO time the bridge was last heard from, or null if never (optional for older senders). */
  lastSeenAt?: string | null;
  /** Optional tracer functions (quick tests need them), or null (optional for older senders). */
  extensions?: DeviceExtensions | null;
}

/** Limits an admin sets per bench, on top of the device's own and the valve type's ratings. */
export interface BenchLimits {
  /** Maximum anode voltage, V. */
  vaMaxVolts: number;
  /** Maximum screen voltage, V. */
  vg2MaxVolts: number;
  /** Maximum anode current, mA (also bounds the trip current). */
  iaMaxMilliamps: number;
  /** Maximum anode dissipation, W. */
  paMaxWatts: number;
}

/** Summary of a sweep as browsers see it. */
export interface SweepView {
  /** Sweep id. */
  id: number;
  /** Bench id. */
  benchId: number;
  /** Valve type designation, or null. */
  valveType: string | null;
  /** Free-text label of the valve under test. */
  valveLabel: string | null;
  /** Plan the sweep runs. */
  plan: SweepPlan;
  /** Lifecycle state. */
  status: 'pending' | 'running' | SweepEndReason;
  /** Why it ended, in words, or null. */
  endMessage: string | null;
  /** Number of points stored. */
  pointCount: number;
  /** Number of points the tracer reported sending (from its end-of-sweep line), or null. */
  deviceCount: number | null;
  /** Who started it (user name). */
  operator: string;
  /** ISO times. */
  createdAt: string;
  startedAt: string | null;
  endedAt: string | null;
  /** Valve record the sweep belongs to, or null (optional for older senders). */
  valveId?: number | null;
}

/** Lifecycle state of a quick test. */
export type QuickTestStatus = 'pending' | 'running' | 'complete' | 'aborted' | 'link-lost' | 'failed';

/**
 * A quick test as browsers see it: the parts asked for with their results so far, the warm-up
 * countdown while the heater warms, and, once complete, the grade with its reason. 'complete'
 * means the test reached a grade (a short or an open heater stops it early and still grades).
 */
export interface QuickTestView {
  /** Quick-test id. */
  id: number;
  /** Bench id. */
  benchId: number;
  /** Valve type designation. */
  valveType: string;
  /** Valve record, or null. */
  valveId: number | null;
  /** Free-text label of the valve under test, or null. */
  valveLabel: string | null;
  /** Parts asked for, in run order. */
  parts: QuickTestPart[];
  /** Lifecycle state. */
  status: QuickTestStatus;
  /** Part being measured now, or null. */
  currentPart: QuickTestPart | null;
  /** Seconds of heater warm-up (or heater settling) left on the bench now, 0 when none. */
  warmupLeftSeconds: number;
  /** Steps (checks on the bench) finished, of stepCount. */
  stepsDone: number;
  /** Steps planned. */
  stepCount: number;
  /** Each part asked for, with its status, message and figures. */
  results: PartOutcome[];
  /** The type's figures the results are judged against. */
  reference: QuickTestReference;
  /** Grade and reason, once complete; null before. */
  grade: QuickTestGrade | null;
  /** Why it ended, in words, or null. */
  endMessage: string | null;
  /** Who started it (user name). */
  operator: string;
  /** ISO times. */
  createdAt: string;
  startedAt: string | null;
  endedAt: string | null;
}

/** Browser to hub. */
export type BrowserToHub =
  | { type: 'watch-sweep'; sweepId: number }
  | { type: 'unwatch-sweep'; sweepId: number }
  /** Technician or admin only. */
  | { type: 'abort-sweep'; sweepId: number }
  /** Technician or admin only. */
  | { type: 'abort-quick-test'; quickTestId: number };

/** Hub to browser. */
export type HubToBrowser =
  | { type: 'benches'; benches: BenchView[] }
  | { type: 'sweep'; sweep: SweepView }
  /** Points of a watched sweep; on watch, everything stored so far arrives first. */
  | { type: 'points'; sweepId: number; points: SweepPoint[] }
  | { type: 'error'; code: string; message: string }
  /** A quick test changed (started, a part done, warm-up countdown, graded); sent to all. */
  | { type: 'quick-test'; quickTest: QuickTestView };
