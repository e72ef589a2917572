import {
  DEFAULT_TOLERANCE_PERCENT,
  MATCH_TOLERANCES,
} from '../../shared/matching/match-tolerances';
import { downsampledCurves } from '../reports/downsampled-curves';
import type { MatchReport } from '../reports/match-report';
import type { MatchReportView } from './match-set.schemas';

/** Points kept per curve of a report page: enough for the eye, small enough for a phone. */
export const REPORT_CURVE_POINTS = 40;

/** The report's notes split into notes on method and safety cautions (those starting so). */
export function splitReportNotes(notes: readonly string[]): {
  notes: string[];
  cautions: string[];
} {
  const isCaution = (n: string) => /^caution\b/i.test(n);
  return { notes: notes.filter((n) => !isCaution(n)), cautions: notes.filter(isCaution) };
}

/** Where a set's tolerance comes from, in words a buyer can check. */
export function toleranceNote(tolerancePercent: number): string {
  const { usualPercent, loosePercent } = MATCH_TOLERANCES;
  // The trade quotes tight matching as a range, not as MATCH_TOLERANCES' single middle value.
  const range = `${usualPercent} % usual, 2-3 % tight, ${loosePercent} % loose`;
  return tolerancePercent === DEFAULT_TOLERANCE_PERCENT
    ? `Tolerance ${tolerancePercent} %: the usual target in common practice (${range}); ` +
        'not a published standard.'
    : `Tolerance ${tolerancePercent} %, chosen for this set (common practice: ${range}).`;
}

/** A report as the printable page and the buyer's page show it. */
export function matchReportView(report: MatchReport): MatchReportView {
  const { set } = report;
  return {
    workshop: report.workshop,
    code: set.code,
    valveType: set.valveType,
    status: set.status,
    createdAt: set.createdAt,
    figures: set.figures,
    toleranceNote: toleranceNote(set.figures.tolerancePercent),
    members: set.members.map(({ status: _, ...m }) => ({
      ...m,
      curves: downsampledCurves(report.families.get(m.valveId) ?? [], REPORT_CURVE_POINTS),
    })),
    ...splitReportNotes(report.notes),
  };
}
