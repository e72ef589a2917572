import type { MatchReportData, ReportMember } from './reports-api';

/** A member of a test report: a pentode family at Vg1 = 0, -10 V scaled by `scale`. */
function member(valveId: number, label: string, scale: number): ReportMember {
  const curve = (vg1Volts: number, top: number) => ({
    vg1Volts,
    points: [0, 100, 200, 300].map((va) => [va, Math.min(va / 2, top) * scale] as [number, number]),
  });
  return {
    valveId,
    label,
    valveType: 'EL34',
    grade: 'good',
    gradePercent: 98.4,
    readings: [
      {
        label: 'typical',
        vg1Volts: -13.5,
        iaMilliamps: 100.234 * scale,
        gmMicrosiemens: 11040 * scale,
      },
    ],
    sweepId: valveId * 10,
    sweptAt: '2026-11-02T09:30:00.000Z',
    bench: 'Bench B',
    conditions: {
      vaStartVolts: 0,
      vaStopVolts: 300,
      vaStepVolts: 10,
      vg1Volts: [0, -10],
      vg2Volts: 250,
      heaterVolts: 6.3,
    },
    curves: [curve(0, 120), curve(-10, 60)],
  };
}

/** A report of an acceptable EL34 pair, as GET /api/match-sets/:id/report answers it. */
export function matchReportFixture(over: Partial<MatchReportData> = {}): MatchReportData {
  return {
    workshop: 'Glowing Filament Workshop',
    code: 'MS-0007',
    valveType: 'EL34',
    status: 'reserved',
    createdAt: '2026-11-03T14:00:00.000Z',
    figures: {
      scorePercent: 1.234,
      acceptable: true,
      tolerancePercent: 5,
      curveSpreadPercent: 2.345,
      exceeds: [],
      points: [
        {
          label: 'typical',
          section: 1,
          kind: 'fixed-bias',
          iaMeanMilliamps: 101.2,
          iaSpreadPercent: 1.98,
          gmMeanMicrosiemens: 11150,
          gmSpreadPercent: 2.06,
          vg1MeanVolts: -13.5,
          vg1SpreadVolts: 0,
        },
      ],
    },
    toleranceNote: 'Tolerance 5 %: the usual target in common practice; not a published standard.',
    members: [member(11, 'EL34-003', 1), member(12, 'EL34-008', 1.02)],
    notes: ['What was measured: each valve was swept on a curve tracer.'],
    cautions: ['Caution: valve circuits run at high voltages that can kill.'],
    ...over,
  };
}
