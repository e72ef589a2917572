import type { z } from 'zod';
import type { AuditService } from '../audit/audit.service';
import type { AuthUser } from '../auth/auth-user';
import type { HubDb } from '../db/database';
import { HttpError } from '../http/http-error';
import { validate } from '../http/validate';
import type { NominalCurve } from './nominal-curve-csv';
import {
  countValvesOfType,
  deleteType,
  findTypeRecord,
  insertType,
  listNominalPoints,
  listTypeRecords,
  replaceNominalCurves,
  replaceType,
  typesUsingNames,
} from './valve-type.repository';
import {
  valveTypeInput,
  type createValveTypeBody,
  type patchValveTypeBody,
  type ValveTypeInput,
} from './valve-type.schemas';
import { toValveTypeInput, toValveTypeView, type ValveTypeView } from './valve-type-view';

/** Props of the type-library service. */
export interface ValveTypeServiceProps {
  db: HubDb;
  audit: AuditService;
  /** Called after a type's reference operating point changed (figures must be recomputed). */
  referenceChanged?: (typeId: number) => Promise<void>;
}

/** The type library: types, their figures and nominal curves. */
export type ValveTypeService = ReturnType<typeof createValveTypeService>;

/** The type a name denotes (designation or equivalent, any case), from the database. */
export async function findValveTypeView(
  db: HubDb,
  name: string,
): Promise<ValveTypeView | undefined> {
  const record = await findTypeRecord(db, name);
  return record ? toValveTypeView(record) : undefined;
}

/** 404 for a name that denotes no type. */
export function typeNotFound(name: string): HttpError {
  return new HttpError(404, 'valve_type_not_found', `valve type ${name} does not exist`);
}

/** Field-by-field differences of two plain values, for the audit log. */
function changes(before: Record<string, unknown>, after: Record<string, unknown>) {
  const out: Record<string, { from: unknown; to: unknown }> = {};
  for (const key of new Set([...Object.keys(before), ...Object.keys(after)])) {
    if (JSON.stringify(before[key]) !== JSON.stringify(after[key])) {
      out[key] = { from: before[key] ?? null, to: after[key] ?? null };
    }
  }
  return out;
}

/** Builds the type-library service. */
export function createValveTypeService({ db, audit, referenceChanged }: ValveTypeServiceProps) {
  async function requireType(name: string): Promise<ValveTypeView> {
    const view = await findValveTypeView(db, name);
    if (!view) throw typeNotFound(name);
    return view;
  }

  async function refuseTakenNames(t: ValveTypeInput, exceptId: number | null): Promise<void> {
    const names = [t.designation, ...(t.equivalents ?? [])];
    const taken = await typesUsingNames(db, names, exceptId);
    if (taken.length > 0) {
      throw new HttpError(
        409,
        'valve_type_name_taken',
        `a name of ${t.designation} is already used by ${taken.join(', ')}`,
        { designation: `already used by ${taken.join(', ')}` },
      );
    }
  }

  /** A type's nominal curves, by ascending Vg1 (an empty list when none are stored). */
  async function nominalCurves(name: string) {
    const record = await findTypeRecord(db, name);
    if (!record) throw typeNotFound(name);
    const rows = record.nominal ? await listNominalPoints(db, record.type.id) : [];
    const byVg1 = new Map<number, NominalCurve>();
    for (const r of rows) {
      let c = byVg1.get(r.vg1_volts);
      if (!c) byVg1.set(r.vg1_volts, (c = { vg1Volts: r.vg1_volts, points: [] }));
      c.points.push({
        vaVolts: r.va_volts,
        iaMilliamps: r.ia_milliamps,
        ig2Milliamps: r.ig2_milliamps,
      });
    }
    return {
      designation: record.type.designation,
      source: record.nominal?.source ?? null,
      uploadedBy: record.nominal?.uploader ?? null,
      uploadedAt: record.nominal?.uploaded_at ?? null,
      curves: [...byVg1.values()].sort((a, b) => a.vg1Volts - b.vg1Volts),
    };
  }

  return {
    /** Every type, in the order they were added. */
    async list(): Promise<ValveTypeView[]> {
      return (await listTypeRecords(db)).map(toValveTypeView);
    },

    /** One type by designation or equivalent; 404 if unknown. */
    get: requireType,

    /** Adds a type. */
    async create(
      body: z.output<typeof createValveTypeBody>,
      user: AuthUser,
    ): Promise<ValveTypeView> {
      await refuseTakenNames(body, null);
      await db.transaction().execute((trx) => insertType(trx, body, user.id));
      const view = await requireType(body.designation);
      await audit.record(user, 'valve-type.create', `valve-type:${view.designation}`, {
        type: toValveTypeInput(view),
      });
      return view;
    },

    /**
     * Changes a type. Ratings merge field by field, lists are replaced; the merged whole is
     * checked again, so a change cannot leave the type inconsistent.
     */
    async update(
      name: string,
      patch: z.output<typeof patchValveTypeBody>,
      user: AuthUser,
    ): Promise<ValveTypeView> {
      const before = await requireType(name);
      const current = toValveTypeInput(before);
      const defined = Object.fromEntries(
        Object.entries(patch).filter(([, v]) => v !== undefined),
      ) as Partial<ValveTypeInput>;
      const ratings = Object.fromEntries(
        Object.entries(patch.ratings ?? {}).filter(([, v]) => v !== undefined),
      );
      const merged = validate(
        valveTypeInput,
        { ...current, ...defined, ratings: { ...current.ratings, ...ratings } },
        'body',
      );
      await refuseTakenNames(merged, before.id);
      await db.transaction().execute((trx) => replaceType(trx, before.id, merged, user.id));
      const after = await requireType(before.designation);
      const diff = changes(
        toValveTypeInput(before) as unknown as Record<string, unknown>,
        toValveTypeInput(after) as unknown as Record<string, unknown>,
      );
      if (diff.ratings) {
        diff.ratings = changes(before.ratings, after.ratings) as unknown as {
          from: unknown;
          to: unknown;
        };
      }
      await audit.record(user, 'valve-type.update', `valve-type:${after.designation}`, {
        changes: diff,
      });
      if (JSON.stringify(before.operatingPoints[0]) !== JSON.stringify(after.operatingPoints[0])) {
        await referenceChanged?.(after.id);
      }
      return after;
    },

    /** Deletes a type; 409 while valve records are of that type. */
    async remove(name: string, user: AuthUser): Promise<void> {
      const view = await requireType(name);
      const valves = await countValvesOfType(db, view.id);
      if (valves > 0) {
        throw new HttpError(
          409,
          'valve_type_in_use',
          `${valves} valve record(s) are of type ${view.designation}`,
        );
      }
      await deleteType(db, view.id);
      await audit.record(user, 'valve-type.delete', `valve-type:${view.designation}`, {
        type: toValveTypeInput(view),
      });
    },

    /** Replaces a type's nominal curves with parsed ones. */
    async saveNominalCurves(
      name: string,
      curves: readonly NominalCurve[],
      source: string,
      user: AuthUser,
    ) {
      const view = await requireType(name);
      const points = curves.flatMap((c) =>
        c.points.map((p) => ({
          vg1_volts: c.vg1Volts,
          va_volts: p.vaVolts,
          ia_milliamps: p.iaMilliamps,
          ig2_milliamps: p.ig2Milliamps,
        })),
      );
      await db
        .transaction()
        .execute((trx) => replaceNominalCurves(trx, view.id, source, points, user.id));
      await audit.record(user, 'valve-type.nominal-curves', `valve-type:${view.designation}`, {
        source,
        curves: curves.length,
        points: points.length,
      });
      return nominalCurves(view.designation);
    },

    nominalCurves,
  };
}
