import { z } from 'zod';
import type { GradeThresholds } from '../../shared/grading/grade-thresholds';
import type { QuickTestThresholds } from '../../shared/grading/quick-test-thresholds';

/** Grade thresholds as the API takes and shows them (GradeThresholds of shared/grading). */
export const gradeThresholdsSchema = z
  .strictObject({
    strongMinPercent: z
      .number()
      .min(1)
      .max(200)
      .describe("Least % of nominal (gm; Ia where gm is unknown) that grades 'strong'"),
    fairMinPercent: z
      .number()
      .min(1)
      .max(200)
      .describe("Least % of nominal that grades 'fair'; below it 'weak'"),
  })
  .refine((t) => t.strongMinPercent > t.fairMinPercent, {
    message: 'strongMinPercent must be above fairMinPercent',
    path: ['strongMinPercent'],
  }) satisfies z.ZodType<GradeThresholds>;

/** The limits of a quick test's hard fails (QuickTestThresholds less the grade thresholds). */
export type QuickTestLimits = Omit<QuickTestThresholds, keyof GradeThresholds>;

const quickTestLimitFields = z.strictObject({
  reducedHeaterMaxDropPercent: z
    .number()
    .min(1)
    .max(50)
    .describe('Largest fall of gm at 10 % less heater before a cathode counts as worn, %'),
  gasMaxMicroamps: z
    .number()
    .min(0.01)
    .max(100)
    .describe('Largest reverse grid-1 current before a valve counts as gassy, uA'),
  leakageMaxMicroamps: z.number().min(0.1).max(1000).describe('Largest heater-cathode leakage, uA'),
  electrodeLeakageMaxMicroamps: z
    .number()
    .min(0.01)
    .max(1000)
    .describe('Largest leakage between any other two electrodes, uA'),
  shortMinMicroamps: z
    .number()
    .min(1)
    .max(10000)
    .describe('Current from which a pair counts as shorted rather than leaky, uA'),
});

/** Quick-test hard-fail limits as the API shows them, uA and %. */
export const quickTestLimitsSchema = quickTestLimitFields.refine(
  (t) => t.shortMinMicroamps > Math.max(t.leakageMaxMicroamps, t.electrodeLeakageMaxMicroamps),
  {
    message: 'shortMinMicroamps must be above both leakage limits',
    path: ['shortMinMicroamps'],
  },
) satisfies z.ZodType<QuickTestLimits>;

/** The workshop's settings as the API shows them. */
export const workshopSettingsSchema = z.object({
  labelPrefix: z
    .string()
    .regex(/^[A-Z0-9]{1,8}$/, '1 to 8 capital letters or digits')
    .describe('Prefix of generated valve labels, e.g. KL for KL-0001'),
  labelDigits: z.number().int().min(3).max(8).describe('Digits of the label number'),
  nextLabelNumber: z
    .number()
    .int()
    .min(1)
    .max(99_999_999)
    .describe('Number the next generated label gets (labels in use are skipped)'),
  gradeThresholds: gradeThresholdsSchema,
  quickTestLimits: quickTestLimitsSchema,
});

/** Body of PUT /api/settings: any of the settings; the rest stay. */
export const putSettingsBody = z
  .strictObject({
    labelPrefix: z
      .string()
      .trim()
      .transform((s) => s.toUpperCase())
      .pipe(workshopSettingsSchema.shape.labelPrefix)
      .optional(),
    labelDigits: workshopSettingsSchema.shape.labelDigits.optional(),
    nextLabelNumber: workshopSettingsSchema.shape.nextLabelNumber.optional(),
    gradeThresholds: gradeThresholdsSchema.optional(),
    quickTestLimits: quickTestLimitFields
      .partial()
      .optional()
      .describe('Any of the limits; the rest stay'),
  })
  .refine((b) => Object.values(b).some((v) => v !== undefined), {
    message: 'give at least one setting to change',
  });

/** The workshop's settings. */
export type WorkshopSettings = z.output<typeof workshopSettingsSchema>;
