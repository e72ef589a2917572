import type { AuthUser } from '../auth/auth-user';
import type { HubDb } from '../db/database';
import { allocateLabel } from '../settings/settings.service';
import { findValveTypeView } from '../valve-types/valve-type.service';
import type { ValveCsvRow } from './valve-csv';
import { insertValve, labelTaken } from './valve.repository';
import { createValveBody } from './valve.schemas';

/** What an import did: how many went in, and each row that did not, with why. */
export interface ValveImportReport {
  imported: number;
  /** Labels of the imported valves, in file order. */
  labels: string[];
  rejected: { line: number; reason: string }[];
}

/** A CSV row as the body of a create, blank cells as not given. */
function rowBody(v: ValveCsvRow['values']) {
  const given = (s: string | undefined) => (s === undefined || s === '' ? undefined : s);
  return {
    label: given(v.label),
    type: v.type,
    maker: given(v.maker),
    dateCode: given(v.date_code),
    originKind: given(v.origin_kind),
    originText: given(v.origin),
    location: given(v.location),
    status: given(v.status),
    notes: given(v.notes),
  };
}

/**
 * Inserts the rows that are valid, in one transaction, and reports the others. A row is
 * refused for a bad cell, an unknown type, or a label already in use or repeated in the file;
 * rows without a label get the next generated ones (never one a later row asks for).
 */
export async function importValveRows(
  db: HubDb,
  rows: readonly ValveCsvRow[],
  user: AuthUser,
): Promise<ValveImportReport> {
  return db.transaction().execute(async (trx) => {
    const rejected: ValveImportReport['rejected'] = [];
    const labels: string[] = [];
    const asked = new Map<string, number>();
    for (const r of rows) {
      const label = r.values.label?.trim();
      if (label && !asked.has(label.toUpperCase())) asked.set(label.toUpperCase(), r.line);
    }
    const typeIds = new Map<string, number | null>();
    const now = new Date().toISOString();
    for (const r of rows) {
      if (r.problem) {
        rejected.push({ line: r.line, reason: r.problem });
        continue;
      }
      if (!r.values.type) {
        rejected.push({ line: r.line, reason: 'type: the cell is empty' });
        continue;
      }
      const parsed = createValveBody.safeParse(rowBody(r.values));
      if (!parsed.success) {
        const issue = parsed.error.issues[0];
        const column = String(issue.path[0] ?? 'row');
        rejected.push({ line: r.line, reason: `${column}: ${issue.message}` });
        continue;
      }
      const b = parsed.data;
      const key = b.type.toUpperCase();
      if (!typeIds.has(key)) typeIds.set(key, (await findValveTypeView(trx, b.type))?.id ?? null);
      const typeId = typeIds.get(key);
      if (!typeId) {
        rejected.push({ line: r.line, reason: `unknown valve type ${b.type}` });
        continue;
      }
      if (b.label) {
        const first = asked.get(b.label.toUpperCase());
        if (first !== r.line) {
          rejected.push({ line: r.line, reason: `label ${b.label} repeats line ${first}` });
          continue;
        }
        if (await labelTaken(trx, b.label)) {
          rejected.push({ line: r.line, reason: `label ${b.label} is already in use` });
          continue;
        }
      }
      const label =
        b.label ??
        (await allocateLabel(
          trx,
          async (l) => asked.has(l.toUpperCase()) || (await labelTaken(trx, l)),
        ));
      await insertValve(trx, {
        label,
        valve_type_id: typeId,
        maker: b.maker ?? null,
        date_code: b.dateCode ?? null,
        origin_kind: b.originKind ?? null,
        origin_text: b.originText ?? null,
        location: b.location ?? null,
        status: b.status ?? 'in-stock',
        notes: b.notes ?? null,
        created_by: user.id,
        updated_by: user.id,
        created_at: now,
        updated_at: now,
      });
      labels.push(label);
    }
    return { imported: labels.length, labels, rejected };
  });
}
