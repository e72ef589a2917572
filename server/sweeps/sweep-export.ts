import type { SweepPoint } from '../../shared/domain/sweep';
import type { SweepView } from '../../shared/hub/messages';

/** Column header of the CSV export; units after the underscore. */
export const CSV_HEADER = 'seq,curve,va_V,vg1_V,vg2_V,ia_mA,ig2_mA';

/**
 * A sweep as CSV: the conditions as leading `#` comment lines, then one row a point. Only
 * numbers go in the rows, so no cell can be read as a formula by a spreadsheet.
 */
export function sweepCsv(
  sweep: SweepView,
  benchName: string,
  points: readonly SweepPoint[],
): string {
  const p = sweep.plan;
  const oneLine = (s: string | null) => (s ?? '').replace(/[\r\n]+/g, ' ');
  const lines = [
    `# Emberline sweep ${sweep.id}`,
    `# bench: ${oneLine(benchName)} (id ${sweep.benchId})`,
    `# valve type: ${oneLine(sweep.valveType) || '-'}`,
    `# valve label: ${oneLine(sweep.valveLabel) || '-'}`,
    `# status: ${sweep.status}${sweep.endMessage ? ` (${oneLine(sweep.endMessage)})` : ''}`,
    `# operator: ${oneLine(sweep.operator)}`,
    `# created: ${sweep.createdAt}`,
    `# started: ${sweep.startedAt ?? '-'}; ended: ${sweep.endedAt ?? '-'}`,
    `# kind: ${p.kind}`,
    p.kind === 'anode'
      ? `# anode: ${p.vaStartVolts} V to ${p.vaStopVolts} V in ${p.vaStepVolts} V steps`
      : `# anode: ${p.vaStartVolts} V fixed`,
    `# grid 1: ${p.vg1Volts.join(';')} V`,
    `# screen: ${p.vg2Volts} V; heater: ${p.heaterVolts} V`,
    `# curve limits: ${p.iaMaxMilliamps} mA, ${p.paMaxWatts} W; trip: ${p.iaTripMilliamps} mA`,
    `# warm-up: ${p.warmupSeconds} s; settling: ${p.settleMs} ms`,
    `# points: ${points.length}` +
      (sweep.deviceCount === null ? '' : ` of ${sweep.deviceCount} reported`),
    CSV_HEADER,
  ];
  for (const pt of points) {
    lines.push(
      [
        pt.seq,
        pt.curve,
        pt.vaVolts,
        pt.vg1Volts,
        pt.vg2Volts,
        pt.iaMilliamps,
        pt.ig2Milliamps,
      ].join(','),
    );
  }
  return lines.join('\n') + '\n';
}

/** A sweep as a JSON document: the record, its bench and every point. */
export function sweepJson(
  sweep: SweepView,
  benchName: string,
  points: readonly SweepPoint[],
): string {
  return JSON.stringify(
    {
      format: 'emberline-sweep',
      version: 1,
      sweep,
      bench: { id: sweep.benchId, name: benchName },
      points,
    },
    null,
    2,
  );
}
