import type { z } from 'zod';
import { sectionOf, type SweepPlan } from '../../shared/domain/sweep';
import type { AuditService } from '../audit/audit.service';
import type { AuthUser } from '../auth/auth-user';
import type { HubDb } from '../db/database';
import { HttpError, notFound } from '../http/http-error';
import { listQuickTests } from '../quick-tests/quick-test.repository';
import { toQuickTestSummary } from '../quick-tests/quick-test-view';
import { allocateLabel, readSettings } from '../settings/settings.service';
import { toSweepView } from '../sweeps/sweep-view';
import { listSweepsOfValve, relabelSweepsOfValve } from '../sweeps/sweep.repository';
import { findValveTypeView } from '../valve-types/valve-type.service';
import type { ValveTypeView } from '../valve-types/valve-type-view';
import { refreshSweepFigures } from './refresh-sweep-figures';
import { importValveRows } from './valve-import';
import { parseValveCsv, valvesCsv } from './valve-csv';
import { valveLabelSvg } from './valve-label';
import {
  deleteValve,
  findValve,
  insertValve,
  labelTaken,
  listAllValves,
  listValves,
  updateValve,
  type ValveFilterSort,
  type ValveRecord,
} from './valve.repository';
import type { createValveBody, patchValveBody, valveListQuery } from './valve.schemas';
import { toFiguresView, toValveView, type ValveView } from './valve-view';

/** Props of the valve-record service. */
export interface ValveServiceProps {
  db: HubDb;
  audit: AuditService;
  /** Stored files of a valve's photos, and how to delete them (after the rows are gone). */
  photoFiles: {
    ofValve(valveId: number): Promise<string[]>;
    remove(names: string[]): Promise<void>;
  };
}

/** Valve records: one per physical valve, with their sweeps and figures. */
export type ValveService = ReturnType<typeof createValveService>;

const SORT_COLUMNS: Record<z.output<typeof valveListQuery>['sort'], ValveFilterSort> = {
  label: 'label',
  type: 'type_designation',
  status: 'status',
  location: 'location',
  updatedAt: 'updated_at',
  grade: 'grade_percent',
};

type ValveFields = z.output<typeof createValveBody>;

/** Optional text as stored: blank is null. */
function blankToNull(s: string | null | undefined): string | null | undefined {
  return s === undefined ? undefined : s === null || s.trim() === '' ? null : s.trim();
}

/** The record fields of a body, as columns (undefined: not given). */
export function valveColumns(b: Partial<ValveFields>) {
  return {
    maker: blankToNull(b.maker),
    date_code: blankToNull(b.dateCode),
    origin_kind: b.originKind,
    origin_text: blankToNull(b.originText),
    location: blankToNull(b.location),
    status: b.status,
    notes: blankToNull(b.notes),
  };
}

/** Builds the valve-record service. */
export function createValveService({ db, audit, photoFiles }: ValveServiceProps) {
  async function requireRecord(id: number): Promise<ValveRecord> {
    const row = await findValve(db, (await readSettings(db)).gradeThresholds, id);
    if (!row) throw notFound('valve', id);
    return row;
  }

  async function requireType(name: string): Promise<ValveTypeView> {
    const type = await findValveTypeView(db, name);
    if (!type) {
      throw new HttpError(400, 'validation_failed', `unknown valve type ${name}`, {
        type: `unknown valve type ${name}`,
      });
    }
    return type;
  }

  function labelConflict(label: string): HttpError {
    return new HttpError(409, 'label_taken', `label ${label} is already in use`, {
      label: 'already in use',
    });
  }

  return {
    /** A page of valves. */
    async list(q: z.output<typeof valveListQuery>) {
      const settings = await readSettings(db);
      let typeId: number | undefined;
      if (q.type) {
        const type = await findValveTypeView(db, q.type);
        if (!type) return { items: [], total: 0, page: q.page, pageSize: q.pageSize };
        typeId = type.id;
      }
      const { rows, total } = await listValves(db, settings.gradeThresholds, {
        typeId,
        status: q.status,
        grade: q.grade,
        location: q.location || undefined,
        search: q.q || undefined,
        sortColumn: SORT_COLUMNS[q.sort],
        descending: q.order === 'desc',
        limit: q.pageSize,
        offset: (q.page - 1) * q.pageSize,
      });
      return { items: rows.map(toValveView), total, page: q.page, pageSize: q.pageSize };
    },

    /**
     * A valve with its sweeps (newest first) and the trend of its figures at the type's
     * reference point (oldest first). Figures not yet computed, or computed from fewer points
     * or another reference point, are brought up to date here.
     */
    async detail(id: number) {
      const row = await requireRecord(id);
      const type = await findValveTypeView(db, row.type_designation);
      const sweeps = await listSweepsOfValve(db, id);
      const trend = [];
      for (const s of [...sweeps].reverse()) {
        const figures = await refreshSweepFigures(db, s.id);
        // The trend follows section 1, as the grade does; section 2 is in the sweeps list.
        const section = sectionOf(JSON.parse(s.plan_json) as SweepPlan);
        if (figures && section === 1) trend.push(toFiguresView(figures, s.created_at));
      }
      // Refreshing may have changed the grade.
      const fresh = await requireRecord(id);
      const reference = type!.operatingPoints[0];
      return {
        ...toValveView(fresh),
        referencePoint: {
          vaVolts: reference.vaVolts,
          vg2Volts: reference.vg2Volts,
          vg1Volts: reference.vg1Volts,
          iaMilliamps: reference.iaMilliamps,
          gmMicrosiemens: reference.gmMicrosiemens,
        },
        sweeps: sweeps.map(toSweepView),
        trend,
        quickTests: (
          await listQuickTests(db, { valveId: id, descending: true, limit: 200, offset: 0 })
        ).rows.map(toQuickTestSummary),
      };
    },

    /** Adds a valve; the label is generated from the workshop's scheme when not given. */
    async create(body: ValveFields, user: AuthUser): Promise<ValveView> {
      const type = await requireType(body.type);
      const id = await db.transaction().execute(async (trx) => {
        if (body.label && (await labelTaken(trx, body.label))) throw labelConflict(body.label);
        const label = body.label ?? (await allocateLabel(trx, (l) => labelTaken(trx, l)));
        const now = new Date().toISOString();
        const columns = valveColumns(body);
        return insertValve(trx, {
          label,
          valve_type_id: type.id,
          maker: columns.maker ?? null,
          date_code: columns.date_code ?? null,
          origin_kind: columns.origin_kind ?? null,
          origin_text: columns.origin_text ?? null,
          location: columns.location ?? null,
          status: columns.status ?? 'in-stock',
          notes: columns.notes ?? null,
          created_by: user.id,
          updated_by: user.id,
          created_at: now,
          updated_at: now,
        });
      });
      const view = toValveView(await requireRecord(id));
      await audit.record(user, 'valve.create', `valve:${id}`, { valve: view });
      return view;
    },

    /** Changes a valve; the type only while no sweep is on the record. */
    async update(
      id: number,
      body: z.output<typeof patchValveBody>,
      user: AuthUser,
    ): Promise<ValveView> {
      const before = await requireRecord(id);
      const type = body.type === undefined ? undefined : await requireType(body.type);
      if (type && type.id !== before.valve_type_id && Number(before.sweep_count) > 0) {
        throw new HttpError(
          409,
          'valve_has_sweeps',
          `valve ${before.label} has sweeps as a ${before.type_designation}; move them first`,
          { type: 'the record has sweeps of its present type' },
        );
      }
      if (body.label && (await labelTaken(db, body.label, id))) throw labelConflict(body.label);
      const columns = Object.fromEntries(
        Object.entries(valveColumns(body)).filter(([, v]) => v !== undefined),
      );
      await db.transaction().execute(async (trx) => {
        await updateValve(trx, id, {
          ...columns,
          ...(body.label ? { label: body.label } : {}),
          ...(type ? { valve_type_id: type.id } : {}),
          updated_by: user.id,
          updated_at: new Date().toISOString(),
        });
        if (body.label) await relabelSweepsOfValve(trx, id, body.label);
      });
      const after = toValveView(await requireRecord(id));
      const beforeView = toValveView(before);
      const changes: Record<string, { from: unknown; to: unknown }> = {};
      for (const key of [
        'label',
        'type',
        'maker',
        'dateCode',
        'originKind',
        'originText',
        'location',
        'status',
        'notes',
      ] as const) {
        if (beforeView[key] !== after[key])
          changes[key] = { from: beforeView[key], to: after[key] };
      }
      await audit.record(user, 'valve.update', `valve:${id}`, { label: after.label, changes });
      return after;
    },

    /**
     * Deletes a valve and its photos; its sweeps stay, taken off the record. A member of a
     * match set is refused (409, naming the sets): the set's report stands on it.
     */
    async remove(id: number, user: AuthUser): Promise<void> {
      const before = toValveView(await requireRecord(id));
      const sets = await db
        .selectFrom('match_set_members as m')
        .innerJoin('match_sets as s', 's.id', 'm.match_set_id')
        .select(['s.code', 's.status'])
        .where('m.valve_id', '=', id)
        .orderBy('s.id')
        .execute();
      if (sets.length) {
        const list = sets.map((x) => `${x.code} (${x.status})`).join(', ');
        throw new HttpError(
          409,
          'valve_in_match_set',
          `${before.label} is a member of match set ${list}; its report stands on this record`,
        );
      }
      const files = await photoFiles.ofValve(id);
      await deleteValve(db, id);
      await photoFiles.remove(files);
      await audit.record(user, 'valve.delete', `valve:${id}`, { valve: before });
    },

    /** Every valve as CSV. */
    async exportCsv(): Promise<string> {
      const settings = await readSettings(db);
      return valvesCsv(await listAllValves(db, settings.gradeThresholds));
    },

    /**
     * Imports valves from CSV. Rows that cannot be taken are reported with their line and
     * reason and do not stop the others; the good rows go in as one transaction.
     */
    async importCsv(text: string, user: AuthUser) {
      const file = parseValveCsv(text);
      if (!file.ok) {
        throw new HttpError(400, 'bad_csv', `line ${file.line}: ${file.reason}`, {
          file: `line ${file.line}: ${file.reason}`,
        });
      }
      const report = await importValveRows(db, file.rows, user);
      await audit.record(user, 'valve.import', 'valves', {
        imported: report.imported,
        rejected: report.rejected.length,
        labels: report.labels,
      });
      return { ...report, ignoredColumns: file.ignoredColumns };
    },

    /** The printable label of a valve; `origin` is the app's address (no trailing slash). */
    async labelSvg(id: number, origin: string): Promise<string> {
      const record = await requireRecord(id);
      return valveLabelSvg({
        label: record.label,
        type: record.type_designation,
        maker: record.maker,
        dateCode: record.date_code,
        url: `${origin}/valves/${id}`,
      });
    },
  };
}
