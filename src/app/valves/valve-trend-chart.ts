import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import type { EChartsCoreOption } from 'echarts/core';
import { NgxEchartsDirective } from 'ngx-echarts';
import { Theme } from '../core/theme';
import type { SweepFigures } from './valves-api';

/**
 * gm (mA/V) and Ia (mA) of a valve at its type's reference point, sweep by sweep over time.
 * The data change only when the record is reloaded, so a new [options] object is fine here.
 */
@Component({
  selector: 'app-valve-trend-chart',
  imports: [NgxEchartsDirective],
  template: `
    @if (points().length) {
      <div
        echarts
        class="chart"
        [options]="options()"
        [initOpts]="initOpts"
        role="img"
        [attr.aria-label]="'Trend of gm and Ia over ' + points().length + ' sweeps'"
      ></div>
    } @else {
      <p class="empty">No sweep of this valve has figures at the reference point yet.</p>
    }
  `,
  styles: `
    .chart {
      height: 280px;
    }
    .empty {
      color: var(--mat-sys-on-surface-variant);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ValveTrendChart {
  readonly trend = input<readonly SweepFigures[]>([]);
  private readonly theme = inject(Theme);

  protected readonly initOpts = { renderer: 'svg' as const };
  protected readonly points = computed(() =>
    this.trend().filter((f) => f.gmMicrosiemens !== null || f.iaMilliamps !== null),
  );
  protected readonly options = computed<EChartsCoreOption>(() => {
    const dark = this.theme.dark();
    const text = dark ? '#cbc6be' : '#4a4641';
    const faint = dark ? 'rgba(255,255,255,0.08)' : 'rgba(0,0,0,0.08)';
    const mono = "'JetBrains Mono', ui-monospace, monospace";
    const gmColour = dark ? '#ff9f4a' : '#c8431f';
    const iaColour = dark ? '#3f95f2' : '#1f6fc4';
    const axis = (name: string, colour: string) => ({
      type: 'value',
      name,
      nameTextStyle: { color: colour },
      axisLabel: { color: text, fontFamily: mono, fontSize: 11 },
      axisLine: { show: true, lineStyle: { color: colour } },
      splitLine: { lineStyle: { color: faint } },
      scale: true,
    });
    const points = this.points();
    return {
      backgroundColor: 'transparent',
      animation: false,
      textStyle: { color: text },
      grid: { left: 56, right: 56, top: 40, bottom: 32 },
      legend: { top: 0, textStyle: { color: text } },
      tooltip: { trigger: 'axis', textStyle: { fontFamily: mono, fontSize: 12 } },
      xAxis: {
        type: 'time',
        axisLabel: { color: text, fontSize: 11 },
        splitLine: { show: false },
      },
      yAxis: [
        axis('gm (mA/V)', gmColour),
        { ...axis('Ia (mA)', iaColour), splitLine: { show: false } },
      ],
      series: [
        {
          id: 'gm',
          name: 'gm',
          type: 'line',
          yAxisIndex: 0,
          color: gmColour,
          symbolSize: 7,
          data: points.map((p) => [
            p.at,
            p.gmMicrosiemens === null ? null : round(p.gmMicrosiemens / 1000),
          ]),
        },
        {
          id: 'ia',
          name: 'Ia',
          type: 'line',
          yAxisIndex: 1,
          color: iaColour,
          symbolSize: 7,
          lineStyle: { type: 'dashed' },
          data: points.map((p) => [p.at, p.iaMilliamps === null ? null : round(p.iaMilliamps)]),
        },
      ],
    };
  });
}

function round(x: number): number {
  return Math.round(x * 1000) / 1000;
}
