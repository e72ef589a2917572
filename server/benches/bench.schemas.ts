import { z } from 'zod';

const volts = (what: string, max: number) =>
  z.number().positive().max(max).describe(`${what}, V (at most ${max})`);

/** Limits an admin sets on a bench. */
export const benchLimitsSchema = z.strictObject({
  vaMaxVolts: volts('Maximum anode voltage', 2000),
  vg2MaxVolts: volts('Maximum screen voltage', 2000),
  iaMaxMilliamps: z.number().positive().max(2000).describe('Maximum anode current, mA'),
  paMaxWatts: z.number().positive().max(500).describe('Maximum anode dissipation, W'),
});

const benchName = z.string().trim().min(1).max(60).describe('Bench name, unique');

/** Body of POST /api/benches. */
export const createBenchBody = z.strictObject({
  name: benchName,
  limits: benchLimitsSchema.partial().optional().describe('Limits; defaults for those left out'),
});

/** Body of PATCH /api/benches/:id. */
export const patchBenchBody = z
  .strictObject({
    name: benchName.optional(),
    limits: benchLimitsSchema.partial().optional(),
  })
  .refine((b) => b.name !== undefined || b.limits !== undefined, {
    message: 'give a name or limits to change',
  });

const capabilitiesSchema = z.object({
  protocolVersion: z.number(),
  model: z.string(),
  serial: z.string(),
  firmware: z.string(),
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

/** A bench as the API shows it (BenchView). */
export const benchViewSchema = z.object({
  id: z.number().int(),
  name: z.string(),
  bridgeOnline: z.boolean(),
  capabilities: capabilitiesSchema.nullable(),
  status: z.record(z.string(), z.unknown()).nullable().describe('BenchDeviceStatus'),
  extensions: z
    .record(z.string(), z.unknown())
    .nullable()
    .describe('DeviceExtensions: quick-test functions the tracer offers, null when unknown'),
  limits: benchLimitsSchema,
  lastSeenAt: z.string().nullable(),
});

/** Answer of POST /api/benches: the token is shown this once. */
export const createdBenchResponse = z.object({
  bench: benchViewSchema,
  token: z.string().describe('Bench token for the bridge; store it now, it is not shown again'),
});
