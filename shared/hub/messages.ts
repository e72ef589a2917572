import type { DeviceCapabilities, SweepEndReason, SweepPlan, SweepPoint } from '../domain/sweep';
import type { DeviceState } from '../protocol/messages';
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
}

/** Bridge to hub. */
export type BridgeToHub =
  | { type: 'hello'; bridgeVersion: string; capabilities: DeviceCapabilities | null; status: BenchDeviceStatus }
  | { type: 'status'; status: BenchDeviceStatus }
  /** Points of a sweep, in sequence order; may repeat points already sent (resend after reconnect). */
  | { type: 'points'; sweepId: number; points: SweepPoint[] }
  /** The device accepted the plan and started (warm-up first). */
  | { type: 'sweep-started'; sweepId: number }
  /** The sweep ended; count is the number of points the device reported. */
  | { type: 'sweep-ended'; sweepId: number; reason: SweepEndReason; count: number; message: string }
  /** The bridge or the device refused the plan. */
  | { type: 'sweep-refused'; sweepId: number; message: string };

/** Hub to bridge. */
export type HubToBridge =
  | { type: 'welcome'; benchId: number; benchName: string }
  | { type: 'start-sweep'; sweepId: number; plan: SweepPlan }
  | { type: 'abort-sweep'; sweepId: number }
  | { type: 'outputs-off' }
  /** Cumulative acknowledgement: every point with seq <= throughSeq is stored. */
  | { type: 'ack-points'; sweepId: number; throughSeq: number }
  /** The hub has recorded the end of this sweep: the bridge may forget it. */
  | { type: 'ack-end'; sweepId: number };

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
}

/** Browser to hub. */
export type BrowserToHub =
  | { type: 'watch-sweep'; sweepId: number }
  | { type: 'unwatch-sweep'; sweepId: number }
  /** Technician or admin only. */
  | { type: 'abort-sweep'; sweepId: number };

/** Hub to browser. */
export type HubToBrowser =
  | { type: 'benches'; benches: BenchView[] }
  | { type: 'sweep'; sweep: SweepView }
  /** Points of a watched sweep; on watch, everything stored so far arrives first. */
  | { type: 'points'; sweepId: number; points: SweepPoint[] }
  | { type: 'error'; code: string; message: string };
