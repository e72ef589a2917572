import { z } from 'zod';
import type { SweepPlan, SweepPoint } from '../../shared/domain/sweep';
import { pageFields, pageOf } from '../http/common-schemas';

/**
 * A sweep plan as sent by clients: only shape and types here. Whether the figures are safe is
 * checked afterwards against the bench, the tracer and the valve type (422 with the reasons).
 */
export const sweepPlanSchema = z.strictObject({
  kind: z.enum(['anode', 'transfer']).describe('anode: Ia(Va) per Vg1 step; transfer: Ia(Vg1)'),
  vaStartVolts: z.number().describe('First anode voltage (transfer: the fixed one), V'),
  vaStopVolts: z.number().describe('Last anode voltage, V'),
  vaStepVolts: z.number().describe('Anode voltage step, V'),
  vg1Volts: z.array(z.number()).min(1).max(200).describe('Grid-1 voltages, V'),
  vg2Volts: z.number().describe('Screen voltage, V (0 for triodes)'),
  heaterVolts: z.number().describe('Heater voltage, V'),
  iaMaxMilliamps: z.number().describe('Curve current limit, mA'),
  paMaxWatts: z.number().describe('Curve dissipation limit, W'),
  iaTripMilliamps: z.number().describe('Trip current that ends the sweep, mA'),
  warmupSeconds: z.number().describe('Heater warm-up, s'),
  settleMs: z.number().describe('Settling time before each reading, ms'),
  section: z
    .union([z.literal(1), z.literal(2)])
    .optional()
    .describe('Section of a double triode the sweep measures (default 1)'),
}) satisfies z.ZodType<SweepPlan>;

/** Body of POST /api/sweeps. */
export const startSweepBody = z.strictObject({
  benchId: z.number().int().positive().describe('Bench to run on'),
  plan: sweepPlanSchema,
  valveType: z.string().trim().min(1).max(40).optional().describe('Type designation, e.g. 12AX7'),
  valveLabel: z.string().trim().max(80).optional().describe('Label of the valve under test'),
  valveId: z
    .number()
    .int()
    .positive()
    .optional()
    .describe('Valve record under test; its type fills valveType (a different one is refused)'),
  override: z
    .boolean()
    .optional()
    .describe('Admin only: run past the valve type ratings (never past bench or tracer limits)'),
});

/** Body of POST /api/sweeps/:id/attach. */
export const attachSweepBody = z.strictObject({
  valveId: z
    .number()
    .int()
    .positive()
    .nullable()
    .describe('Valve record to put the sweep on; null takes it off its record'),
});

/** Statuses a sweep record can have. */
export const SWEEP_STATUSES = [
  'pending',
  'running',
  'complete',
  'aborted',
  'limit',
  'fault',
  'link-lost',
] as const;

/** Sort keys of GET /api/sweeps. */
export const SWEEP_SORT_KEYS = ['createdAt', 'status', 'valveType', 'pointCount'] as const;

/** Query of GET /api/sweeps. */
export const sweepListQuery = z.object({
  ...pageFields,
  sort: z.enum(SWEEP_SORT_KEYS).default('createdAt'),
  order: z.enum(['asc', 'desc']).default('desc'),
  status: z.enum(SWEEP_STATUSES).optional(),
  benchId: z.coerce.number().int().positive().optional(),
  valveId: z.coerce.number().int().positive().optional().describe('Only sweeps of this valve'),
  q: z.string().trim().max(80).optional().describe('Search in valve label and type'),
});

/** Query of GET /api/sweeps/:id/export. */
export const sweepExportQuery = z.object({
  format: z.enum(['csv', 'json']).default('csv'),
});

/** One stored point. */
export const sweepPointSchema = z.object({
  seq: z.number().int().min(0),
  curve: z.number().int().min(0),
  vaVolts: z.number(),
  vg1Volts: z.number(),
  vg2Volts: z.number(),
  iaMilliamps: z.number(),
  ig2Milliamps: z.number(),
}) satisfies z.ZodType<SweepPoint>;

/** A sweep as the API shows it (SweepView). */
export const sweepViewSchema = z.object({
  id: z.number().int(),
  benchId: z.number().int(),
  valveType: z.string().nullable(),
  valveLabel: z.string().nullable(),
  plan: sweepPlanSchema,
  status: z.enum(SWEEP_STATUSES),
  endMessage: z.string().nullable(),
  pointCount: z.number().int(),
  deviceCount: z.number().int().nullable(),
  operator: z.string(),
  createdAt: z.string(),
  startedAt: z.string().nullable(),
  endedAt: z.string().nullable(),
  valveId: z.number().int().nullable().optional().describe('Valve record, or null'),
});

/** Answer of GET /api/sweeps/:id. */
export const sweepDetailSchema = sweepViewSchema.extend({ points: z.array(sweepPointSchema) });

/** Answer of GET /api/sweeps. */
export const sweepPage = pageOf(sweepViewSchema);
