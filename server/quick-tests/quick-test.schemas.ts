import { z } from 'zod';
import { HARD_FAILS } from '../../shared/grading/grade-quick-test';
import { VALVE_GRADES } from '../../shared/grading/grade-thresholds';
import { QUICK_TEST_PARTS } from '../../shared/grading/quick-test-part';
import { ELECTRODE_PAIRS } from '../../shared/protocol/check-plan';
import { pageFields, pageOf } from '../http/common-schemas';

/** Statuses a quick-test record can have. */
export const QUICK_TEST_STATUSES = [
  'pending',
  'running',
  'complete',
  'aborted',
  'link-lost',
  'failed',
] as const;

/** Grade names a quick test can end with. */
export const QUICK_TEST_GRADES = [...HARD_FAILS, ...VALVE_GRADES, 'incomplete'] as const;

/** Body of POST /api/quick-tests. */
export const startQuickTestBody = z.strictObject({
  benchId: z.number().int().positive().describe('Bench to run on'),
  valveType: z.string().trim().min(1).max(40).describe('Type designation, e.g. 12AX7'),
  valveId: z.number().int().positive().optional().describe('Valve record the test belongs to'),
  valveLabel: z.string().trim().max(80).optional().describe('Label of the valve under test'),
  parts: z
    .array(z.enum(QUICK_TEST_PARTS))
    .min(1)
    .max(QUICK_TEST_PARTS.length)
    .refine((p) => new Set(p).size === p.length, 'a part is repeated')
    .optional()
    .describe('Parts to run (default all); they run leakage first, reduced heater last'),
  warmupSeconds: z
    .number()
    .min(0)
    .max(600)
    .optional()
    .describe('Heater warm-up before the first reading, s (default 20)'),
  leakageTestVolts: z
    .number()
    .min(1)
    .max(500)
    .optional()
    .describe('Leakage test voltage, V (default 100; heater-cathode at most the Vhk rating)'),
  heaterSettleSeconds: z
    .number()
    .min(0)
    .max(600)
    .optional()
    .describe('Wait after lowering the heater, before the reduced-heater reading, s (default 60)'),
});

/** Query of GET /api/quick-tests. */
export const quickTestListQuery = z.object({
  ...pageFields,
  order: z.enum(['asc', 'desc']).default('desc').describe('By creation time'),
  valveId: z.coerce.number().int().positive().optional(),
  benchId: z.coerce.number().int().positive().optional(),
  status: z.enum(QUICK_TEST_STATUSES).optional(),
  grade: z.enum(QUICK_TEST_GRADES).optional(),
  valveType: z.string().trim().max(40).optional(),
});

const gmMeasurement = z.object({
  vaVolts: z.number(),
  vg2Volts: z.number(),
  vg1Volts: z.number(),
  heaterVolts: z.number(),
  gridStepVolts: z.number(),
  iaMilliamps: z.number(),
  gmMicrosiemens: z.number(),
  method: z.enum(['central', 'one-sided']),
});

/** A part's figures (PartResult of shared/grading), for the API document. */
const partResult = z.discriminatedUnion('part', [
  z.object({
    part: z.literal('leakage'),
    pairs: z.array(
      z.object({
        pair: z.enum(ELECTRODE_PAIRS),
        volts: z.number(),
        microamps: z.number(),
        overRange: z.boolean(),
      }),
    ),
  }),
  z.object({
    part: z.literal('gm'),
    measurement: gmMeasurement,
    nominalGmMicrosiemens: z.number(),
    gmPercent: z.number(),
    nominalIaMilliamps: z.number(),
    iaPercent: z.number(),
  }),
  z.object({
    part: z.literal('grid-current'),
    vaVolts: z.number(),
    vg1Volts: z.number(),
    vg2Volts: z.number(),
    iaMilliamps: z.number(),
    ig1Microamps: z.number().describe('Grid-1 current, uA; negative is reverse (gas)'),
    gridKiloohms: z.number(),
  }),
  z.object({
    part: z.literal('emission'),
    vaVolts: z.number(),
    milliamps: z.number(),
    overRange: z.boolean(),
    expectedMilliamps: z.number(),
    percent: z.number(),
  }),
  z.object({
    part: z.literal('reduced-heater'),
    nominal: gmMeasurement,
    reduced: gmMeasurement,
    dropPercent: z.number(),
  }),
]);

/** A quick test as the API shows it (QuickTestView). */
export const quickTestViewSchema = z.object({
  id: z.number().int(),
  benchId: z.number().int(),
  valveType: z.string(),
  valveId: z.number().int().nullable(),
  valveLabel: z.string().nullable(),
  parts: z.array(z.enum(QUICK_TEST_PARTS)),
  status: z.enum(QUICK_TEST_STATUSES),
  currentPart: z.enum(QUICK_TEST_PARTS).nullable(),
  warmupLeftSeconds: z.number().describe('Heater warm-up left on the bench now, s'),
  stepsDone: z.number().int(),
  stepCount: z.number().int(),
  results: z.array(
    z.object({
      part: z.enum(QUICK_TEST_PARTS),
      status: z.enum(['pending', 'running', 'done', 'failed', 'skipped']),
      message: z.string().nullable(),
      errorCode: z.string().nullable(),
      result: partResult.nullable(),
    }),
  ),
  reference: z.object({
    valveType: z.string(),
    vaVolts: z.number(),
    vg2Volts: z.number(),
    vg1Volts: z.number(),
    heaterVolts: z.number(),
    reducedHeaterVolts: z.number(),
    iaMilliamps: z.number(),
    gmMicrosiemens: z.number().nullable(),
    source: z.string(),
    emissionVolts: z.number().nullable(),
    expectedEmissionMilliamps: z.number().nullable(),
  }),
  grade: z
    .object({
      grade: z.enum(QUICK_TEST_GRADES),
      reason: z.string(),
      findings: z.array(
        z.object({ criterion: z.string(), verdict: z.string(), message: z.string() }),
      ),
    })
    .nullable(),
  endMessage: z.string().nullable(),
  operator: z.string(),
  createdAt: z.string(),
  startedAt: z.string().nullable(),
  endedAt: z.string().nullable(),
});

/** Answer of GET /api/quick-tests. */
export const quickTestPage = pageOf(quickTestViewSchema);

/** A quick test as a valve's record lists it: when, how it ended, its grade and gm/Ia figures. */
export const quickTestSummarySchema = z.object({
  id: z.number().int(),
  at: z.string().describe('When it ended (or was created, if it never ran)'),
  status: z.enum(QUICK_TEST_STATUSES),
  grade: z.string().nullable().describe('Grade name, or null when it ended without one'),
  reason: z.string().nullable(),
  percent: z.number().nullable().describe('The graded figure (gm or emission), % of nominal'),
  vaVolts: z.number().nullable(),
  vg1Volts: z.number().nullable(),
  iaMilliamps: z.number().nullable(),
  gmMicrosiemens: z.number().nullable(),
  iaPercent: z.number().nullable(),
  gmPercent: z.number().nullable(),
  operator: z.string(),
});
