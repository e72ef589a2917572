import { dissipationHyperbola } from '../../../shared/analysis/dissipation-hyperbola';
import { korenCurrents, type KorenModel } from '../../../shared/analysis/koren-model';
import type { LoadLineAnalysis } from '../../../shared/analysis/load-line';
import type { ChartOverlay, ChartPoint } from '../sweeps/sweep-chart';

/**
 * What the analysis draws over the measured curves. The curves use every hue from ember to
 * blue, so the analysis draws in ink (near-white on dark, near-black on light) and tells its
 * lines apart by weight and dash; the dissipation limit alone is red, as limits are elsewhere.
 */
interface OverlayInk {
  ink: string;
  model: string;
  limit: string;
}

const MONO = "'JetBrains Mono', ui-monospace, monospace";

function inkOf(dark: boolean): OverlayInk {
  return dark
    ? { ink: '#f6f0e8', model: 'rgba(246, 240, 232, 0.8)', limit: '#f2b8b5' }
    : { ink: '#1e1b17', model: 'rgba(30, 27, 23, 0.75)', limit: '#b3261e' };
}

function lineOverlay(id: string, data: [number, number][], extra: Record<string, unknown>) {
  return {
    id,
    type: 'line',
    data,
    showSymbol: false,
    silent: true,
    animation: false,
    z: 4,
    emphasis: { disabled: true },
    ...extra,
  } satisfies ChartOverlay;
}

/** The operating-point marker: a ring at (Va, Ia). */
export function markerOverlay(point: ChartPoint, dark: boolean): ChartOverlay {
  const { ink } = inkOf(dark);
  return lineOverlay('analysis-marker', [[point.vaVolts, point.iaMilliamps]], {
    showSymbol: true,
    symbol: 'circle',
    symbolSize: 14,
    z: 6,
    itemStyle: { color: 'transparent', borderColor: ink, borderWidth: 2 },
    label: {
      show: true,
      position: 'right',
      formatter: 'OP',
      color: ink,
      fontFamily: MONO,
      fontSize: 11,
    },
  });
}

/**
 * The load line (AC, solid), the DC line where it differs (dashed), the quiescent point
 * (a filled dot) and the drive points of the swing (small diamonds).
 */
export function loadLineOverlays(analysis: LoadLineAnalysis, dark: boolean): ChartOverlay[] {
  const { ink } = inkOf(dark);
  const pair = (line: LoadLineAnalysis['acLine']): [number, number][] =>
    line.map((p): [number, number] => [p.vaVolts, p.iaMilliamps]);
  const out: ChartOverlay[] = [
    lineOverlay('analysis-ac-line', pair(analysis.acLine), {
      lineStyle: { color: ink, width: 2 },
      itemStyle: { color: ink },
    }),
  ];
  const slope = (line: LoadLineAnalysis['acLine']) =>
    (line[1].iaMilliamps - line[0].iaMilliamps) / (line[1].vaVolts - line[0].vaVolts);
  const dcSlope = slope(analysis.dcLine);
  if (!(Math.abs(dcSlope - slope(analysis.acLine)) <= 1e-9 * Math.abs(dcSlope))) {
    out.push(
      lineOverlay('analysis-dc-line', pair(analysis.dcLine), {
        lineStyle: { color: ink, width: 1.25, type: [6, 4] },
        itemStyle: { color: ink },
      }),
    );
  }
  if (analysis.swing) {
    out.push(
      lineOverlay(
        'analysis-swing',
        analysis.swing.points
          .filter((p) => p.drive !== 0)
          .map((p): [number, number] => [p.vaVolts, p.iaMilliamps]),
        {
          showSymbol: true,
          symbol: 'diamond',
          symbolSize: 8,
          lineStyle: { width: 0 },
          itemStyle: { color: ink },
        },
      ),
    );
  }
  const q = analysis.quiescent;
  out.push(
    lineOverlay('analysis-quiescent', [[q.vaVolts, q.iaMilliamps]], {
      showSymbol: true,
      symbol: 'circle',
      symbolSize: 10,
      z: 6,
      itemStyle: { color: ink, borderColor: dark ? '#1c1b19' : '#fbf7f3', borderWidth: 2 },
      label: {
        show: true,
        position: 'left',
        formatter: 'Q',
        color: ink,
        fontFamily: MONO,
        fontSize: 11,
      },
    }),
  );
  return out;
}

/**
 * The anode dissipation limit Ia = Pa,max/Va from Va max up to the top of the current axis, or
 * null where it passes above the whole plot. Labelled at its upper end when that end is well
 * inside the plot (a label at the right edge would run into the legend).
 */
export function hyperbolaOverlay(
  paMaxWatts: number,
  vaMaxVolts: number,
  axisTopMilliamps: number,
  dark: boolean,
): ChartOverlay | null {
  const vaTop = (1000 * paMaxWatts) / axisTopMilliamps;
  if (!(vaTop > 0) || vaTop >= vaMaxVolts) return null;
  const { limit } = inkOf(dark);
  const data = dissipationHyperbola(paMaxWatts, vaTop, vaMaxVolts, 60)
    .reverse()
    .map((p): [number, number] => [p.vaVolts, p.iaMilliamps]);
  return lineOverlay('analysis-pa-max', data, {
    lineStyle: { color: limit, width: 1.5, type: [2, 3] },
    itemStyle: { color: limit },
    endLabel: {
      show: vaTop < 0.8 * vaMaxVolts,
      formatter: `Pa max ${Number(paMaxWatts.toPrecision(3))} W`,
      color: limit,
      fontFamily: MONO,
      fontSize: 11,
      distance: 6,
      offset: [0, 10],
    },
  });
}

/** Dashed model curves, one per measured grid voltage, over 0 to Va max. */
export function modelOverlays(
  model: KorenModel,
  vg1Volts: readonly number[],
  vg2Volts: number,
  vaMaxVolts: number,
  dark: boolean,
): ChartOverlay[] {
  const { model: colour } = inkOf(dark);
  const steps = 80;
  return vg1Volts.map((vg1, j) =>
    lineOverlay(
      `analysis-model-${j}`,
      Array.from({ length: steps + 1 }, (_, n): [number, number] => {
        const va = (vaMaxVolts * n) / steps;
        return [va, korenCurrents(model, va, vg1, vg2Volts).iaMilliamps];
      }),
      {
        z: 5,
        lineStyle: { color: colour, width: 1.25, type: [5, 4] },
        itemStyle: { color: colour },
      },
    ),
  );
}
