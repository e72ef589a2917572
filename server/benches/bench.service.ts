import type { z } from 'zod';
import type { PlanLimits } from '../../shared/domain/plan-check';
import type { DeviceCapabilities } from '../../shared/domain/sweep';
import type { BenchLimits, BenchView } from '../../shared/hub/messages';
import type { AuditService } from '../audit/audit.service';
import type { AuthUser } from '../auth/auth-user';
import type { BenchRow, HubDb } from '../db/database';
import { HttpError, notFound } from '../http/http-error';
import type { BenchPresence } from '../live/bench-presence';
import type { HubEvents } from '../live/hub-events';
import type { createBenchBody, patchBenchBody } from './bench.schemas';
import { matchBenchToken, newBenchToken, hashBenchToken } from './bench-token';
import {
  findBenchRow,
  findBenchRowByName,
  insertBench,
  listBenchRows,
  listBenchTokenHashes,
  updateBench,
} from './bench.repository';

/** Limits of a new bench where the admin gives none: V, V, mA, W. */
export const DEFAULT_BENCH_LIMITS: BenchLimits = {
  vaMaxVolts: 500,
  vg2MaxVolts: 450,
  iaMaxMilliamps: 250,
  paMaxWatts: 50,
};

/** Props of the bench service. */
export interface BenchServiceProps {
  db: HubDb;
  presence: BenchPresence;
  audit: AuditService;
  events: HubEvents;
}

/** Benches: records, limits, tokens and live state. */
export type BenchService = ReturnType<typeof createBenchService>;

/** A bench row's admin limits. */
export function benchLimits(row: BenchRow): BenchLimits {
  return {
    vaMaxVolts: row.va_max_volts,
    vg2MaxVolts: row.vg2_max_volts,
    iaMaxMilliamps: row.ia_max_milliamps,
    paMaxWatts: row.pa_max_watts,
  };
}

/** A bench's admin limits as plan limits (grid and heater are left to device and type). */
export function planLimitsOfBench(row: BenchRow): PlanLimits {
  return {
    ...benchLimits(row),
    vg1MinVolts: Number.NEGATIVE_INFINITY,
    vg1MaxVolts: Number.POSITIVE_INFINITY,
    heaterMaxVolts: Number.POSITIVE_INFINITY,
  };
}

/** Builds the bench service. */
export function createBenchService({ db, presence, audit, events }: BenchServiceProps) {
  function toView(row: BenchRow): BenchView {
    const stored = row.capabilities_json
      ? (JSON.parse(row.capabilities_json) as DeviceCapabilities)
      : null;
    return {
      id: row.id,
      name: row.name,
      bridgeOnline: presence.isOnline(row.id),
      capabilities: presence.capabilities(row.id) ?? stored,
      status: presence.status(row.id),
      extensions: presence.extensions(row.id),
      limits: benchLimits(row),
      lastSeenAt: row.last_seen_at,
    };
  }

  async function requireRow(id: number): Promise<BenchRow> {
    const row = await findBenchRow(db, id);
    if (!row) throw notFound('bench', id);
    return row;
  }

  async function assertNameFree(name: string, exceptId?: number): Promise<void> {
    const other = await findBenchRowByName(db, name);
    if (other && other.id !== exceptId) {
      throw new HttpError(409, 'bench_name_taken', `a bench named "${name}" exists already`);
    }
  }

  return {
    toView,
    requireRow,

    /** Every bench with its live state. */
    async list(): Promise<BenchView[]> {
      return (await listBenchRows(db)).map(toView);
    },

    /** One bench with its live state; 404 if unknown. */
    async get(id: number): Promise<BenchView> {
      return toView(await requireRow(id));
    },

    /** Creates a bench with a fresh token, shown only in this answer. */
    async create(input: z.output<typeof createBenchBody>, user: AuthUser) {
      await assertNameFree(input.name);
      const limits = { ...DEFAULT_BENCH_LIMITS, ...input.limits };
      const token = newBenchToken();
      const id = await insertBench(db, {
        name: input.name,
        token_hash: hashBenchToken(token),
        va_max_volts: limits.vaMaxVolts,
        vg2_max_volts: limits.vg2MaxVolts,
        ia_max_milliamps: limits.iaMaxMilliamps,
        pa_max_watts: limits.paMaxWatts,
        capabilities_json: null,
        last_seen_at: null,
        created_at: new Date().toISOString(),
      });
      await audit.record(user, 'bench.create', `bench:${id}`, { name: input.name, limits });
      events.benchesChanged();
      return { bench: toView(await requireRow(id)), token };
    },

    /** Renames a bench or changes its limits. */
    async update(id: number, input: z.output<typeof patchBenchBody>, user: AuthUser) {
      const before = await requireRow(id);
      if (input.name !== undefined) await assertNameFree(input.name, id);
      const limits = { ...benchLimits(before), ...input.limits };
      await updateBench(db, id, {
        name: input.name ?? before.name,
        va_max_volts: limits.vaMaxVolts,
        vg2_max_volts: limits.vg2MaxVolts,
        ia_max_milliamps: limits.iaMaxMilliamps,
        pa_max_watts: limits.paMaxWatts,
      });
      await audit.record(user, 'bench.update', `bench:${id}`, {
        before: { name: before.name, limits: benchLimits(before) },
        after: { name: input.name ?? before.name, limits },
      });
      events.benchesChanged();
      return toView(await requireRow(id));
    },

    /** The bench whose token this is, or undefined. */
    async findByToken(token: string): Promise<BenchRow | undefined> {
      const rows = await listBenchTokenHashes(db);
      const i = matchBenchToken(
        token,
        rows.map((r) => r.token_hash),
      );
      return i < 0 ? undefined : findBenchRow(db, rows[i].id);
    },

    /** Stores the capabilities a bridge announced and when it was heard from. */
    async recordCapabilities(id: number, capabilities: DeviceCapabilities | null): Promise<void> {
      await updateBench(db, id, {
        last_seen_at: new Date().toISOString(),
        ...(capabilities ? { capabilities_json: JSON.stringify(capabilities) } : {}),
      });
    },

    /** Records that the bench's bridge was heard from now. */
    async recordSeen(id: number): Promise<void> {
      await updateBench(db, id, { last_seen_at: new Date().toISOString() });
    },
  };
}
