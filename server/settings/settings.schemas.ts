import { z } from 'zod';
import type { GradeThresholds } from '../../shared/grading/grade-thresholds';

/** Grade thresholds as the API takes and shows them (GradeThresholds of shared/grading). */
export const gradeThresholdsSchema = z
  .strictObject({
    strongMinPercent: z
      .number()
      .min(1)
      .max(200)
      .describe("Least % of nominal (lower of gm and Ia) that grades 'strong'"),
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
  })
  .refine((b) => Object.values(b).some((v) => v !== undefined), {
    message: 'give at least one setting to change',
  });

/** The workshop's settings. */
export type WorkshopSettings = z.output<typeof workshopSettingsSchema>;
