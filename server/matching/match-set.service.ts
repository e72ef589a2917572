import type { z } from 'zod';
import type { SweepPlan, SweepPoint } from '../../shared/domain/sweep';
import type { AuditService } from '../audit/audit.service';
import type { AuthUser } from '../auth/auth-user';
import type { HubDb } from '../db/database';
import { HttpError, notFound } from '../http/http-error';
import type { Mailer } from '../mail/mailer';
import { readSettings } from '../settings/settings.service';
import { listPoints } from '../sweeps/sweep.repository';
import { findValve } from '../valves/valve.repository';
import { findMatchRun } from './match-run.repository';
import {
  findMatchSet,
  insertMailing,
  insertMatchSet,
  listMailings,
  listMatchSets,
  listMembers,
  listShares,
  setMatchSetStatus,
} from './match-set.repository';
import type {
  createMatchSetBody,
  MatchSetDetail,
  matchSetListQuery,
  sendReportBody,
} from './match-set.schemas';
import { setFigures } from './match-set-figures';
import { loadPool } from './matching-pool';
import { matchCriteriaSchema, type MatchCriteriaInput } from './matching.schemas';
import { REPORT_NOTES, type MatchReport } from '../reports/match-report';

/** A set's code: our own scheme, MS and the id in four digits. */
export function matchSetCode(id: number): string {
  return `MS-${String(id).padStart(4, '0')}`;
}

/** Statuses that keep a valve out of a new set. */
const UNAVAILABLE = new Set(['reserved', 'sold']);

/** What the match set service needs. */
export interface MatchSetServiceProps {
  db: HubDb;
  audit: AuditService;
  mailer: Mailer;
  workshopName: string;
  /** Renders a report as a PDF. */
  renderPdf: (report: MatchReport) => Promise<Buffer>;
}

/** Match sets: reserve, release, report, mail and buyer links. */
export type MatchSetService = ReturnType<typeof createMatchSetService>;

/** Builds the match set service. */
export function createMatchSetService(props: MatchSetServiceProps) {
  const { db, audit, mailer, workshopName, renderPdf } = props;

  async function detail(id: number): Promise<MatchSetDetail> {
    const set = await findMatchSet(db, id);
    if (!set) throw notFound('match_set', id);
    const { gradeThresholds } = await readSettings(db);
    const figures = JSON.parse(set.figures_json);
    const readings = new Map<number, MatchSetDetail['members'][number]['readings']>(
      (figures.members as { valveId: number; readings: never[] }[]).map((m) => [
        m.valveId,
        m.readings,
      ]),
    );
    const members: MatchSetDetail['members'] = [];
    for (const m of await listMembers(db, [id])) {
      const valve = await findValve(db, gradeThresholds, m.valve_id);
      const plan = m.plan_json ? (JSON.parse(m.plan_json) as SweepPlan) : null;
      members.push({
        valveId: m.valve_id,
        label: m.label,
        valveType: m.type_designation,
        status: m.status,
        grade: valve?.grade ?? null,
        gradePercent: valve?.grade_percent ?? null,
        readings: readings.get(m.valve_id) ?? [],
        sweepId: m.sweep_id,
        sweptAt: m.swept_at,
        bench: m.bench_name,
        conditions: plan && {
          vaStartVolts: plan.vaStartVolts,
          vaStopVolts: plan.vaStopVolts,
          vaStepVolts: plan.vaStepVolts,
          vg1Volts: plan.vg1Volts,
          vg2Volts: plan.vg2Volts,
          heaterVolts: plan.heaterVolts,
        },
      });
    }
    const { members: _, ...groupFigures } = figures;
    return {
      id: set.id,
      code: set.code ?? matchSetCode(set.id),
      valveType: set.valve_type,
      status: set.status,
      memberCount: members.length,
      labels: members.map((m) => m.label),
      createdBy: set.created_by_name,
      createdAt: set.created_at,
      criteria: JSON.parse(set.criteria_json),
      runId: set.run_id,
      figures: groupFigures,
      members,
      mailings: (await listMailings(db, id)).map((ml) => ({
        to: ml.to_address,
        at: ml.sent_at,
        by: ml.sent_by_name,
        messageId: ml.message_id,
      })),
      shares: (await listShares(db, id)).map((s) => ({
        id: s.id,
        expiresAt: s.expires_at,
        revokedAt: s.revoked_at,
      })),
    };
  }

  /** The report of a set: its detail with every member's measured family. */
  async function report(id: number): Promise<MatchReport> {
    const set = await detail(id);
    const families = new Map<number, SweepPoint[]>();
    for (const m of set.members) {
      if (m.sweepId !== null) families.set(m.valveId, await listPoints(db, m.sweepId));
    }
    return { workshop: workshopName, set, families, notes: REPORT_NOTES };
  }

  async function requireSet(id: number) {
    const set = await findMatchSet(db, id);
    if (!set) throw notFound('match_set', id);
    return set;
  }

  /** Ends a reservation: the set becomes released or sold, its reserved valves follow. */
  async function closeSet(id: number, user: AuthUser, outcome: 'released' | 'sold') {
    const set = await requireSet(id);
    if (set.status !== 'reserved') {
      throw new HttpError(409, 'not_reserved', `set ${set.code} is ${set.status}, not reserved`);
    }
    const valveStatus = outcome === 'sold' ? 'sold' : 'in-stock';
    const members = (await listMembers(db, [id])).filter((m) => m.status === 'reserved');
    const now = new Date().toISOString();
    await db.transaction().execute(async (trx) => {
      await setMatchSetStatus(trx, id, outcome, now);
      await trx
        .updateTable('valves')
        .set({ status: valveStatus, updated_by: user.id, updated_at: now })
        .where('id', 'in', members.length ? members.map((m) => m.valve_id) : [-1])
        .where('status', '=', 'reserved')
        .execute();
    });
    const verb = outcome === 'sold' ? 'sell' : 'release';
    await audit.record(user, `match-set.${verb}`, `match-set:${id}`, { code: set.code });
    for (const m of members) {
      await audit.record(user, `valve.${verb}`, `valve:${m.valve_id}`, {
        matchSet: set.code,
        from: 'reserved',
        to: valveStatus,
      });
    }
    return detail(id);
  }

  return {
    detail,
    report,

    /** Reserves a group as a new set; 409 if a member is already reserved or sold. */
    async create(body: z.output<typeof createMatchSetBody>, user: AuthUser) {
      let valveIds: number[];
      let criteria: MatchCriteriaInput;
      let runId: number | null = null;
      if ('runId' in body) {
        const run = await findMatchRun(db, body.runId);
        if (!run) throw notFound('match_run', body.runId);
        const groups = JSON.parse(run.result_json).groups as { members: { valveId: number }[] }[];
        const group = groups[body.groupIndex];
        if (!group) {
          throw new HttpError(
            404,
            'group_not_found',
            `run ${run.id} has no group ${body.groupIndex}`,
          );
        }
        valveIds = group.members.map((m) => m.valveId);
        criteria = matchCriteriaSchema.parse(
          Object.fromEntries(
            Object.entries(JSON.parse(run.criteria_json)).filter(
              ([k]) => k in matchCriteriaSchema.shape,
            ),
          ),
        );
        runId = run.id;
      } else {
        valveIds = body.valveIds;
        criteria = matchCriteriaSchema.parse({ ...body.criteria, valveType: body.valveType });
      }
      if (new Set(valveIds).size !== valveIds.length) {
        throw new HttpError(400, 'duplicate_valve', 'a valve appears twice in the set');
      }
      const pool = await loadPool(db, { valveType: criteria.valveType, statuses: [], valveIds });
      const byId = new Map(pool.map((p) => [p.row.valve_id, p]));
      for (const id of valveIds) {
        if (!byId.has(id)) {
          throw new HttpError(
            409,
            'no_sweep',
            `valve ${id} is not a ${criteria.valveType} with a complete anode-family sweep`,
          );
        }
      }
      const taken = pool.filter((p) => UNAVAILABLE.has(p.row.status));
      if (taken.length) {
        throw new HttpError(
          409,
          'valve_unavailable',
          `${taken.map((p) => `${p.row.label} is ${p.row.status}`).join(', ')}`,
          Object.fromEntries(taken.map((p) => [`valve.${p.row.valve_id}`, p.row.status])),
        );
      }
      const ordered = valveIds.map((id) => byId.get(id)!);
      const figures = setFigures(ordered, criteria);
      const now = new Date().toISOString();
      const id = await db.transaction().execute(async (trx) => {
        // Checked again inside the write: two reservations of one valve cannot both pass.
        const current = await trx
          .selectFrom('valves')
          .select(['id', 'label', 'status'])
          .where('id', 'in', valveIds)
          .execute();
        const clash = current.filter((v) => UNAVAILABLE.has(v.status));
        if (clash.length) {
          throw new HttpError(
            409,
            'valve_unavailable',
            clash.map((v) => `${v.label} is ${v.status}`).join(', '),
          );
        }
        const setId = await insertMatchSet(
          trx,
          {
            valve_type: criteria.valveType,
            criteria_json: JSON.stringify(criteria),
            figures_json: JSON.stringify(figures),
            run_id: runId,
            status: 'reserved',
            created_by: user.id,
            created_at: now,
            updated_at: now,
          },
          ordered.map((p) => ({ valveId: p.row.valve_id, sweepId: p.row.sweep_id })),
          matchSetCode,
        );
        await trx
          .updateTable('valves')
          .set({ status: 'reserved', updated_by: user.id, updated_at: now })
          .where('id', 'in', valveIds)
          .execute();
        return setId;
      });
      const code = matchSetCode(id);
      await audit.record(user, 'match-set.create', `match-set:${id}`, { code, valveIds, runId });
      for (const p of ordered) {
        await audit.record(user, 'valve.reserve', `valve:${p.row.valve_id}`, {
          matchSet: code,
          from: p.row.status,
          to: 'reserved',
        });
      }
      return detail(id);
    },

    /** A page of sets, newest first. */
    async list(q: z.output<typeof matchSetListQuery>) {
      const { rows, total } = await listMatchSets(db, {
        status: q.status,
        limit: q.pageSize,
        offset: (q.page - 1) * q.pageSize,
      });
      const members = await listMembers(
        db,
        rows.map((r) => r.id),
      );
      return {
        items: rows.map((r) => {
          const labels = members.filter((m) => m.match_set_id === r.id).map((m) => m.label);
          return {
            id: r.id,
            code: r.code ?? matchSetCode(r.id),
            valveType: r.valve_type,
            status: r.status,
            memberCount: labels.length,
            labels,
            createdBy: r.created_by_name,
            createdAt: r.created_at,
          };
        }),
        total,
        page: q.page,
        pageSize: q.pageSize,
      };
    },

    /** Gives a reserved set's valves back to stock. */
    release: (id: number, user: AuthUser) => closeSet(id, user, 'released'),

    /** Marks a reserved set and its valves sold. */
    sell: (id: number, user: AuthUser) => closeSet(id, user, 'sold'),

    /** The report as a PDF, with its file name. */
    async reportPdf(id: number): Promise<{ fileName: string; pdf: Buffer }> {
      const r = await report(id);
      return { fileName: `match-report-${r.set.code}.pdf`, pdf: await renderPdf(r) };
    },

    /** Mails the report PDF and records the mailing. */
    async sendReport(id: number, body: z.output<typeof sendReportBody>, user: AuthUser) {
      const r = await report(id);
      const pdf = await renderPdf(r);
      const text = [
        body.message ?? `Please find attached the match report for set ${r.set.code}.`,
        '',
        `${r.set.members.length} x ${r.set.valveType}: ${r.set.labels.join(', ')}`,
        '',
        workshopName,
      ].join('\n');
      const { messageId } = await mailer.send({
        to: body.to,
        subject: `Match report ${r.set.code} (${r.set.valveType})`,
        text,
        attachments: [
          {
            filename: `match-report-${r.set.code}.pdf`,
            content: pdf,
            contentType: 'application/pdf',
          },
        ],
      });
      const at = new Date().toISOString();
      await insertMailing(db, {
        match_set_id: id,
        to_address: body.to,
        message_id: messageId,
        sent_by: user.id,
        sent_at: at,
      });
      await audit.record(user, 'match-set.send-report', `match-set:${id}`, {
        to: body.to,
        messageId,
      });
      return { to: body.to, at, messageId };
    },
  };
}
