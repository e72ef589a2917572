import type { EChartsCoreOption } from 'echarts/core';
import { memberStyle } from './member-styles';
import type { ReportMember } from './reports-api';

/** Size the report chart is drawn at, px; the SVG scales to its box on screen and paper. */
export const REPORT_CHART_SIZE = { width: 680, height: 380 } as const;

/** One line of the report chart: one curve of one member. */
export interface ReportSeries {
  id: string;
  /** The member's label: curves of one valve share one legend entry. */
  name: string;
  type: 'line';
  data: [number, number][];
  lineStyle: { color: string; width: number; type: 'solid' | number[] };
  itemStyle: { color: string };
  symbol: 'none';
  endLabel?: Record<string, unknown>;
}

/**
 * Series of the report chart: every curve of every member, coloured and dashed by member; the
 * first member's curves carry their grid voltage at the right-hand end, where it has room.
 */
export function reportSeries(members: readonly ReportMember[]): ReportSeries[] {
  const labelled = labelledCurves(members);
  return members.flatMap((m, i) => {
    const style = memberStyle(i);
    return m.curves.map((c, k) => ({
      id: `valve-${m.valveId}-curve-${k}`,
      name: m.label,
      type: 'line' as const,
      data: c.points,
      symbol: 'none' as const,
      lineStyle: {
        color: style.colour,
        width: 1.4,
        type: style.dash.length ? [...style.dash] : ('solid' as const),
      },
      itemStyle: { color: style.colour },
      ...(i === 0 &&
        labelled.has(k) && {
          endLabel: {
            show: true,
            formatter: `${trimVolts(c.vg1Volts)} V`,
            color: '#333',
            fontSize: 10,
            fontFamily: MONO,
          },
        }),
    }));
  });
}

const MONO = "'JetBrains Mono', ui-monospace, monospace";

/** Room a curve's end label takes, as fractions of the Va and Ia axes (about 60 by 12 px). */
const LABEL_ROOM = { va: 0.1, ia: 0.04 };

/**
 * Curves of the first member whose end label does not collide with another: from the most
 * negative grid up, so the open region to the right is labelled and the crowd near the current
 * limit gives way (the caption lists every grid voltage anyway).
 */
function labelledCurves(members: readonly ReportMember[]): Set<number> {
  const all = members.flatMap((m) => m.curves.flatMap((c) => c.points));
  const vaMax = Math.max(1e-9, ...all.map(([va]) => va));
  const iaMax = Math.max(1e-9, ...all.map(([, ia]) => ia));
  const ends = (members[0]?.curves ?? [])
    .map((c, k) => ({ k, vg1: c.vg1Volts, end: c.points.at(-1) }))
    .filter((e): e is { k: number; vg1: number; end: [number, number] } => e.end !== undefined)
    .sort((a, b) => a.vg1 - b.vg1);
  const kept: [number, number][] = [];
  const chosen = new Set<number>();
  for (const { k, end } of ends) {
    const x = end[0] / vaMax;
    const y = end[1] / iaMax;
    if (
      kept.some(([kx, ky]) => Math.abs(kx - x) < LABEL_ROOM.va && Math.abs(ky - y) < LABEL_ROOM.ia)
    ) {
      continue;
    }
    kept.push([x, y]);
    chosen.add(k);
  }
  return chosen;
}

/** The whole chart: axes with units, a legend by label, no animation (print takes it as is). */
export function reportChartOption(members: readonly ReportMember[]): EChartsCoreOption {
  const text = '#222';
  const axis = (name: string, nameGap: number) => ({
    type: 'value',
    name,
    nameLocation: 'middle',
    nameGap,
    min: 0,
    nameTextStyle: { color: text, fontSize: 12 },
    axisLabel: { color: text, fontFamily: MONO, fontSize: 10 },
    axisLine: { show: true, lineStyle: { color: '#555' } },
    axisTick: { show: true, lineStyle: { color: '#555' } },
    splitLine: { lineStyle: { color: '#e2e2e2' } },
  });
  return {
    backgroundColor: '#ffffff',
    animation: false,
    textStyle: { fontFamily: 'Roboto, system-ui, sans-serif', color: text },
    grid: { left: 56, right: 52, top: 36, bottom: 44 },
    legend: {
      top: 0,
      left: 48,
      data: members.map((m) => m.label),
      // No icon given: ECharts draws each entry as its series' line, dashes included; the
      // symbol it would put on that line is hidden, as the curves have none.
      itemWidth: 32,
      itemHeight: 10,
      itemStyle: { opacity: 0 },
      textStyle: { color: text, fontFamily: MONO, fontSize: 11 },
      selectedMode: false,
    },
    xAxis: axis('Va (V)', 28),
    yAxis: axis('Ia (mA)', 40),
    series: reportSeries(members),
  };
}

function trimVolts(v: number): string {
  return String(Number(v.toPrecision(4)));
}
