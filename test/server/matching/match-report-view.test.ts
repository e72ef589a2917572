import { describe, expect, it } from 'vitest';
import { DEFAULT_TOLERANCE_PERCENT } from '../../../shared/matching/match-tolerances';
import { splitReportNotes, toleranceNote } from '../../../server/matching/match-report-view';
import { REPORT_NOTES } from '../../../server/reports/match-report';

describe('splitReportNotes', () => {
  it('puts every printed note in exactly one list, the safety caution among the cautions', () => {
    const { notes, cautions } = splitReportNotes(REPORT_NOTES);
    expect([...notes, ...cautions].sort()).toEqual([...REPORT_NOTES].sort());
    expect(cautions.length).toBeGreaterThan(0);
    expect(cautions.join(' ')).toMatch(/high voltages/);
    expect(notes.join(' ')).not.toMatch(/^Caution/m);
  });
});

describe('toleranceNote', () => {
  it('names the default tolerance as common practice, not a standard', () => {
    const note = toleranceNote(DEFAULT_TOLERANCE_PERCENT);
    expect(note).toMatch(new RegExp(`^Tolerance ${DEFAULT_TOLERANCE_PERCENT} %: the usual`));
    expect(note).toMatch(/common practice/);
    expect(note).toMatch(/not a published standard/);
  });

  it('says a tolerance other than the default was chosen for the set', () => {
    expect(toleranceNote(3)).toMatch(/^Tolerance 3 %, chosen for this set/);
  });
});
