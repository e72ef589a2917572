import { z } from 'zod';
import { MAX_POINTS_PER_SWEEP } from '../../shared/domain/plan-check';
import type { BridgeToHub, BrowserToHub } from '../../shared/hub/messages';
import { CHECK_FEATURES, ELECTRODE_PAIRS } from '../../shared/protocol/check-plan';
import { sweepPointSchema } from '../sweeps/sweep.schemas';

const sweepId = z.number().int().positive();

const capabilities = z.object({
  protocolVersion: z.number(),
  model: z.string().max(200),
  serial: z.string().max(200),
  firmware: z.string().max(200),
  vaMaxVolts: z.number(),
  vg2MaxVolts: z.number(),
  vg1MinVolts: z.number(),
  vg1MaxVolts: z.number(),
  iaMaxMilliamps: z.number(),
  heaterMaxVolts: z.number(),
  heaterMaxAmps: z.number(),
  pulse: z.boolean(),
  watchdogMs: z.number(),
});

const count = z.number().int().min(0);

const status = z.object({
  deviceOnline: z.boolean(),
  state: z.enum(['idle', 'warming', 'sweeping', 'fault']).nullable(),
  highVoltage: z.boolean(),
  heaterVolts: z.number(),
  warmupLeftSeconds: z.number(),
  sweepId: sweepId.nullable(),
  // Loose: counters a newer bridge adds pass through untouched.
  lineStats: z.looseObject({
    accepted: count,
    badChecksum: count,
    overlong: count,
    truncated: count,
    badBytes: count,
    noiseBytes: count,
    malformed: count.default(0),
  }),
  checkId: z.number().int().positive().nullable().optional(),
});

const extensions = z.object({
  // A newer bridge may know functions this hub does not: those are dropped, not refused.
  features: z
    .array(z.string().max(40))
    .max(20)
    .transform((f) =>
      f.filter((x): x is (typeof CHECK_FEATURES)[number] =>
        (CHECK_FEATURES as readonly string[]).includes(x),
      ),
    ),
  gridFeedKiloohms: z.number(),
  leakageMaxVolts: z.number(),
});

const checkId = z.number().int().positive();

/** A reading of a check, as a bridge reports it (CheckReading of shared/protocol). */
const checkReading = z.discriminatedUnion('kind', [
  sweepPointSchema.extend({ kind: z.literal('point') }),
  z.object({
    kind: z.literal('leakage'),
    pair: z.enum(ELECTRODE_PAIRS),
    volts: z.number(),
    microamps: z.number(),
    overRange: z.boolean(),
  }),
  z.object({
    kind: z.literal('emission'),
    vaVolts: z.number(),
    milliamps: z.number(),
    overRange: z.boolean(),
  }),
  z.object({
    kind: z.literal('grid-current'),
    vaVolts: z.number(),
    vg1Volts: z.number(),
    vg2Volts: z.number(),
    iaMilliamps: z.number(),
    ig1Microamps: z.number(),
    gridKiloohms: z.number(),
  }),
]);

const endReason = z.enum(['complete', 'aborted', 'limit', 'fault', 'link-lost']);

const point = sweepPointSchema.extend({
  seq: z
    .number()
    .int()
    .min(0)
    .max(MAX_POINTS_PER_SWEEP - 1),
});

/** A message from a bridge, checked field by field: bridges are trusted only so far. */
export const bridgeMessageSchema = z.discriminatedUnion('type', [
  z.object({
    type: z.literal('hello'),
    bridgeVersion: z.string().max(100),
    capabilities: capabilities.nullable(),
    status,
    extensions: extensions.nullable().optional(),
  }),
  z.object({ type: z.literal('status'), status }),
  z.object({
    type: z.literal('points'),
    sweepId,
    points: z.array(point).max(MAX_POINTS_PER_SWEEP),
  }),
  z.object({ type: z.literal('sweep-started'), sweepId }),
  z.object({
    type: z.literal('sweep-ended'),
    sweepId,
    reason: z.enum(['complete', 'aborted', 'limit', 'fault', 'link-lost']),
    count,
    message: z.string().max(500),
  }),
  z.object({ type: z.literal('sweep-refused'), sweepId, message: z.string().max(500) }),
  z.object({ type: z.literal('check-started'), checkId }),
  z.object({ type: z.literal('check-reading'), checkId, reading: checkReading }),
  z.object({
    type: z.literal('check-ended'),
    checkId,
    reason: endReason,
    message: z.string().max(500),
    errorCode: z.enum(['E10', 'E11', 'E12', 'E20', 'E21', 'E30', 'E31', 'E40']).nullable(),
    readings: z.array(checkReading).max(1000),
  }),
  z.object({ type: z.literal('check-refused'), checkId, message: z.string().max(500) }),
]) satisfies z.ZodType<BridgeToHub>;

/** A message from a browser. */
export const browserMessageSchema = z.discriminatedUnion('type', [
  z.object({ type: z.literal('watch-sweep'), sweepId }),
  z.object({ type: z.literal('unwatch-sweep'), sweepId }),
  z.object({ type: z.literal('abort-sweep'), sweepId }),
  z.object({ type: z.literal('abort-quick-test'), quickTestId: z.number().int().positive() }),
]) satisfies z.ZodType<BrowserToHub>;
