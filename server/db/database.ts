import SqliteDatabase from 'better-sqlite3';
import { Kysely, SqliteDialect, type Generated, type Insertable, type Selectable } from 'kysely';
import type { SweepStatus } from '../../shared/domain/sweep';
import type { Role } from '../auth/role';
import type { OutboxReceivedTable } from '../mail/outbox-received.table';
import type {
  MatchRunTable,
  MatchSetMailingTable,
  MatchSetMemberTable,
  MatchSetShareTable,
  MatchSetTable,
} from '../matching/match-set.table';
import type { QuickTestTable } from '../quick-tests/quick-test.table';
import type { WorkshopSettingTable } from '../settings/workshop-setting.table';
import type { AttachmentTable } from '../uploads/attachment.table';
import type {
  NominalCurveSetTable,
  NominalPointTable,
  TypeOperatingPointTable,
  TypeRatingsTable,
  ValveTypeTable,
} from '../valve-types/valve-type.table';
import type { SweepFiguresTable, ValveTable } from '../valves/valve.table';

/** Row of `users`. */
export interface UserTable {
  id: Generated<number>;
  username: string;
  display_name: string;
  password_hash: string;
  role: Role;
  created_at: string;
}

/** Row of `benches`; the four limits are set by an admin (V, V, mA, W). */
export interface BenchTable {
  id: Generated<number>;
  name: string;
  token_hash: string;
  va_max_volts: number;
  vg2_max_volts: number;
  ia_max_milliamps: number;
  pa_max_watts: number;
  capabilities_json: string | null;
  last_seen_at: string | null;
  created_at: string;
}

/** Row of `sweeps`. */
export interface SweepTable {
  id: Generated<number>;
  bench_id: number;
  valve_type: string | null;
  valve_label: string | null;
  plan_json: string;
  operator_id: number;
  status: SweepStatus;
  /** Finer cause than status: a SweepEndReason, or 'refused' when the bench refused the plan. */
  end_reason: string | null;
  end_message: string | null;
  /** 1 when an admin let the plan past the valve type's maximum ratings. */
  override: Generated<number>;
  override_by: number | null;
  /** Points the device said it sent, from the end message; null until then. */
  reported_count: number | null;
  point_count: Generated<number>;
  created_at: string;
  started_at: string | null;
  ended_at: string | null;
  /** Valve record the sweep belongs to, or null. */
  valve_id: number | null;
}

/** Row of `sweep_points`: V, V, V, mA, mA. */
export interface SweepPointTable {
  sweep_id: number;
  seq: number;
  curve: number;
  va_volts: number;
  vg1_volts: number;
  vg2_volts: number;
  ia_milliamps: number;
  ig2_milliamps: number;
}

/** Row of `audit_log`. */
export interface AuditLogTable {
  id: Generated<number>;
  user_id: number | null;
  username: string | null;
  action: string;
  subject: string | null;
  detail_json: string | null;
  at: string;
}

/** The hub's database as Kysely sees it. */
export interface Database {
  users: UserTable;
  benches: BenchTable;
  sweeps: SweepTable;
  sweep_points: SweepPointTable;
  audit_log: AuditLogTable;
  quick_tests: QuickTestTable;
  valve_types: ValveTypeTable;
  type_operating_points: TypeOperatingPointTable;
  type_ratings: TypeRatingsTable;
  nominal_curve_sets: NominalCurveSetTable;
  nominal_points: NominalPointTable;
  valves: ValveTable;
  sweep_figures: SweepFiguresTable;
  attachments: AttachmentTable;
  workshop_settings: WorkshopSettingTable;
  match_runs: MatchRunTable;
  match_sets: MatchSetTable;
  match_set_members: MatchSetMemberTable;
  match_set_mailings: MatchSetMailingTable;
  match_set_shares: MatchSetShareTable;
  outbox_received: OutboxReceivedTable;
}

export type UserRow = Selectable<UserTable>;
export type NewUserRow = Insertable<UserTable>;
export type BenchRow = Selectable<BenchTable>;
export type NewBenchRow = Insertable<BenchTable>;
export type SweepRow = Selectable<SweepTable>;
export type NewSweepRow = Insertable<SweepTable>;
export type SweepPointRow = Selectable<SweepPointTable>;
export type AuditLogRow = Selectable<AuditLogTable>;
export type NewAuditLogRow = Insertable<AuditLogTable>;

/** The typed query builder the repositories take as their first argument. */
export type HubDb = Kysely<Database>;

/**
 * Opens (creating if needed) the SQLite file.
 *
 * Durability: synchronous = FULL. An `ack-points` tells the bridge it may delete its journal
 * copy, so after the ack the hub's file is the only copy of those points. With WAL and
 * synchronous = NORMAL a commit survives a crash of this process but not a power cut or kernel
 * panic (the WAL is not fsynced at each commit). With FULL every commit, and so every
 * acknowledged point, survives a power cut too. The cost is one fsync per transaction; points
 * arrive in batches and each batch is one transaction, so it stays small.
 */
export function openDatabase(file: string): HubDb {
  const sqlite = new SqliteDatabase(file);
  sqlite.pragma('journal_mode = WAL');
  sqlite.pragma('synchronous = FULL');
  sqlite.pragma('foreign_keys = ON');
  sqlite.pragma('busy_timeout = 5000');
  return new Kysely<Database>({ dialect: new SqliteDialect({ database: sqlite }) });
}
