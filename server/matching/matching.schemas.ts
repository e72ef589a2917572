import { z } from 'zod';
import { MATCH_TOLERANCES } from '../../shared/matching/match-tolerances';
import { GRADE_FILTERS } from '../valves/valve.schemas';
import { VALVE_STATUSES } from '../valves/valve-status';

const volts = (what: string) => z.number().finite().describe(`${what}, V`);

const matchPoint = z.union([
  z.strictObject({
    label: z.string().trim().max(40).optional(),
    vaVolts: z.number().positive().describe('Anode voltage, V'),
    vg2Volts: z.number().nonnegative().optional().describe('Screen voltage, V (screen types)'),
    vg1Volts: volts('Grid-1 voltage (fixed bias)'),
  }),
  z.strictObject({
    label: z.string().trim().max(40).optional(),
    vaVolts: z.number().positive().describe('Anode voltage, V'),
    vg2Volts: z.number().nonnegative().optional().describe('Screen voltage, V (screen types)'),
    iaMilliamps: z.number().positive().describe('Anode current of an equal-current point, mA'),
  }),
]);

/** How valves are compared: the part of a run's request that a match set keeps. */
export const matchCriteriaFields = {
  valveType: z.string().trim().min(1).max(24).describe('Type designation, e.g. 12AX7'),
  operatingPoints: z.array(matchPoint).max(8).optional().describe('Default: the typical point'),
  window: z
    .strictObject({
      vaMinVolts: z.number().nonnegative(),
      vaMaxVolts: z.number().positive(),
      iaMinMilliamps: z.number().nonnegative(),
      iaMaxMilliamps: z.number().positive(),
      vg1Volts: z.array(z.number().finite()).min(1).max(20).optional(),
      vaSteps: z.number().int().min(2).max(60).optional(),
    })
    .optional()
    .describe('Region of the anode family (V, mA) over which whole curves are compared'),
  weights: z
    .strictObject({
      ia: z.number().nonnegative().optional(),
      gm: z.number().nonnegative().optional(),
      curve: z.number().nonnegative().optional(),
      sectionBalance: z.number().nonnegative().optional(),
    })
    .optional()
    .describe('Relative weights of Ia, gm, curve agreement and section balance'),
  tolerancePercent: z
    .number()
    .positive()
    .max(100)
    .default(MATCH_TOLERANCES.usualPercent)
    .describe('Largest spread of a group, % of its mean (common practice: 5 % usual)'),
  sections: z.enum(['first', 'both']).optional(),
  maxSectionImbalancePercent: z.number().nonnegative().optional(),
};

/** Criteria as a match set stores them (group size comes from the members). */
export const matchCriteriaSchema = z.strictObject(matchCriteriaFields);

/** Stored criteria of a run or set. */
export type MatchCriteriaInput = z.output<typeof matchCriteriaSchema>;

/** Body of POST /api/matching/runs. */
export const matchRunBody = z.strictObject({
  ...matchCriteriaFields,
  statuses: z
    .array(z.enum(VALVE_STATUSES))
    .min(1)
    .default(['in-stock'])
    .describe('Valve statuses of the pool (default in-stock)'),
  grades: z.array(z.enum(GRADE_FILTERS)).min(1).optional().describe('Grades of the pool'),
  dateFrom: z.iso.datetime({ offset: true }).optional().describe('Sweeps taken at or after'),
  dateTo: z.iso.datetime({ offset: true }).optional().describe('Sweeps taken at or before'),
  groupSize: z.number().int().min(2).max(16).describe('2 for pairs, 4 for quads ...'),
});

const runMember = z.object({
  valveId: z.number().int(),
  label: z.string(),
  sweepId: z.number().int(),
  sectionImbalancePercent: z.number().nullable(),
});

const pointSpread = z.object({
  label: z.string(),
  section: z.number().int(),
  kind: z.enum(['fixed-bias', 'equal-current']),
  vaVolts: z.number().optional().describe('Anode voltage of the point, V (absent on old runs)'),
  vg2Volts: z.number().nullable().optional().describe('Screen voltage, V; null for triodes'),
  iaMeanMilliamps: z.number(),
  iaSpreadPercent: z.number().nullable(),
  gmMeanMicrosiemens: z.number(),
  gmSpreadPercent: z.number(),
  vg1MeanVolts: z.number(),
  vg1SpreadVolts: z.number(),
});

/** A matched group of a run. */
export const runGroupSchema = z.object({
  members: z.array(runMember),
  scorePercent: z.number().describe('Largest distance between two members, %'),
  acceptable: z.boolean(),
  points: z.array(pointSpread),
  curveSpreadPercent: z.number().nullable(),
  exceeds: z.array(z.string()),
});

/** A stored matching run with its result. */
export const matchRunSchema = z.object({
  id: z.number().int(),
  criteria: z.record(z.string(), z.unknown()),
  groups: z.array(runGroupSchema),
  leftOver: z.array(
    z.object({
      valveId: z.number().int(),
      label: z.string(),
      reason: z.string(),
      detail: z.string(),
    }),
  ),
  totalScorePercent: z.number(),
  poolSize: z.number().int().describe('Valves with a usable sweep that were considered'),
  metricDescription: z.string(),
  tolerances: z.object({
    tightPercent: z.number(),
    usualPercent: z.number(),
    loosePercent: z.number(),
    note: z.string(),
  }),
  createdBy: z.string().nullable(),
  createdAt: z.string(),
});

/** A run as the API shows it. */
export type MatchRunView = z.infer<typeof matchRunSchema>;

/** Query of GET /api/valves/:id/partners. */
export const partnerQuery = z.object({
  limit: z.coerce.number().int().min(1).max(50).default(10),
  tolerancePercent: z.coerce.number().positive().max(100).default(MATCH_TOLERANCES.usualPercent),
});

/** Ranked partners of one valve. */
export const partnerListSchema = z.object({
  valveId: z.number().int(),
  criteria: z.record(z.string(), z.unknown()),
  partners: z.array(
    z.object({
      valveId: z.number().int(),
      label: z.string(),
      status: z.string(),
      sweepId: z.number().int(),
      distancePercent: z.number(),
      withinTolerance: z.boolean(),
      exceeds: z.array(z.string()),
    }),
  ),
  metricDescription: z.string(),
});
