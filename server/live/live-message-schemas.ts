import { z } from 'zod';
import { MAX_POINTS_PER_SWEEP } from '../../shared/domain/plan-check';
import type { BridgeToHub, BrowserToHub } from '../../shared/hub/messages';
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
});

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
]) satisfies z.ZodType<BridgeToHub>;

/** A message from a browser. */
export const browserMessageSchema = z.discriminatedUnion('type', [
  z.object({ type: z.literal('watch-sweep'), sweepId }),
  z.object({ type: z.literal('unwatch-sweep'), sweepId }),
  z.object({ type: z.literal('abort-sweep'), sweepId }),
]) satisfies z.ZodType<BrowserToHub>;
