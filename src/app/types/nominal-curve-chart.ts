import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import type { EChartsCoreOption } from 'echarts/core';
import { NgxEchartsDirective } from 'ngx-echarts';
import { Theme } from '../core/theme';
import { curveColour } from '../sweeps/curve-colours';

/** One nominal curve to draw: Vg1 in V, points as [Va V, Ia mA]. */
export interface DrawnCurve {
  vg1Volts: number;
  points: [number, number][];
}

/** Nominal anode curves (Ia against Va, one line per Vg1), as uploaded or being previewed. */
@Component({
  selector: 'app-nominal-curve-chart',
  imports: [NgxEchartsDirective],
  template: `<div
    echarts
    class="chart"
    [options]="options()"
    [initOpts]="initOpts"
    role="img"
    [attr.aria-label]="'Nominal anode curves, ' + curves().length + ' curves'"
  ></div>`,
  styles: `
    .chart {
      height: 340px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class NominalCurveChart {
  readonly curves = input<readonly DrawnCurve[]>([]);
  private readonly theme = inject(Theme);
  protected readonly initOpts = { renderer: 'svg' as const };

  protected readonly options = computed<EChartsCoreOption>(() => {
    const dark = this.theme.dark();
    const text = dark ? '#cbc6be' : '#4a4641';
    const faint = dark ? 'rgba(255,255,255,0.08)' : 'rgba(0,0,0,0.08)';
    const mono = "'JetBrains Mono', ui-monospace, monospace";
    const curves = [...this.curves()].sort((a, b) => b.vg1Volts - a.vg1Volts);
    const axis = (name: string) => ({
      type: 'value',
      name,
      nameLocation: 'middle',
      nameGap: 32,
      nameTextStyle: { color: text },
      axisLabel: { color: text, fontFamily: mono, fontSize: 11 },
      axisLine: { show: true },
      splitLine: { lineStyle: { color: faint } },
      min: 0,
    });
    return {
      backgroundColor: 'transparent',
      animation: false,
      textStyle: { color: text },
      grid: { left: 56, right: 110, top: 16, bottom: 48 },
      legend: {
        type: 'scroll',
        orient: 'vertical',
        right: 0,
        top: 8,
        textStyle: { color: text, fontFamily: mono, fontSize: 11 },
      },
      tooltip: { trigger: 'item', textStyle: { fontFamily: mono, fontSize: 12 } },
      xAxis: axis('Va (V)'),
      yAxis: { ...axis('Ia (mA)'), nameGap: 40 },
      series: curves.map((c, i) => ({
        id: `nominal-${c.vg1Volts}`,
        name: `Vg1 ${c.vg1Volts} V`,
        type: 'line',
        showSymbol: false,
        color: curveColour(i, curves.length, dark),
        data: c.points,
      })),
    };
  });
}

/**
 * The points of a nominal-curve CSV that the hub has accepted (va,vg1,ia[,ig2]), for drawing
 * the preview only: the hub's parser is the one that judges the file.
 */
export function curvesOfCsv(text: string): DrawnCurve[] {
  const byGrid = new Map<number, [number, number][]>();
  let header = true;
  for (const raw of text.replace(/^\uFEFF/, '').split(/\r\n|\n|\r/)) {
    const line = raw.trim();
    if (!line || line.startsWith('#')) continue;
    if (header) {
      header = false;
      continue;
    }
    const [va, vg1, ia] = line.split(',').map((c) => Number(c.trim().replace(/^"(.*)"$/, '$1')));
    if (![va, vg1, ia].every(Number.isFinite)) continue;
    const points = byGrid.get(vg1) ?? [];
    points.push([va, ia]);
    byGrid.set(vg1, points);
  }
  return [...byGrid].map(([vg1Volts, points]) => ({
    vg1Volts,
    points: points.sort((a, b) => a[0] - b[0]),
  }));
}
