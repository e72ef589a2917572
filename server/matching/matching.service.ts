import type { z } from 'zod';
import {
  findPartners,
  matchValves,
  MATCH_TOLERANCES,
  METRIC_DESCRIPTION,
  prepareValves,
  resolveCriteria,
  type MatchResult,
} from '../../shared/matching/index';
import type { AuditService } from '../audit/audit.service';
import type { AuthUser } from '../auth/auth-user';
import type { HubDb } from '../db/database';
import { HttpError, notFound } from '../http/http-error';
import { findValve } from '../valves/valve.repository';
import { readSettings } from '../settings/settings.service';
import { findMatchRun, insertMatchRun } from './match-run.repository';
import { candidatesOf, loadPool, matchingRefused, toMatchingCriteria } from './matching-pool';
import type {
  MatchRunView,
  matchRunBody,
  partnerListSchema,
  partnerQuery,
} from './matching.schemas';

/** What a stored run's result_json holds. */
interface StoredRunResult {
  groups: MatchRunView['groups'];
  leftOver: MatchRunView['leftOver'];
  totalScorePercent: number;
  poolSize: number;
}

const TOLERANCES = {
  ...MATCH_TOLERANCES,
  note: 'Common practice, no single source: 5 % a usual target, 2-3 % tight, 10 % loose.',
};

/** Matching runs and partner search over the stock. */
export type MatchingService = ReturnType<typeof createMatchingService>;

/** Builds the matching service. */
export function createMatchingService({ db, audit }: { db: HubDb; audit: AuditService }) {
  async function view(id: number): Promise<MatchRunView> {
    const row = await findMatchRun(db, id);
    if (!row) throw notFound('match_run', id);
    const result = JSON.parse(row.result_json) as StoredRunResult;
    return {
      id: row.id,
      criteria: JSON.parse(row.criteria_json),
      ...result,
      metricDescription: METRIC_DESCRIPTION,
      tolerances: TOLERANCES,
      createdBy: row.created_by_name,
      createdAt: row.created_at,
    };
  }

  return {
    view,

    /** Groups the pool the body describes and keeps the run. */
    async run(body: z.output<typeof matchRunBody>, user: AuthUser): Promise<MatchRunView> {
      const pool = await loadPool(db, body);
      const result = matchValves(candidatesOf(pool), toMatchingCriteria(body, body.groupSize));
      if (!result.ok) throw matchingRefused(result.reason);
      const sweepOf = new Map(pool.map((p) => [String(p.row.valve_id), p.row.sweep_id]));
      const stored: StoredRunResult = {
        ...storedResult(result, sweepOf),
        poolSize: pool.length,
      };
      const id = await insertMatchRun(db, {
        valve_type: body.valveType,
        criteria_json: JSON.stringify(body),
        result_json: JSON.stringify(stored),
        created_by: user.id,
        created_at: new Date().toISOString(),
      });
      await audit.record(user, 'matching.run', `match-run:${id}`, {
        valveType: body.valveType,
        groupSize: body.groupSize,
        poolSize: pool.length,
        groups: stored.groups.length,
      });
      return view(id);
    },

    /** The nearest partners of one valve among in-stock valves of its type. */
    async partners(
      valveId: number,
      q: z.output<typeof partnerQuery>,
    ): Promise<z.infer<typeof partnerListSchema>> {
      const { gradeThresholds } = await readSettings(db);
      const valve = await findValve(db, gradeThresholds, valveId);
      if (!valve) throw notFound('valve', valveId);
      const criteriaInput = {
        valveType: valve.type_designation,
        tolerancePercent: q.tolerancePercent,
      };
      const resolved = resolveCriteria(toMatchingCriteria(criteriaInput, 2));
      if (!resolved.ok) throw matchingRefused(resolved.reason);
      const pool = await loadPool(db, {
        valveType: valve.type_designation,
        statuses: ['in-stock'],
      });
      const own = await loadPool(db, {
        valveType: valve.type_designation,
        statuses: [],
        valveIds: [valveId],
      });
      if (own.length === 0) {
        throw new HttpError(409, 'no_sweep', `${valve.label} has no complete anode-family sweep`);
      }
      const all = [...own, ...pool.filter((p) => p.row.valve_id !== valveId)];
      const { features, excluded } = prepareValves(candidatesOf(all), resolved.criteria);
      const target = features.find((f) => f.id === String(valveId));
      if (!target) {
        throw matchingRefused(excluded.find((e) => e.id === String(valveId))?.detail ?? 'no data');
      }
      const found = findPartners(target, features, resolved.criteria, q.limit);
      if (!found.ok) throw matchingRefused(found.reason);
      const byId = new Map(all.map((p) => [String(p.row.valve_id), p.row]));
      return {
        valveId,
        criteria: criteriaInput,
        partners: found.partners.map((p) => ({
          valveId: Number(p.id),
          label: p.label,
          status: byId.get(p.id)!.status,
          sweepId: byId.get(p.id)!.sweep_id,
          distancePercent: p.distance.distancePercent,
          withinTolerance: p.withinTolerance,
          exceeds: p.exceeds,
        })),
        metricDescription: METRIC_DESCRIPTION,
      };
    },
  };
}

function storedResult(
  result: MatchResult,
  sweepOf: Map<string, number>,
): Omit<StoredRunResult, 'poolSize'> {
  return {
    groups: result.groups.map((g) => ({
      ...g,
      members: g.members.map((m) => ({
        valveId: Number(m.id),
        label: m.label,
        sweepId: sweepOf.get(m.id)!,
        sectionImbalancePercent: m.sectionImbalancePercent,
      })),
    })),
    leftOver: result.leftOver.map((l) => ({
      valveId: Number(l.id),
      label: l.label,
      reason: l.reason,
      detail: l.detail,
    })),
    totalScorePercent: result.totalScorePercent,
  };
}
