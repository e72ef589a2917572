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
 * first member's curves carry their grid voltage at the right-hand end.
 */
export function reportSeries(members: readonly ReportMember[]): ReportSeries[] {
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
      ...(i === 0 && {
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
      // No icon given: ECharts draws each entry as its series' line, dashes included.
      itemWidth: 32,
      itemHeight: 10,
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
