import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import type { EChartsCoreOption } from 'echarts/core';
import { NgxEchartsDirective } from 'ngx-echarts';
import { Theme } from '../core/theme';
import type { TrendPoint } from './trend-points';

/** Marker of a point by what measured it. */
const SYMBOLS = { sweep: 'circle', 'quick-test': 'diamond' } as const;

/**
 * gm (mA/V) and Ia (mA) of a valve at its type's reference point over time, from its sweeps
 * (circles) and quick tests (diamonds). The data change only when the record is reloaded, so a
 * new [options] object is fine here.
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
        [attr.aria-label]="summary()"
      ></div>
      <p class="note">
        <span aria-hidden="true">●</span> sweep (interpolated on the measured family)
        <span aria-hidden="true" class="gap">◆</span> quick test (measured at the point)
        @if (nominal()) {
          <span class="gap">Dotted: the data sheet's figures at the point.</span>
        }
      </p>
    } @else {
      <p class="empty">
        No sweep or quick test of this valve has figures at the reference point yet.
      </p>
    }
  `,
  styles: `
    .chart {
      height: 280px;
    }
    .empty,
    .note {
      color: var(--mat-sys-on-surface-variant);
    }
    .note {
      margin: 4px 0 0;
      font: var(--mat-sys-body-small);
    }
    .gap {
      margin-left: 16px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ValveTrendChart {
  /** Oldest first. */
  readonly points = input<readonly TrendPoint[]>([]);
  /** The data sheet's gm (mA/V) and Ia (mA) at the reference point, drawn as faint lines. */
  readonly nominal = input<{ gmMilliampsPerVolt: number | null; iaMilliamps: number } | null>(null);
  private readonly theme = inject(Theme);

  protected readonly initOpts = { renderer: 'svg' as const };
  /** The chart in words, for screen readers. */
  protected readonly summary = computed(() => {
    const points = this.points();
    const sweeps = points.filter((p) => p.source === 'sweep').length;
    const tests = points.length - sweeps;
    const newest = points.at(-1);
    const gm = newest?.gmMilliampsPerVolt;
    const ia = newest?.iaMilliamps;
    return (
      `Trend of gm and Ia over ${count(sweeps, 'sweep')} and ${count(tests, 'quick test')}` +
      (newest
        ? `; newest gm ${gm == null ? 'unknown' : round(gm) + ' mA/V'}, ` +
          `Ia ${ia == null ? 'unknown' : round(ia) + ' mA'}`
        : '')
    );
  });
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
      // From zero: a few per cent of drift must look like a few per cent, not a cliff.
      min: 0,
    });
    const points = this.points();
    const nominal = this.nominal();
    const span = points.length > 1 ? [points[0].at, points[points.length - 1].at] : [];
    /** A flat line at the data sheet's figure across the measured time span. */
    const nominalLine = (id: string, axis: number, colour: string, y: number | null) =>
      y === null || !span.length
        ? []
        : [
            {
              id,
              name: 'Data sheet',
              type: 'line',
              yAxisIndex: axis,
              color: colour,
              showSymbol: false,
              silent: true,
              lineStyle: { type: 'dotted', width: 1.5, opacity: 0.7 },
              data: span.map((at) => [at, y]),
              tooltip: { show: false },
            },
          ];
    const item = (p: TrendPoint, y: number | null) => ({
      value: [p.at, y === null ? null : round(y)],
      symbol: SYMBOLS[p.source],
      source: p.source === 'sweep' ? `sweep #${p.id}` : `quick test #${p.id}`,
    });
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
          name: 'gm (mA/V)',
          type: 'line',
          yAxisIndex: 0,
          color: gmColour,
          symbolSize: 8,
          data: points.map((p) => item(p, p.gmMilliampsPerVolt)),
        },
        {
          id: 'ia',
          name: 'Ia (mA)',
          type: 'line',
          yAxisIndex: 1,
          color: iaColour,
          symbolSize: 8,
          lineStyle: { type: 'dashed' },
          data: points.map((p) => item(p, p.iaMilliamps)),
        },
        ...nominalLine('gm-nominal', 0, gmColour, nominal?.gmMilliampsPerVolt ?? null),
        ...nominalLine('ia-nominal', 1, iaColour, nominal?.iaMilliamps ?? null),
      ],
    };
  });
}

function round(x: number): number {
  return Math.round(x * 1000) / 1000;
}

function count(n: number, what: string): string {
  return `${n} ${what}${n === 1 ? '' : 's'}`;
}
