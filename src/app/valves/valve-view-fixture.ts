import type { QuickTestSummary, SweepFigures, ValveDetail, ValveView } from './valves-api';

/** A valve record for specs. */
export function valveView(over: Partial<ValveView> = {}): ValveView {
  return {
    id: 7,
    label: 'WK-0007',
    type: '12AX7',
    maker: 'Aldermoor',
    dateCode: 'B3K',
    originKind: 'lot',
    originText: 'Box from the Tarrant estate',
    location: 'Drawer C3',
    status: 'in-stock',
    notes: null,
    grade: 'fair',
    percentOfNominal: 71.6,
    gradeSource: 'sweep',
    gradedAt: '2026-11-30T10:00:00Z',
    sweepCount: 2,
    lastSweepAt: '2026-11-30T10:00:00Z',
    createdBy: 'tech',
    updatedBy: 'tech',
    createdAt: '2026-11-01T10:00:00Z',
    updatedAt: '2026-11-30T10:00:00Z',
    ...over,
  };
}

/**
 * A finished quick test as a record lists it, with a gm reading; `gmMicrosiemens` and
 * `iaMilliamps` are made-up readings against the 12AX7's data-sheet 1600 µS and 1.2 mA.
 */
export function quickTestSummary(
  over: Partial<QuickTestSummary> = {},
  gmMicrosiemens = 1520,
  iaMilliamps = 0.96,
): QuickTestSummary {
  const gmPercent = (100 * gmMicrosiemens) / 1600;
  return {
    id: 5,
    at: '2026-12-01T11:00:40.000Z',
    status: 'complete',
    grade: 'strong',
    reason: `gm ${gmPercent} % of nominal (${gmMicrosiemens} of 1600 uS) at 250 V / -2 V`,
    percent: gmPercent,
    vaVolts: 250,
    vg1Volts: -2,
    iaMilliamps,
    gmMicrosiemens,
    iaPercent: (100 * iaMilliamps) / 1.2,
    gmPercent,
    operator: 'tech',
    ...over,
  };
}

/** Figures of a sweep at the 12AX7's reference point, made up for specs. */
export function sweepFigures(over: Partial<SweepFigures> = {}): SweepFigures {
  return {
    sweepId: 40,
    at: '2026-11-01T10:00:00Z',
    vaVolts: 250,
    vg1Volts: -2,
    iaMilliamps: 1.1,
    gmMicrosiemens: 1500,
    raKiloohms: 66,
    mu: 99,
    iaPercent: 92,
    gmPercent: 94,
    refusal: null,
    extendedVolts: 0,
    ...over,
  };
}

/**
 * A 12AX7 record with the figures of two sweeps (40, then 41, which grades it weak on gm 64 %)
 * and no quick tests.
 */
export function valveDetail(over: Partial<ValveDetail> = {}): ValveDetail {
  return {
    ...valveView({ grade: 'weak', percentOfNominal: 64 }),
    referencePoint: {
      vaVolts: 250,
      vg2Volts: null,
      vg1Volts: -2,
      iaMilliamps: 1.2,
      gmMicrosiemens: 1600,
    },
    sweeps: [],
    quickTests: [],
    trend: [
      sweepFigures(),
      sweepFigures({
        sweepId: 41,
        at: '2026-11-30T10:00:00Z',
        iaMilliamps: 0.9,
        gmMicrosiemens: 1024,
        raKiloohms: 90,
        mu: 92,
        iaPercent: 75,
        gmPercent: 64,
      }),
    ],
    ...over,
  };
}
