import { z } from 'zod';
import { pageFields, pageOf } from '../http/common-schemas';
import { matchCriteriaSchema } from './matching.schemas';

/** Body of POST /api/match-sets: a group of a run, or valves with criteria. */
export const createMatchSetBody = z.union([
  z.strictObject({
    runId: z.number().int().positive(),
    groupIndex: z.number().int().min(0).describe('Index of the group in the run, 0-based'),
  }),
  z.strictObject({
    valveIds: z.array(z.number().int().positive()).min(2).max(16),
    valveType: z.string().trim().min(1).max(24),
    criteria: matchCriteriaSchema.omit({ valveType: true }).partial().optional(),
  }),
]);

/** Query of GET /api/match-sets. */
export const matchSetListQuery = z.object({
  ...pageFields,
  status: z.enum(['reserved', 'sold', 'released']).optional(),
});

const reading = z.object({
  label: z.string(),
  vg1Volts: z.number().nullable(),
  iaMilliamps: z.number().nullable(),
  gmMicrosiemens: z.number().nullable(),
});

/** One valve of a set with what it was matched on. */
export const matchSetMemberSchema = z.object({
  valveId: z.number().int(),
  label: z.string(),
  valveType: z.string(),
  status: z.string(),
  grade: z.string().nullable(),
  gradePercent: z.number().nullable(),
  readings: z.array(reading).describe('Ia (mA), gm (µS) at each operating point'),
  sweepId: z.number().int().nullable(),
  sweptAt: z.string().nullable(),
  bench: z.string().nullable(),
  conditions: z
    .object({
      vaStartVolts: z.number(),
      vaStopVolts: z.number(),
      vaStepVolts: z.number(),
      vg1Volts: z.array(z.number()),
      vg2Volts: z.number(),
      heaterVolts: z.number(),
    })
    .nullable(),
});

/** A match set in a list. */
export const matchSetSummarySchema = z.object({
  id: z.number().int(),
  code: z.string(),
  valveType: z.string(),
  status: z.enum(['reserved', 'sold', 'released']),
  memberCount: z.number().int(),
  labels: z.array(z.string()),
  createdBy: z.string().nullable(),
  createdAt: z.string(),
});

/** A match set with its members, spreads, mailings and links. */
export const matchSetDetailSchema = matchSetSummarySchema.extend({
  criteria: z.record(z.string(), z.unknown()),
  runId: z.number().int().nullable(),
  figures: z.object({
    scorePercent: z.number(),
    acceptable: z.boolean(),
    tolerancePercent: z.number(),
    curveSpreadPercent: z.number().nullable(),
    exceeds: z.array(z.string()),
    points: z.array(z.record(z.string(), z.unknown())),
  }),
  members: z.array(matchSetMemberSchema),
  mailings: z.array(
    z.object({
      to: z.string(),
      at: z.string(),
      by: z.string().nullable(),
      messageId: z.string().nullable(),
    }),
  ),
  shares: z.array(
    z.object({ id: z.number().int(), expiresAt: z.string(), revokedAt: z.string().nullable() }),
  ),
});

/** A set as the API shows it. */
export type MatchSetDetail = z.infer<typeof matchSetDetailSchema>;

/** A page of sets. */
export const matchSetPage = pageOf(matchSetSummarySchema);

/** Body of POST /api/match-sets/:id/send-report. */
export const sendReportBody = z.strictObject({
  to: z.email().max(200),
  message: z.string().trim().max(4000).optional(),
});

/** Body of POST /api/match-sets/:id/share. */
export const shareBody = z.strictObject({
  expiresInDays: z.number().int().min(1).max(365).default(30),
});

/** Answer of POST /api/match-sets/:id/share: the token is shown this once. */
export const shareResponse = z.object({
  id: z.number().int(),
  url: z.string(),
  reportUrl: z.string(),
  token: z.string(),
  expiresAt: z.string(),
});

/** Params of DELETE /api/match-sets/:id/share/:shareId. */
export const shareParams = z.object({
  id: z.coerce.number().int().positive(),
  shareId: z.coerce.number().int().positive(),
});

/** Params of the buyer's routes. */
export const tokenParams = z.object({ token: z.string().min(16).max(100) });

const reportMember = matchSetMemberSchema.omit({ status: true }).extend({
  curves: z.array(
    z.object({
      vg1Volts: z.number(),
      points: z.array(z.tuple([z.number(), z.number()])).describe('[Va V, Ia mA], downsampled'),
    }),
  ),
});

/** A match report as a page shows it: the set without people or links, with its curves. */
export const matchReportSchema = z.object({
  workshop: z.string(),
  code: z.string(),
  valveType: z.string(),
  status: z.string(),
  createdAt: z.string(),
  figures: matchSetDetailSchema.shape.figures,
  toleranceNote: z.string().describe('Where the tolerance comes from (common practice or set)'),
  members: z.array(reportMember),
  notes: z.array(z.string()).describe('What was measured and how to read the figures'),
  cautions: z.array(z.string()).describe('Safety cautions printed on every report'),
});

/** A match report as a page shows it. */
export type MatchReportView = z.infer<typeof matchReportSchema>;

/** What a buyer's link shows: the report and when the link expires. */
export const sharedMatchSetSchema = matchReportSchema.extend({ expiresAt: z.string() });
