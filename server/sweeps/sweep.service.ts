import type { z } from 'zod';
import { limitsFromDevice } from '../../shared/domain/plan-check';
import { sectionOf, type SweepPoint } from '../../shared/domain/sweep';
import type { SweepView } from '../../shared/hub/messages';
import type { AuditService } from '../audit/audit.service';
import type { AuthUser } from '../auth/auth-user';
import { roleAtLeast } from '../auth/role';
import { planLimitsOfBench, type BenchService } from '../benches/bench.service';
import type { HubDb } from '../db/database';
import { HttpError, notFound } from '../http/http-error';
import type { BenchPresence } from '../live/bench-presence';
import type { HubEvents } from '../live/hub-events';
import { planProblems, type LimitSource } from './sweep-limits';
import type { SweepRecorder } from './sweep-recorder';
import { findValveTypeView } from '../valve-types/valve-type.service';
import { findTypeRecordById } from '../valve-types/valve-type.repository';
import { limitsOfType, toValveTypeView, type ValveTypeView } from '../valve-types/valve-type-view';
import { refreshSweepFigures } from '../valves/refresh-sweep-figures';
import { findActiveQuickTestOfBench } from '../quick-tests/quick-test.repository';
import { findValveRow } from '../valves/valve.repository';
import { toSweepView } from './sweep-view';
import type { attachSweepBody, startSweepBody, sweepListQuery } from './sweep.schemas';
import {
  ACTIVE_STATUSES,
  findActiveSweepOfBench,
  findSweep,
  insertSweep,
  listPoints,
  listSweeps,
  updateSweep,
  type SweepRecord,
} from './sweep.repository';

/** Props of the sweep service. */
export interface SweepServiceProps {
  db: HubDb;
  presence: BenchPresence;
  benches: BenchService;
  recorder: SweepRecorder;
  audit: AuditService;
  events: HubEvents;
}

/** Starting, aborting, listing and reading sweeps. */
export type SweepService = ReturnType<typeof createSweepService>;

const SORT_COLUMNS = {
  createdAt: 'created_at',
  status: 'status',
  valveType: 'valve_type',
  pointCount: 'point_count',
} as const;

/** Builds the sweep service. */
export function createSweepService(props: SweepServiceProps) {
  const { db, presence, benches, recorder, audit, events } = props;

  async function requireSweep(id: number): Promise<SweepRecord> {
    const row = await findSweep(db, id);
    if (!row) throw notFound('sweep', id);
    return row;
  }

  async function typeOfValve(typeId: number): Promise<ValveTypeView> {
    const record = await findTypeRecordById(db, typeId);
    // valves.valve_type_id is a foreign key: the type exists.
    if (!record) throw new Error(`valve type ${typeId} is missing`);
    return toValveTypeView(record);
  }

  return {
    /**
     * Checks a plan against the strictest of bench, tracer and valve-type limits and, if it
     * passes, sends it to the bench. An admin's override skips only the valve type's ratings.
     */
    async start(input: z.output<typeof startSweepBody>, user: AuthUser): Promise<SweepView> {
      const bench = await benches.requireRow(input.benchId);
      const valve = input.valveId === undefined ? undefined : await findValveRow(db, input.valveId);
      if (input.valveId !== undefined && !valve) {
        throw new HttpError(400, 'validation_failed', `no valve record ${input.valveId}`, {
          valveId: `no valve record ${input.valveId}`,
        });
      }
      // Ratings come from the type library in the database, so an admin's edit applies at once.
      const named =
        input.valveType === undefined ? undefined : await findValveTypeView(db, input.valveType);
      if (input.valveType !== undefined && !named) {
        throw new HttpError(400, 'validation_failed', `unknown valve type ${input.valveType}`, {
          valveType: `unknown valve type ${input.valveType}`,
        });
      }
      const ofValve = valve ? await typeOfValve(valve.valve_type_id) : undefined;
      if (named && ofValve && named.id !== ofValve.id) {
        throw new HttpError(
          422,
          'valve_type_mismatch',
          `valve ${valve!.label} is a ${ofValve.designation}, not a ${named.designation}`,
          { valveType: `valve ${valve!.label} is a ${ofValve.designation}` },
        );
      }
      const type = ofValve ?? named;
      if (input.override && !roleAtLeast(user.role, 'admin')) {
        throw new HttpError(403, 'override_forbidden', 'only an admin may override valve ratings');
      }
      if (!presence.isOnline(bench.id)) {
        throw new HttpError(409, 'bench_offline', `${bench.name} is not connected`);
      }
      const capabilities = presence.capabilities(bench.id);
      const status = presence.status(bench.id);
      if (!capabilities || status?.deviceOnline === false) {
        throw new HttpError(409, 'device_offline', `the tracer of ${bench.name} is not connected`);
      }

      const hard: LimitSource[] = [
        { label: `${bench.name} limits`, limits: planLimitsOfBench(bench) },
        { label: 'tracer limits', limits: limitsFromDevice(capabilities) },
      ];
      const soft: LimitSource[] = type
        ? [{ label: `${type.designation} maximum ratings`, limits: limitsOfType(type) }]
        : [];
      const fields = planProblems(input.plan, input.override ? hard : [...hard, ...soft]);
      if (sectionOf(input.plan) > (type?.sections ?? 2)) {
        fields['plan.section'] = `${type!.designation} has one section: there is no section 2`;
      }
      const overridden = input.override ? planProblems(input.plan, soft) : {};
      if (Object.keys(fields).length > 0) {
        const first = Object.values(fields)[0];
        throw new HttpError(
          422,
          'plan_outside_limits',
          `plan outside the limits: ${first}`,
          fields,
        );
      }

      if ((await findActiveSweepOfBench(db, bench.id)) || (status?.sweepId ?? null) !== null) {
        throw new HttpError(409, 'bench_busy', `${bench.name} is running a sweep`);
      }
      // A quick test runs as several checks with gaps between them: the bench stays taken.
      if (await findActiveQuickTestOfBench(db, bench.id)) {
        throw new HttpError(409, 'bench_busy', `${bench.name} is running a quick test`);
      }
      let sweepId: number;
      try {
        sweepId = await insertSweep(db, {
          bench_id: bench.id,
          valve_type: type?.designation ?? null,
          valve_label: input.valveLabel || valve?.label || null,
          valve_id: valve?.id ?? null,
          plan_json: JSON.stringify(input.plan),
          operator_id: user.id,
          status: 'pending',
          end_reason: null,
          end_message: null,
          override: input.override ? 1 : 0,
          override_by: input.override ? user.id : null,
          reported_count: null,
          created_at: new Date().toISOString(),
          started_at: null,
          ended_at: null,
        });
      } catch (error) {
        // The partial unique index: another request started a sweep on this bench meanwhile.
        if (String((error as { code?: string }).code).startsWith('SQLITE_CONSTRAINT')) {
          throw new HttpError(409, 'bench_busy', `${bench.name} is running a sweep`);
        }
        throw error;
      }
      await audit.record(user, 'sweep.start', `sweep:${sweepId}`, {
        benchId: bench.id,
        valveType: type?.designation ?? null,
        valveLabel: input.valveLabel ?? null,
        valveId: valve?.id ?? null,
        override: input.override === true,
        overriddenRatings: Object.keys(overridden).length > 0 ? overridden : null,
        plan: input.plan,
      });
      if (!presence.send(bench.id, { type: 'start-sweep', sweepId, plan: input.plan })) {
        await recorder.giveUp(
          sweepId,
          'link-lost',
          'link-lost',
          'the bench went away before the start',
        );
        throw new HttpError(409, 'bench_offline', `${bench.name} went away before the start`);
      }
      recorder.awaitStart(sweepId);
      const view = toSweepView(await requireSweep(sweepId));
      events.sweepChanged(view);
      return view;
    },

    /** Asks the bench to abort; ends the record at once if the bench is unreachable. */
    async abort(id: number, user: AuthUser): Promise<SweepView> {
      const row = await requireSweep(id);
      if (!ACTIVE_STATUSES.includes(row.status)) {
        throw new HttpError(
          409,
          'sweep_not_active',
          `sweep ${id} has already ended (${row.status})`,
        );
      }
      const sent = presence.send(row.bench_id, { type: 'abort-sweep', sweepId: id });
      await audit.record(user, 'sweep.abort', `sweep:${id}`, { benchReached: sent });
      if (sent) {
        recorder.followUpAbort(row.bench_id, id);
      } else {
        await recorder.giveUp(
          id,
          'aborted',
          'aborted',
          `aborted by ${user.username} while the bench was offline`,
        );
      }
      return toSweepView(await requireSweep(id));
    },

    /**
     * Puts an ended sweep on a valve record, moves it to another, or (valveId null) takes it
     * off; audited with from and to. The record's type must be the sweep's type.
     */
    async attach(
      id: number,
      body: z.output<typeof attachSweepBody>,
      user: AuthUser,
    ): Promise<SweepView> {
      const row = await requireSweep(id);
      if (ACTIVE_STATUSES.includes(row.status)) {
        throw new HttpError(409, 'sweep_not_ended', `sweep ${id} is still ${row.status}`);
      }
      if (row.valve_id === body.valveId) return toSweepView(row);
      const valve = body.valveId === null ? undefined : await findValveRow(db, body.valveId);
      if (body.valveId !== null && !valve) throw notFound('valve', body.valveId);
      const type = valve ? await typeOfValve(valve.valve_type_id) : undefined;
      const swept = row.valve_type ? await findValveTypeView(db, row.valve_type) : undefined;
      if (valve && type && row.valve_type && swept?.id !== type.id) {
        throw new HttpError(
          422,
          'valve_type_mismatch',
          `sweep ${id} is of a ${row.valve_type}; valve ${valve.label} is a ${type.designation}`,
          { valveId: `valve ${valve.label} is a ${type.designation}` },
        );
      }
      const from = row.valve_id === null ? null : await findValveRow(db, row.valve_id);
      await updateSweep(db, id, {
        valve_id: valve?.id ?? null,
        valve_type: row.valve_type ?? type?.designation ?? null,
        valve_label: valve?.label ?? row.valve_label,
      });
      await audit.record(user, 'sweep.attach', `sweep:${id}`, {
        from: from ? { valveId: from.id, label: from.label } : null,
        to: valve ? { valveId: valve.id, label: valve.label } : null,
      });
      if (valve) await refreshSweepFigures(db, id);
      const view = toSweepView(await requireSweep(id));
      events.sweepChanged(view);
      return view;
    },

    /** A page of sweeps. */
    async list(q: z.output<typeof sweepListQuery>) {
      const { rows, total } = await listSweeps(db, {
        status: q.status,
        benchId: q.benchId,
        valveId: q.valveId,
        search: q.q || undefined,
        sortColumn: SORT_COLUMNS[q.sort],
        descending: q.order === 'desc',
        limit: q.pageSize,
        offset: (q.page - 1) * q.pageSize,
      });
      return { items: rows.map(toSweepView), total, page: q.page, pageSize: q.pageSize };
    },

    /** One sweep; 404 if unknown. */
    async view(id: number): Promise<SweepView> {
      return toSweepView(await requireSweep(id));
    },

    /** Stored points with seq >= fromSeq, in seq order. */
    points(id: number, fromSeq = 0): Promise<SweepPoint[]> {
      return listPoints(db, id, fromSeq);
    },

    /** One sweep with every stored point. */
    async detail(id: number): Promise<SweepView & { points: SweepPoint[] }> {
      const view = toSweepView(await requireSweep(id));
      return { ...view, points: await listPoints(db, id) };
    },
  };
}
