import { z } from 'zod';
import { hasScreen, type ValveClass } from '../../shared/catalog/valve-types';
import { sweepPlanSchema } from '../sweeps/sweep.schemas';

/** Construction classes a type may have. */
export const VALVE_CLASSES = [
  'diode',
  'triode',
  'double-triode',
  'tetrode',
  'beam-tetrode',
  'pentode',
  'rectifier',
] as const satisfies readonly ValveClass[];

const sourceText = z.string().trim().min(1).max(200).describe('Where the figure comes from');
const confidenceText = z
  .string()
  .trim()
  .max(120)
  .nullable()
  .optional()
  .describe('How far the source is trusted, e.g. "high", "from memory"');

const positive = (max: number, what: string) => z.number().positive().max(max).describe(what);
const optionalPositive = (max: number, what: string) => positive(max, what).nullable().optional();

/** A designation: letters, digits and - / . (e.g. 12AX7, 6L6GC, ECC83). */
export const designationSchema = z
  .string()
  .trim()
  .min(1)
  .max(24)
  .regex(/^[A-Za-z0-9][A-Za-z0-9./-]*$/, 'letters, digits, ".", "/" and "-" only')
  .describe('Type designation, e.g. 12AX7');

/** Path parameter `:designation` (a designation or an equivalent, any case). */
export const designationParams = z.object({
  designation: z.string().trim().min(1).max(24).describe('Designation or equivalent'),
});

/** A typical operating point as given by a client; units V, mA, µS, kΩ. */
export const operatingPointInput = z.strictObject({
  vaVolts: positive(2000, 'Anode voltage, V'),
  vg2Volts: z.number().min(0).max(2000).nullable().optional().describe('Screen voltage, V'),
  vg1Volts: z.number().min(-500).max(50).describe('Grid-1 voltage, V'),
  iaMilliamps: z.number().min(0).max(5000).describe('Anode current, mA'),
  ig2Milliamps: z.number().min(0).max(1000).nullable().optional().describe('Screen current, mA'),
  gmMicrosiemens: optionalPositive(1e6, 'Mutual conductance, µS'),
  raKiloohms: optionalPositive(1e5, 'Anode resistance, kΩ'),
  mu: optionalPositive(1e4, 'Amplification factor'),
  source: sourceText,
  confidence: confidenceText,
});

const ratingsShape = {
  vaMaxVolts: positive(5000, 'Maximum anode voltage, V'),
  vg2MaxVolts: optionalPositive(5000, 'Maximum screen voltage, V'),
  paMaxWatts: positive(1000, 'Maximum anode dissipation, W (per section)'),
  pg2MaxWatts: optionalPositive(200, 'Maximum screen dissipation, W'),
  ikMaxMilliamps: optionalPositive(5000, 'Maximum cathode current, mA'),
  vhkMaxVolts: optionalPositive(2000, 'Maximum heater-cathode voltage, V'),
  source: sourceText,
  confidence: confidenceText,
};

/** Maximum ratings as given by a client. */
export const ratingsInput = z.strictObject(ratingsShape);

const korenTriode = {
  mu: z.number().positive(),
  ex: z.number().positive(),
  kg1: z.number().positive(),
  kp: z.number().positive(),
  kvb: z.number().positive(),
};

/** A published Koren model (N. Koren, Glass Audio 8(5), 1996). */
export const modelInput = z.discriminatedUnion('kind', [
  z.strictObject({
    kind: z.literal('triode'),
    params: z.strictObject(korenTriode),
    source: sourceText,
  }),
  z.strictObject({
    kind: z.literal('pentode'),
    params: z.strictObject({ ...korenTriode, kg2: z.number().positive() }),
    source: sourceText,
  }),
]);

const typeFields = {
  equivalents: z.array(designationSchema).max(12).optional().describe('Equivalent designations'),
  valveClass: z.enum(VALVE_CLASSES),
  base: z.string().trim().min(1).max(24).describe('Base, e.g. B9A, octal'),
  sections: z.number().int().min(1).max(4).describe('Sections in the envelope'),
  heaterVolts: positive(120, 'Heater voltage, V'),
  heaterAmps: positive(20, 'Heater current, A'),
  operatingPoints: z
    .array(operatingPointInput)
    .min(1)
    .max(12)
    .describe('Typical operating points; the first is the reference for figures and grading'),
  ratings: ratingsInput,
  model: modelInput.nullable().optional(),
  notes: z.string().trim().max(2000).nullable().optional(),
};

/** A whole type as stored: every field present and checked for consistency. */
export const valveTypeInput = z
  .strictObject({ designation: designationSchema, ...typeFields })
  .superRefine((t, ctx) => {
    for (const problem of typeProblems(t)) ctx.addIssue({ code: 'custom', ...problem });
  });

/** Body of POST /api/valve-types. */
export const createValveTypeBody = valveTypeInput;

/** Body of PATCH /api/valve-types/:designation: ratings merge field by field; lists replace. */
export const patchValveTypeBody = z
  .strictObject({
    equivalents: typeFields.equivalents,
    valveClass: typeFields.valveClass.optional(),
    base: typeFields.base.optional(),
    sections: typeFields.sections.optional(),
    heaterVolts: typeFields.heaterVolts.optional(),
    heaterAmps: typeFields.heaterAmps.optional(),
    operatingPoints: typeFields.operatingPoints.optional(),
    ratings: z.strictObject(ratingsShape).partial().optional(),
    model: typeFields.model,
    notes: typeFields.notes,
  })
  .refine((b) => Object.values(b).some((v) => v !== undefined), {
    message: 'give at least one field to change',
  });

/** A type as given by a client and parsed. */
export type ValveTypeInput = z.output<typeof valveTypeInput>;

/** Problems of a type that no single field shows, with the path of the field at fault. */
function typeProblems(t: z.output<z.ZodObject<typeof typeFields>> & { designation: string }) {
  const problems: { path: (string | number)[]; message: string }[] = [];
  const screen = hasScreen(t.valveClass);
  const r = t.ratings;
  if (screen && (r.vg2MaxVolts ?? null) === null) {
    problems.push({ path: ['ratings', 'vg2MaxVolts'], message: `a ${t.valveClass} needs Vg2 max` });
  }
  if (!screen && (r.vg2MaxVolts ?? null) !== null) {
    problems.push({ path: ['ratings', 'vg2MaxVolts'], message: `a ${t.valveClass} has no screen` });
  }
  t.operatingPoints.forEach((op, i) => {
    const at = (field: string) => ['operatingPoints', i, field];
    const vg2 = op.vg2Volts ?? null;
    if (screen && vg2 === null)
      problems.push({ path: at('vg2Volts'), message: 'screen voltage needed' });
    if (!screen && vg2 !== null)
      problems.push({ path: at('vg2Volts'), message: 'this class has no screen' });
    if (op.vaVolts > r.vaMaxVolts) {
      problems.push({ path: at('vaVolts'), message: `above Va max ${r.vaMaxVolts} V` });
    }
    if (vg2 !== null && r.vg2MaxVolts != null && vg2 > r.vg2MaxVolts) {
      problems.push({ path: at('vg2Volts'), message: `above Vg2 max ${r.vg2MaxVolts} V` });
    }
    // Half a percent of slack: data sheets round the figures of their own maximum points.
    const paWatts = (op.vaVolts * op.iaMilliamps) / 1000;
    if (paWatts > r.paMaxWatts * 1.005) {
      problems.push({
        path: at('iaMilliamps'),
        message: `${paWatts} W at this point is above Pa max ${r.paMaxWatts} W`,
      });
    }
  });
  if (t.model) {
    const wants = screen ? 'pentode' : 'triode';
    if (t.model.kind !== wants) {
      problems.push({
        path: ['model', 'kind'],
        message: `a ${t.valveClass} takes a ${wants} model`,
      });
    }
  }
  const names = [t.designation, ...(t.equivalents ?? [])].map((n) => n.toUpperCase());
  if (new Set(names).size < names.length) {
    problems.push({ path: ['equivalents'], message: 'names repeat the designation or each other' });
  }
  return problems;
}

const operatingPointView = z.object({
  vaVolts: z.number(),
  vg2Volts: z.number().nullable(),
  vg1Volts: z.number(),
  iaMilliamps: z.number(),
  ig2Milliamps: z.number().nullable(),
  gmMicrosiemens: z.number().nullable(),
  raKiloohms: z.number().nullable(),
  mu: z.number().nullable(),
  source: z.string(),
  confidence: z.string().nullable(),
});

/** A type as the API shows it (the catalog's shape plus id, sources and library fields). */
export const valveTypeViewSchema = z.object({
  id: z.number().int(),
  designation: z.string(),
  equivalents: z.array(z.string()),
  valveClass: z.enum(VALVE_CLASSES),
  base: z.string(),
  sections: z.number().int(),
  heaterVolts: z.number(),
  heaterAmps: z.number(),
  operatingPoints: z.array(operatingPointView),
  ratings: z.object({
    vaMaxVolts: z.number(),
    vg2MaxVolts: z.number().nullable(),
    paMaxWatts: z.number(),
    pg2MaxWatts: z.number().nullable(),
    ikMaxMilliamps: z.number().nullable(),
    vhkMaxVolts: z.number().nullable(),
    source: z.string(),
    confidence: z.string().nullable(),
  }),
  model: z
    .object({
      kind: z.enum(['triode', 'pentode']),
      params: z.record(z.string(), z.number()),
      source: z.string(),
    })
    .nullable(),
  notes: z.string().nullable(),
  hasScreen: z.boolean(),
  hasModel: z.boolean(),
  hasNominalCurves: z.boolean(),
  sources: z.array(z.string()).describe('Every distinct source cited by the figures of the type'),
  defaultPlan: sweepPlanSchema,
  updatedAt: z.string(),
});

/** Query of the nominal-curve uploads. */
export const nominalCurveQuery = z.object({
  source: z
    .string()
    .trim()
    .max(200)
    .optional()
    .describe('Where the curves come from (or the multipart field "source")'),
});

/** One nominal curve's summary in a preview. */
const curveSummary = z.object({
  vg1Volts: z.number(),
  pointCount: z.number().int(),
  vaMinVolts: z.number(),
  vaMaxVolts: z.number(),
});

/** Answer of the nominal-curve preview. */
export const nominalPreviewSchema = z.object({
  curves: z.array(curveSummary),
  pointCount: z.number().int(),
  hasScreenCurrent: z.boolean(),
});

/** The stored nominal curves of a type. */
export const nominalCurvesSchema = z.object({
  designation: z.string(),
  source: z.string().nullable(),
  uploadedBy: z.string().nullable(),
  uploadedAt: z.string().nullable(),
  curves: z.array(
    z.object({
      vg1Volts: z.number(),
      points: z.array(
        z.object({
          vaVolts: z.number(),
          iaMilliamps: z.number(),
          ig2Milliamps: z.number().nullable(),
        }),
      ),
    }),
  ),
});
