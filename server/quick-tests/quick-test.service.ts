import type { z } from 'zod';
import {
  findValveType,
  limitsFromType,
  type ValveTypeData,
} from '../../shared/catalog/valve-types';
import { limitsFromDevice, strictestLimits, type PlanLimits } from '../../shared/domain/plan-check';
import { checkProblems } from '../../shared/grading/check-limits';
import { QUICK_TEST_PARTS } from '../../shared/grading/quick-test-part';
import { planQuickTest } from '../../shared/grading/quick-test-plan';
import {
  DEFAULT_QUICK_TEST_THRESHOLDS,
  type QuickTestThresholds,
} from '../../shared/grading/quick-test-thresholds';
import type { QuickTestView } from '../../shared/hub/messages';
import type { AuditService } from '../audit/audit.service';
import type { AuthUser } from '../auth/auth-user';
import { planLimitsOfBench, type BenchService } from '../benches/bench.service';
import type { HubDb } from '../db/database';
import { HttpError, notFound } from '../http/http-error';
import type { BenchPresence } from '../live/bench-presence';
import { planProblems, type LimitSource } from '../sweeps/sweep-limits';
import { findActiveSweepOfBench } from '../sweeps/sweep.repository';
import type { QuickTestEvents, QuickTestRunner } from './quick-test-runner';
import { toQuickTestView } from './quick-test-view';
import type { quickTestListQuery, startQuickTestBody } from './quick-test.schemas';
import {
  ACTIVE_QUICK_TEST_STATUSES,
  findQuickTest,
  insertQuickTest,
  listQuickTests,
  type QuickTestRecord,
} from './quick-test.repository';

/** A valve type as quick tests need it: its published data and its rating limits. */
export interface QuickTestType {
  /** The type's figures (a type-library view fits: it has every field of ValveTypeData). */
  data: ValveTypeData;
  /** Limits from its maximum ratings, as sweeps apply them. */
  limits: PlanLimits;
}

/** A valve record as quick tests need it. */
export interface QuickTestValve {
  id: number;
  label: string;
  /** Designation of the record's type. */
  valveType: string;
}

/** Props of the quick-test service. */
export interface QuickTestServiceProps {
  db: HubDb;
  presence: BenchPresence;
  benches: BenchService;
  audit: AuditService;
  events: QuickTestEvents;
  runner: QuickTestRunner;
  /** Looks a type up by designation or equivalent; default the built-in catalogue. */
  findType?: (name: string) => Promise<QuickTestType | undefined>;
  /** Looks a valve record up; default: none known (valveId is refused). */
  findValve?: (id: number) => Promise<QuickTestValve | undefined>;
  /** The workshop's thresholds; default DEFAULT_QUICK_TEST_THRESHOLDS. */
  thresholds?: () => Promise<QuickTestThresholds>;
}

/** Starting, aborting, listing and reading quick tests. */
export type QuickTestService = ReturnType<typeof createQuickTestService>;

async function catalogType(name: string): Promise<QuickTestType | undefined> {
  const data = findValveType(name);
  return data && { data, limits: limitsFromType(data) };
}

/** Builds the quick-test service. */
export function createQuickTestService(props: QuickTestServiceProps) {
  const { db, presence, benches, audit, events, runner } = props;
  const findType = props.findType ?? catalogType;
  const findValve = props.findValve ?? (async () => undefined);
  const thresholds = props.thresholds ?? (async () => DEFAULT_QUICK_TEST_THRESHOLDS);

  async function requireRecord(id: number): Promise<QuickTestRecord> {
    const row = await findQuickTest(db, id);
    if (!row) throw notFound('quick_test', id);
    return row;
  }

  const view = (row: QuickTestRecord) => toQuickTestView(row, runner.live(row.id));

  return {
    /**
     * Plans a quick test within the strictest of the bench's limits, the tracer's and the
     * type's ratings (as for sweeps; there is no override) and starts it on the bench.
     */
    async start(
      input: z.output<typeof startQuickTestBody>,
      user: AuthUser,
    ): Promise<QuickTestView> {
      const bench = await benches.requireRow(input.benchId);
      const type = await findType(input.valveType);
      if (!type) {
        const message = `unknown valve type ${input.valveType}`;
        throw new HttpError(400, 'validation_failed', message, { valveType: message });
      }
      const valve = input.valveId === undefined ? undefined : await findValve(input.valveId);
      if (input.valveId !== undefined && !valve) {
        const message = `no valve record ${input.valveId}`;
        throw new HttpError(400, 'validation_failed', message, { valveId: message });
      }
      if (valve && valve.valveType.toUpperCase() !== type.data.designation.toUpperCase()) {
        throw new HttpError(
          422,
          'valve_type_mismatch',
          `valve ${valve.label} is a ${valve.valveType}, not a ${type.data.designation}`,
          { valveType: `valve ${valve.label} is a ${valve.valveType}` },
        );
      }
      if (!presence.isOnline(bench.id)) {
        throw new HttpError(409, 'bench_offline', `${bench.name} is not connected`);
      }
      const capabilities = presence.capabilities(bench.id);
      const status = presence.status(bench.id);
      if (!capabilities || status?.deviceOnline === false) {
        throw new HttpError(409, 'device_offline', `the tracer of ${bench.name} is not connected`);
      }
      const busy =
        runner.activeOnBench(bench.id) ||
        (await findActiveSweepOfBench(db, bench.id)) !== undefined ||
        (status?.sweepId ?? null) !== null ||
        (status?.checkId ?? null) !== null;
      if (busy) throw new HttpError(409, 'bench_busy', `${bench.name} is busy`);

      const extensions = presence.extensions(bench.id);
      const parts = QUICK_TEST_PARTS.filter((p) => (input.parts ?? QUICK_TEST_PARTS).includes(p));
      const sources: LimitSource[] = [
        { label: `${bench.name} limits`, limits: planLimitsOfBench(bench) },
        { label: 'tracer limits', limits: limitsFromDevice(capabilities) },
        { label: `${type.data.designation} maximum ratings`, limits: type.limits },
      ];
      const limits = strictestLimits(...sources.map((s) => s.limits));
      const plan = planQuickTest({
        type: type.data,
        parts,
        limits,
        features: extensions?.features ?? [],
        leakageMaxVolts: extensions?.leakageMaxVolts ?? null,
        options: {
          warmupSeconds: input.warmupSeconds,
          leakageTestVolts: input.leakageTestVolts,
          heaterSettleSeconds: input.heaterSettleSeconds,
        },
      });
      // The planner keeps within the limits; the same checks as for a sweep, again, say so.
      for (const [i, step] of plan.steps.entries()) {
        const fields =
          step.check.kind === 'transfer'
            ? planProblems(step.check.plan, sources)
            : Object.fromEntries(
                checkProblems(step.check, limits, extensions?.leakageMaxVolts ?? null).map(
                  (p, j) => [`steps.${i}.${j}`, p],
                ),
              );
        if (Object.keys(fields).length > 0) {
          const first = Object.values(fields)[0];
          throw new HttpError(422, 'plan_outside_limits', `step ${i + 1}: ${first}`, fields);
        }
      }
      if (plan.steps.length === 0) {
        const why = plan.skipped.map((s) => `${s.part}: ${s.reason}`).join('; ');
        throw new HttpError(422, 'nothing_to_test', `no part can run on ${bench.name}: ${why}`);
      }

      const workshop = await thresholds();
      let id: number;
      try {
        id = await insertQuickTest(db, {
          bench_id: bench.id,
          valve_type: type.data.designation,
          valve_id: valve?.id ?? null,
          valve_label: input.valveLabel || valve?.label || null,
          parts_json: JSON.stringify(parts),
          plan_json: JSON.stringify(plan),
          thresholds_json: JSON.stringify(workshop),
          operator_id: user.id,
          status: 'pending',
          grade: null,
          grade_percent: null,
          grade_json: null,
          end_message: null,
          created_at: new Date().toISOString(),
          started_at: null,
          ended_at: null,
        });
      } catch (error) {
        // The partial unique index: another request started a quick test here meanwhile.
        if (String((error as { code?: string }).code).startsWith('SQLITE_CONSTRAINT')) {
          throw new HttpError(409, 'bench_busy', `${bench.name} is busy`);
        }
        throw error;
      }
      await audit.record(user, 'quickTest.start', `quick-test:${id}`, {
        benchId: bench.id,
        valveType: type.data.designation,
        valveId: valve?.id ?? null,
        valveLabel: input.valveLabel ?? null,
        parts,
        skipped: plan.skipped,
      });
      if (!(await runner.begin(id, plan, parts, workshop))) {
        throw new HttpError(409, 'bench_offline', `${bench.name} went away before the start`);
      }
      const started = view(await requireRecord(id));
      events.quickTestChanged(started);
      return started;
    },

    /** Asks the bench to abort; the record ends at once if the bench is unreachable. */
    async abort(id: number, user: AuthUser): Promise<QuickTestView> {
      const row = await requireRecord(id);
      if (!ACTIVE_QUICK_TEST_STATUSES.includes(row.status)) {
        throw new HttpError(
          409,
          'quick_test_not_active',
          `quick test ${id} has already ended (${row.status})`,
        );
      }
      await audit.record(user, 'quickTest.abort', `quick-test:${id}`, { benchId: row.bench_id });
      await runner.abort(id);
      return view(await requireRecord(id));
    },

    /** One quick test; 404 if unknown. */
    async get(id: number): Promise<QuickTestView> {
      return view(await requireRecord(id));
    },

    /** A page of quick tests, newest first by default. */
    async list(q: z.output<typeof quickTestListQuery>) {
      const { rows, total } = await listQuickTests(db, {
        valveId: q.valveId,
        benchId: q.benchId,
        status: q.status,
        grade: q.grade,
        valveType: q.valveType
          ? (findValveType(q.valveType)?.designation ?? q.valveType)
          : undefined,
        descending: q.order === 'desc',
        limit: q.pageSize,
        offset: (q.page - 1) * q.pageSize,
      });
      return { items: rows.map(view), total, page: q.page, pageSize: q.pageSize };
    },
  };
}
