import type { SweepPlan, SweepPoint } from '../../../shared/domain/sweep';
import { curveColour } from './curve-colours';

/** One line of the chart, in the shape ECharts' setOption takes. */
export interface SweepLineSeries {
  id: string;
  name: string;
  type: 'line';
  /** [x, y] pairs: x is Va (anode family) or Vg1 (transfer), V; y is a current, mA. */
  data: [number, number][];
  showSymbol: boolean;
  symbolSize: number;
  lineStyle: { color: string; width: number; type: 'solid' | 'dashed' };
  itemStyle: { color: string };
  emphasis: { focus: 'series' };
  animation: false;
}

/** Legend name of the curve at a grid voltage, e.g. "Vg1 = -1.5 V". */
export function curveName(vg1Volts: number): string {
  return `Vg1 = ${formatVolts(vg1Volts)} V`;
}

/**
 * The chart's lines for a sweep's points: one Ia line per curve (per Vg1 step for an anode
 * family, one line for a transfer curve), in curve order, and a dashed Ig2 line beside each
 * curve whose screen current was measured. Ia and Ig2 of a curve share a legend name, so one
 * legend entry shows or hides both.
 */
export function sweepSeries(
  plan: SweepPlan,
  points: readonly SweepPoint[],
  dark: boolean,
): SweepLineSeries[] {
  const byCurve = new Map<number, SweepPoint[]>();
  for (const p of points) {
    const curve = plan.kind === 'transfer' ? 0 : p.curve;
    const list = byCurve.get(curve);
    if (list) list.push(p);
    else byCurve.set(curve, [p]);
  }
  const count = plan.kind === 'transfer' ? 1 : Math.max(plan.vg1Volts.length, byCurve.size);
  const out: SweepLineSeries[] = [];
  for (const curve of [...byCurve.keys()].sort((a, b) => a - b)) {
    const curvePoints = byCurve
      .get(curve)!
      .slice()
      .sort((a, b) => a.seq - b.seq);
    const x = (p: SweepPoint) => (plan.kind === 'transfer' ? p.vg1Volts : p.vaVolts);
    const name =
      plan.kind === 'transfer'
        ? `Va = ${formatVolts(plan.vaStartVolts)} V`
        : curveName(plan.vg1Volts[curve] ?? curvePoints[0].vg1Volts);
    const colour = curveColour(curve, count, dark);
    const sparse = curvePoints.length < 12;
    out.push(
      line(
        `ia-${curve}`,
        name,
        curvePoints.map((p) => [x(p), p.iaMilliamps]),
        colour,
        'solid',
        sparse,
      ),
    );
    if (curvePoints.some((p) => p.ig2Milliamps !== 0)) {
      const data = curvePoints.map((p): [number, number] => [x(p), p.ig2Milliamps]);
      out.push(line(`ig2-${curve}`, name, data, colour, 'dashed', false));
    }
  }
  return out;
}

function line(
  id: string,
  name: string,
  data: [number, number][],
  colour: string,
  type: 'solid' | 'dashed',
  showSymbol: boolean,
): SweepLineSeries {
  return {
    id,
    name,
    type: 'line',
    data,
    showSymbol,
    symbolSize: 4,
    lineStyle: { color: colour, width: type === 'solid' ? 2 : 1.5, type },
    itemStyle: { color: colour },
    emphasis: { focus: 'series' },
    animation: false,
  };
}

function formatVolts(v: number): string {
  return Number.isInteger(v) ? String(v) : String(Math.round(v * 100) / 100);
}
