import type { MatchSetDetail } from './match-sets-api';
import type { MatchRun, RunGroup } from './matching-api';

/** A group of a run for specs: members KL-<ids>, spreads in mA, µS and %. */
export function runGroup(ids: number[], over: Partial<RunGroup> = {}): RunGroup {
  return {
    members: ids.map((id) => ({
      valveId: id,
      label: `KL-${String(id).padStart(4, '0')}`,
      sweepId: 100 + id,
      sectionImbalancePercent: null,
    })),
    scorePercent: 2.23,
    acceptable: true,
    points: [
      {
        label: 'idle',
        section: 1,
        kind: 'fixed-bias',
        iaMeanMilliamps: 88.88,
        iaSpreadPercent: 2.71,
        gmMeanMicrosiemens: 11145.2,
        gmSpreadPercent: 2.09,
        vg1MeanVolts: -13.5,
        vg1SpreadVolts: 0,
      },
    ],
    curveSpreadPercent: null,
    exceeds: [],
    ...over,
  };
}

/** A stored run for specs: an EL34 quad within tolerance, one over it, and a left-over valve. */
export function matchRun(over: Partial<MatchRun> = {}): MatchRun {
  return {
    id: 12,
    criteria: {
      valveType: 'EL34',
      groupSize: 4,
      tolerancePercent: 5,
      statuses: ['in-stock'],
      operatingPoints: [{ label: 'idle', vaVolts: 250, vg1Volts: -13.5, vg2Volts: 250 }],
    },
    groups: [
      runGroup([10, 11, 13, 14]),
      runGroup([15, 16, 17, 18], {
        scorePercent: 7.4,
        acceptable: false,
        curveSpreadPercent: 6.2,
        exceeds: ['Ia at idle: 6.1 % (tolerance 5 %)'],
      }),
    ],
    leftOver: [
      {
        valveId: 19,
        label: 'KL-0019',
        reason: 'pool-size',
        detail: '1 of 9 matchable valves do not fill another group of 4',
      },
    ],
    totalScorePercent: 9.63,
    poolSize: 9,
    metricDescription: 'Emberline measures how far apart two valves are in percent.',
    tolerances: { tightPercent: 2.5, usualPercent: 5, loosePercent: 10, note: 'common practice' },
    createdBy: 'tech',
    createdAt: '2026-12-01T10:00:00.000Z',
    ...over,
  };
}

/** A reserved EL34 quad for specs. */
export function matchSetDetail(over: Partial<MatchSetDetail> = {}): MatchSetDetail {
  const ids = [10, 11, 13, 14];
  return {
    id: 3,
    code: 'MS-0003',
    valveType: 'EL34',
    status: 'reserved',
    memberCount: 4,
    labels: ids.map((id) => `KL-${String(id).padStart(4, '0')}`),
    createdBy: 'tech',
    createdAt: '2026-12-01T10:05:00.000Z',
    criteria: { valveType: 'EL34', tolerancePercent: 5 },
    runId: 12,
    figures: {
      scorePercent: 2.23,
      acceptable: true,
      tolerancePercent: 5,
      curveSpreadPercent: null,
      exceeds: [],
      points: runGroup(ids).points.map((p) => ({ ...p, label: 'typical' })),
    },
    members: ids.map((id, i) => ({
      valveId: id,
      label: `KL-${String(id).padStart(4, '0')}`,
      valveType: 'EL34',
      status: 'reserved',
      grade: 'strong',
      gradePercent: 87.6 + i,
      readings: [
        { label: 'typical', vg1Volts: -13.5, iaMilliamps: 87.6 + i, gmMicrosiemens: 11221 + i },
      ],
      sweepId: 100 + id,
      sweptAt: '2026-11-12T17:01:00.000Z',
      bench: 'Bench A',
      conditions: {
        vaStartVolts: 0,
        vaStopVolts: 400,
        vaStepVolts: 10,
        vg1Volts: [0, -5, -10, -15, -20],
        vg2Volts: 250,
        heaterVolts: 6.3,
      },
    })),
    mailings: [],
    shares: [],
    ...over,
  };
}
