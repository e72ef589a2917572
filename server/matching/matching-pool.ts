import type { SweepPoint } from '../../shared/domain/sweep';
import type { MatchCandidate, MatchingCriteria } from '../../shared/matching/index';
import type { HubDb } from '../db/database';
import { HttpError, notFound } from '../http/http-error';
import { readSettings } from '../settings/settings.service';
import { listPoints } from '../sweeps/sweep.repository';
import { listAllValves } from '../valves/valve.repository';
import type { ValveStatus } from '../valves/valve-status';
import { findTypeId, listPoolValves, type PoolValveRow } from './candidate-pool.repository';
import type { MatchCriteriaInput } from './matching.schemas';

/** A pool valve with its family, ready for the matching code. */
export interface PoolValve {
  row: PoolValveRow;
  family: SweepPoint[];
  /** Section 2's family of a double triode, where swept. */
  section2Family?: SweepPoint[];
}

/** Which valves to load. */
export interface PoolRequest {
  valveType: string;
  statuses: readonly ValveStatus[];
  grades?: readonly string[];
  valveIds?: readonly number[];
  dateFrom?: string;
  dateTo?: string;
}

/** Loads the pool: valves of the type with their newest anode family, filtered. */
export async function loadPool(db: HubDb, r: PoolRequest): Promise<PoolValve[]> {
  const typeId = await findTypeId(db, r.valveType);
  if (typeId === undefined) throw notFound('valve_type', r.valveType);
  let rows = await listPoolValves(db, {
    typeId,
    statuses: r.statuses,
    valveIds: r.valveIds,
    dateFrom: r.dateFrom,
    dateTo: r.dateTo,
  });
  if (r.grades?.length) {
    const { gradeThresholds } = await readSettings(db);
    const grades = new Map((await listAllValves(db, gradeThresholds)).map((v) => [v.id, v.grade]));
    rows = rows.filter((row) => r.grades!.includes(grades.get(row.valve_id) ?? 'ungraded'));
  }
  const out: PoolValve[] = [];
  for (const row of rows) {
    const family = await listPoints(db, row.sweep_id);
    const second = row.section2_sweep_id;
    out.push(
      second === null
        ? { row, family }
        : { row, family, section2Family: await listPoints(db, second) },
    );
  }
  return out;
}

/** The pool as matching candidates; ids are valve ids as strings. */
export function candidatesOf(pool: readonly PoolValve[]): MatchCandidate[] {
  return pool.map((p) => ({
    id: String(p.row.valve_id),
    label: p.row.label,
    valveType: p.row.type_designation,
    family: p.family,
    ...(p.section2Family ? { section2Family: p.section2Family } : {}),
  }));
}

/** API criteria as the matching code takes them. */
export function toMatchingCriteria(c: MatchCriteriaInput, groupSize: number): MatchingCriteria {
  return {
    valveType: c.valveType,
    operatingPoints: c.operatingPoints,
    window: c.window,
    iaWeight: c.weights?.ia,
    gmWeight: c.weights?.gm,
    curveWeight: c.weights?.curve,
    sectionBalanceWeight: c.weights?.sectionBalance,
    tolerancePercent: c.tolerancePercent,
    groupSize,
    sections: c.sections,
    maxSectionImbalancePercent: c.maxSectionImbalancePercent,
  };
}

/** A 422 for criteria or a pool the matching code declined, with its reason. */
export function matchingRefused(reason: string): HttpError {
  return new HttpError(422, 'matching_refused', reason);
}
