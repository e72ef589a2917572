import { z } from 'zod';
import type { HubToBridge } from '../shared/hub/messages';

const sweepId = z.number().int().nonnegative();

/** Shape of a sweep plan as the hub sends it; limits are checked later by checkPlan. */
const sweepPlan = z.object({
  kind: z.enum(['anode', 'transfer']),
  vaStartVolts: z.number(),
  vaStopVolts: z.number(),
  vaStepVolts: z.number(),
  vg1Volts: z.array(z.number()).min(1).max(1000),
  vg2Volts: z.number(),
  heaterVolts: z.number(),
  iaMaxMilliamps: z.number(),
  paMaxWatts: z.number(),
  iaTripMilliamps: z.number(),
  warmupSeconds: z.number(),
  settleMs: z.number(),
});

/** Validates a message from the hub at the edge, before anything acts on it. */
export const hubToBridgeSchema: z.ZodType<HubToBridge> = z.discriminatedUnion('type', [
  z.object({ type: z.literal('welcome'), benchId: z.number(), benchName: z.string() }),
  z.object({ type: z.literal('start-sweep'), sweepId, plan: sweepPlan }),
  z.object({ type: z.literal('abort-sweep'), sweepId }),
  z.object({ type: z.literal('outputs-off') }),
  z.object({ type: z.literal('ack-points'), sweepId, throughSeq: z.number().int() }),
  z.object({ type: z.literal('ack-end'), sweepId }),
]);
