import { recordGrade } from './record-grade';
import { trendPoints } from './trend-points';
import { quickTestSummary, sweepFigures, valveDetail } from './valve-view-fixture';

describe('recordGrade', () => {
  it("names the sweep's graded figure when the hub graded by a sweep", () => {
    expect(recordGrade(valveDetail({ quickTests: [quickTestSummary()] }))).toEqual({
      reason: 'gm 64 % of nominal at 250 V / -2 V',
      from: { source: 'sweep', id: 41, at: '2026-11-30T10:00:00Z' },
    });
  });

  it('says when the graded figures needed a cut curve carried on to the point', () => {
    const detail = valveDetail();
    const trend = detail.trend.map((f, i, all) =>
      i === all.length - 1 ? { ...f, extendedVolts: 11.6 } : f,
    );
    expect(recordGrade({ ...detail, trend }).reason).toBe(
      "gm 64 % of nominal at 250 V / -2 V; a neighbouring curve stopped at the sweep's limit " +
        'and was carried 12 V on to the point',
    );
  });

  it("gives the quick test's own reason when the hub graded by it", () => {
    const older = quickTestSummary({ id: 4, at: '2026-11-20T10:00:00Z', reason: 'older' });
    const valve = valveDetail({
      grade: 'strong',
      percentOfNominal: 95,
      gradeSource: 'quick-test',
      gradedAt: '2026-12-01T11:00:40.000Z',
      quickTests: [quickTestSummary(), older],
    });
    expect(recordGrade(valve)).toEqual({
      reason: 'gm 95 % of nominal (1520 of 1600 uS) at 250 V / -2 V',
      from: { source: 'quick-test', id: 5, at: '2026-12-01T11:00:40.000Z' },
    });
  });

  it('names the figure whose percentage is the grade', () => {
    // The hub's percentage is Ia's here (75 %), as where a type publishes no gm.
    expect(recordGrade(valveDetail({ percentOfNominal: 75 })).reason).toBe(
      'Ia 75 % of nominal at 250 V / -2 V',
    );
  });

  it('says why there is no grade', () => {
    const ungraded = { grade: null, percentOfNominal: null, gradeSource: null, gradedAt: null };
    const aborted = quickTestSummary({ status: 'aborted', grade: null, reason: null });
    expect(recordGrade(valveDetail({ ...ungraded, trend: [], quickTests: [aborted] }))).toEqual({
      reason: 'The newest quick test gave no grade: aborted.',
      from: null,
    });
    expect(recordGrade(valveDetail({ ...ungraded, trend: [] })).reason).toBe(
      'Not measured yet: no sweep or quick test with figures at the reference point.',
    );
    const refused = sweepFigures({
      gmPercent: null,
      iaPercent: null,
      refusal: 'gm is undefined there',
    });
    expect(recordGrade(valveDetail({ ...ungraded, trend: [refused] })).reason).toBe(
      'No figures from the newest sweep: gm is undefined there.',
    );
  });
});

describe('trendPoints', () => {
  it('puts sweeps and quick tests on one time line in mA/V and mA, oldest first', () => {
    const points = trendPoints(
      [sweepFigures(), sweepFigures({ sweepId: 44, gmMicrosiemens: null, iaMilliamps: null })],
      [quickTestSummary({ at: '2026-10-01T00:00:00Z' })],
    );
    expect(points).toEqual([
      {
        source: 'quick-test',
        id: 5,
        at: '2026-10-01T00:00:00Z',
        gmMilliampsPerVolt: 1.52,
        iaMilliamps: 0.96,
        gmPercent: 95,
        iaPercent: 80,
      },
      {
        source: 'sweep',
        id: 40,
        at: '2026-11-01T10:00:00Z',
        gmMilliampsPerVolt: 1.5,
        iaMilliamps: 1.1,
        gmPercent: 94,
        iaPercent: 92,
      },
    ]);
  });

  it('leaves out quick tests whose gm part was not measured', () => {
    const skipped = quickTestSummary({ gmMicrosiemens: null, iaMilliamps: null });
    expect(trendPoints([], [skipped])).toEqual([]);
  });
});
