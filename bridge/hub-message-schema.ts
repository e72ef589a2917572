import { z } from 'zod';
import type { HubToBridge } from '../shared/hub/messages';
import { ELECTRODE_PAIRS } from '../shared/protocol/check-plan';

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
  section: z.union([z.literal(1), z.literal(2)]).optional(),
});

const volts = z.number();
const timing = { warmupSeconds: z.number(), settleMs: z.number() };

/** Shape of a check as the hub sends it; limits are checked later by checkProblems. */
const checkPlan = z.discriminatedUnion('kind', [
  z.object({
    kind: z.literal('transfer'),
    plan: sweepPlan.extend({ kind: z.literal('transfer') }),
  }),
  z.object({
    kind: z.literal('leakage'),
    heaterVolts: volts,
    ...timing,
    pairs: z
      .array(z.object({ pair: z.enum(ELECTRODE_PAIRS), volts }))
      .min(1)
      .max(ELECTRODE_PAIRS.length)
      .refine((p) => new Set(p.map((x) => x.pair)).size === p.length, 'a pair is repeated'),
  }),
  z.object({
    kind: z.literal('emission'),
    vaVolts: volts,
    heaterVolts: volts,
    iaTripMilliamps: z.number(),
    paMaxWatts: z.number(),
    ...timing,
  }),
  z.object({
    kind: z.literal('grid-current'),
    vaVolts: volts,
    vg1Volts: volts,
    vg2Volts: volts,
    heaterVolts: volts,
    iaTripMilliamps: z.number(),
    paMaxWatts: z.number(),
    ...timing,
  }),
]);

/** Validates a message from the hub at the edge, before anything acts on it. */
export const hubToBridgeSchema: z.ZodType<HubToBridge> = z.discriminatedUnion('type', [
  z.object({ type: z.literal('welcome'), benchId: z.number(), benchName: z.string() }),
  z.object({ type: z.literal('start-sweep'), sweepId, plan: sweepPlan }),
  z.object({ type: z.literal('abort-sweep'), sweepId }),
  z.object({ type: z.literal('outputs-off') }),
  z.object({ type: z.literal('ack-points'), sweepId, throughSeq: z.number().int() }),
  z.object({ type: z.literal('ack-end'), sweepId }),
  z.object({ type: z.literal('start-check'), checkId: sweepId, check: checkPlan }),
  z.object({ type: z.literal('abort-check'), checkId: sweepId }),
]);
