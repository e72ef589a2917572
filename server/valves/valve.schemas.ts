import { z } from 'zod';
import { HARD_FAILS } from '../../shared/grading/grade-quick-test';
import { VALVE_GRADES } from '../../shared/grading/grade-thresholds';
import { pageFields, pageOf } from '../http/common-schemas';
import { quickTestSummarySchema } from '../quick-tests/quick-test.schemas';
import { sweepViewSchema } from '../sweeps/sweep.schemas';
import { ORIGIN_KINDS, VALVE_STATUSES } from './valve-status';

const text = (max: number, what: string) =>
  z.string().trim().max(max).nullable().optional().describe(what);

/** A label as written on the valve or its box. */
export const labelSchema = z
  .string()
  .trim()
  .min(1)
  .max(40)
  .regex(/^[^\s/\\?#%]+( [^\s/\\?#%]+)*$/, 'no slashes, ?, #, % or runs of spaces')
  .describe('Label, unique; generated from the workshop prefix when left out');

const valveFields = {
  maker: text(80, 'Maker as printed on the valve'),
  dateCode: text(40, 'Date code as printed'),
  originKind: z.enum(ORIGIN_KINDS).nullable().optional().describe('Where the valve came from'),
  originText: text(200, 'The lot, supplier or customer amplifier, in words'),
  location: text(80, 'Where it is stored, e.g. Drawer C3'),
  status: z.enum(VALVE_STATUSES).optional().describe('Defaults to in-stock'),
  notes: text(4000, 'Free notes'),
};

/** Body of POST /api/valves. */
export const createValveBody = z.strictObject({
  label: labelSchema.optional(),
  type: z.string().trim().min(1).max(24).describe('Type designation or equivalent'),
  ...valveFields,
});

/** Body of PATCH /api/valves/:id. */
export const patchValveBody = z
  .strictObject({
    label: labelSchema.optional(),
    type: z.string().trim().min(1).max(24).optional(),
    ...valveFields,
  })
  .refine((b) => Object.values(b).some((v) => v !== undefined), {
    message: 'give at least one field to change',
  });

/** Sort keys of GET /api/valves. */
export const VALVE_SORT_KEYS = [
  'label',
  'type',
  'status',
  'location',
  'updatedAt',
  'grade',
] as const;

/** A record's grade: a quality grade by % of nominal, or a quick test's hard fail. */
export const RECORD_GRADES = [...VALVE_GRADES, ...HARD_FAILS] as const;

/** Grades a valve list can be filtered by; 'ungraded' has no figures yet. */
export const GRADE_FILTERS = [...RECORD_GRADES, 'ungraded'] as const;

/** Query of GET /api/valves. */
export const valveListQuery = z.object({
  ...pageFields,
  sort: z.enum(VALVE_SORT_KEYS).default('label'),
  order: z.enum(['asc', 'desc']).default('asc'),
  type: z.string().trim().max(24).optional().describe('Type designation or equivalent'),
  status: z.enum(VALVE_STATUSES).optional(),
  grade: z.enum(GRADE_FILTERS).optional(),
  location: z.string().trim().max(80).optional().describe('Exact location'),
  q: z.string().trim().max(80).optional().describe('Search in label, maker and notes'),
});

/** Query of GET /api/valves/export. */
export const valveExportQuery = z.object({ format: z.enum(['csv']).default('csv') });

/** A valve record as the API lists it. */
export const valveViewSchema = z.object({
  id: z.number().int(),
  label: z.string(),
  type: z.string().describe('Type designation'),
  maker: z.string().nullable(),
  dateCode: z.string().nullable(),
  originKind: z.enum(ORIGIN_KINDS).nullable(),
  originText: z.string().nullable(),
  location: z.string().nullable(),
  status: z.enum(VALVE_STATUSES),
  notes: z.string().nullable(),
  grade: z
    .enum(RECORD_GRADES)
    .nullable()
    .describe('From the newest sweep with figures or completed quick test'),
  percentOfNominal: z
    .number()
    .nullable()
    .describe('gm (Ia where gm is unknown) as % of nominal at the reference point'),
  gradeSource: z.enum(['sweep', 'quick-test']).nullable().describe('What the grade is from'),
  gradedAt: z.string().nullable().describe('When that sweep or quick test was taken'),
  sweepCount: z.number().int(),
  lastSweepAt: z.string().nullable(),
  createdBy: z.string().nullable(),
  updatedBy: z.string().nullable(),
  createdAt: z.string(),
  updatedAt: z.string(),
});

/** Figures of one sweep at the type's reference operating point (V, mA, µS, kΩ, %). */
export const sweepFiguresSchema = z.object({
  sweepId: z.number().int(),
  at: z.string().describe('When the sweep was taken'),
  vaVolts: z.number().nullable(),
  vg1Volts: z.number().nullable(),
  iaMilliamps: z.number().nullable(),
  gmMicrosiemens: z.number().nullable(),
  raKiloohms: z.number().nullable(),
  mu: z.number().nullable(),
  iaPercent: z.number().nullable(),
  gmPercent: z.number().nullable(),
  refusal: z.string().nullable().describe('Why there are no figures for this sweep'),
  extendedVolts: z
    .number()
    .describe('How far a cut curve was carried past its last reading to the point, V (0: none)'),
});

/** Answer of GET /api/valves/:id. */
export const valveDetailSchema = valveViewSchema.extend({
  referencePoint: z
    .object({
      vaVolts: z.number(),
      vg2Volts: z.number().nullable(),
      vg1Volts: z.number(),
      iaMilliamps: z.number(),
      gmMicrosiemens: z.number().nullable(),
    })
    .describe("The type's reference operating point the figures are taken at"),
  sweeps: z.array(sweepViewSchema).describe('Newest first'),
  trend: z
    .array(sweepFiguresSchema)
    .describe(
      'Oldest first, one entry a sweep of section 1 (double triodes: section 2 is not in it)',
    ),
  quickTests: z.array(quickTestSummarySchema).describe('Newest first, at most 200'),
});

/** Answer of GET /api/valves. */
export const valvePage = pageOf(valveViewSchema);

/** Answer of POST /api/valves/import. */
export const valveImportReport = z.object({
  imported: z.number().int(),
  labels: z.array(z.string()).describe('Labels of the imported valves, in file order'),
  rejected: z.array(z.object({ line: z.number().int(), reason: z.string() })),
  ignoredColumns: z.array(z.string()).describe('Header columns the import does not read'),
});
