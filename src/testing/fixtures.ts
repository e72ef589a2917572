import { defaultPlan, VALVE_TYPES } from '../../shared/catalog/valve-types';
import type { DeviceCapabilities, SweepPlan, SweepPoint } from '../../shared/domain/sweep';
import type { BenchView, SweepView } from '../../shared/hub/messages';
import type { ValveTypeView } from '../app/core/valve-types-api';
import { SESSION_STORAGE_KEY, type Role } from '../app/core/auth';

/** The catalog as GET /api/valve-types serves it. */
export const VALVE_TYPE_VIEWS: ValveTypeView[] = VALVE_TYPES.map((t) => ({
  ...t,
  defaultPlan: defaultPlan(t),
}));

/** A tracer that can go higher than any of the small-signal types' ratings. */
export const CAPABILITIES: DeviceCapabilities = {
  protocolVersion: 1,
  model: 'bench tracer',
  serial: 'T-0001',
  firmware: '1.0',
  vaMaxVolts: 500,
  vg2MaxVolts: 450,
  vg1MinVolts: -100,
  vg1MaxVolts: 0,
  iaMaxMilliamps: 250,
  heaterMaxVolts: 13.5,
  heaterMaxAmps: 3,
  pulse: false,
  watchdogMs: 2000,
};

/** An online, idle bench; pass fields to change it. */
export function benchView(over: Partial<BenchView> = {}, sweepId: number | null = null): BenchView {
  return {
    id: 1,
    name: 'Bench A',
    bridgeOnline: true,
    capabilities: CAPABILITIES,
    status: {
      deviceOnline: true,
      state: sweepId === null ? 'idle' : 'sweeping',
      highVoltage: sweepId !== null,
      heaterVolts: sweepId === null ? 0 : 12.6,
      warmupLeftSeconds: 0,
      sweepId,
      lineStats: {
        accepted: 10,
        badChecksum: 1,
        overlong: 0,
        truncated: 0,
        badBytes: 0,
        noiseBytes: 0,
        malformed: 0,
      },
    },
    ...over,
  };
}

/** A small three-curve anode family. */
export const SMALL_PLAN: SweepPlan = {
  kind: 'anode',
  vaStartVolts: 0,
  vaStopVolts: 200,
  vaStepVolts: 50,
  vg1Volts: [0, -1, -2],
  vg2Volts: 0,
  heaterVolts: 12.6,
  iaMaxMilliamps: 3,
  paMaxWatts: 0.75,
  iaTripMilliamps: 4.5,
  warmupSeconds: 20,
  settleMs: 2,
};

/** A sweep record; pass fields to change it. */
export function sweepView(over: Partial<SweepView> = {}): SweepView {
  return {
    id: 7,
    benchId: 1,
    valveType: '12AX7',
    valveLabel: 'shelf 3 no. 12',
    plan: SMALL_PLAN,
    status: 'running',
    endMessage: null,
    pointCount: 0,
    deviceCount: null,
    operator: 'tech',
    createdAt: '2026-03-01T10:00:00.000Z',
    startedAt: '2026-03-01T10:00:01.000Z',
    endedAt: null,
    ...over,
  };
}

/** Points of `plan`, curve by curve, `perCurve` points each, with a made-up rising current. */
export function pointsOf(plan: SweepPlan, perCurve: number, withScreen = false): SweepPoint[] {
  const out: SweepPoint[] = [];
  plan.vg1Volts.forEach((vg1, curve) => {
    for (let i = 0; i < perCurve; i++) {
      const va = plan.vaStartVolts + i * plan.vaStepVolts;
      out.push({
        seq: out.length,
        curve,
        vaVolts: va,
        vg1Volts: vg1,
        vg2Volts: plan.vg2Volts,
        iaMilliamps: Math.max(0, (va / 100 + vg1) * 0.8),
        ig2Milliamps: withScreen ? 0.1 * (i + 1) : 0,
      });
    }
  });
  return out;
}

/** Stores a session for `role` the way Auth does, before Auth is created. */
export function storeSession(role: Role): void {
  localStorage.setItem(
    SESSION_STORAGE_KEY,
    JSON.stringify({
      token: `test-token-${role}`,
      user: { id: 1, username: role, displayName: `Test ${role}`, role },
    }),
  );
}
