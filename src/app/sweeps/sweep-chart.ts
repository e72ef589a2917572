import {
  ChangeDetectionStrategy,
  Component,
  computed,
  DestroyRef,
  effect,
  inject,
  input,
  untracked,
} from '@angular/core';
import type { ECharts, EChartsCoreOption } from 'echarts/core';
import { NgxEchartsDirective } from 'ngx-echarts';
import type { SweepKind, SweepPlan, SweepPoint } from '../../../shared/domain/sweep';
import { Theme } from '../core/theme';
import { sweepSeries } from './sweep-series';

/** How often new points reach the chart, ms: often enough to look live, rarely enough to be cheap. */
export const CHART_BATCH_MS = 100;

/**
 * Anode curves of a sweep (Ia and dashed Ig2 against Va, one line per Vg1 step; Ia against Vg1
 * for a transfer curve). Used live on the bench page and static on a sweep's page.
 *
 * The [options] binding carries only axes and styling: a new object there rebuilds the chart.
 * Points go straight to the chart instance, batched, with stable series ids.
 */
@Component({
  selector: 'app-sweep-chart',
  imports: [NgxEchartsDirective],
  template: `
    <div
      echarts
      class="chart"
      [options]="baseOptions()"
      [initOpts]="initOpts"
      (chartInit)="chartReady($event)"
      role="img"
      [attr.aria-label]="ariaLabel()"
    ></div>
    @if (!points().length) {
      <p class="empty">{{ emptyText() }}</p>
    }
  `,
  styles: `
    :host {
      display: block;
      position: relative;
    }
    .chart {
      height: var(--sweep-chart-height, 420px);
    }
    .empty {
      position: absolute;
      inset: 0;
      display: grid;
      place-items: center;
      margin: 0;
      color: var(--mat-sys-on-surface-variant);
      font: var(--mat-sys-body-large);
      pointer-events: none;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SweepChart {
  readonly plan = input.required<SweepPlan>();
  readonly points = input<readonly SweepPoint[]>([]);
  /** Text over the empty chart. */
  readonly emptyText = input('No points yet');

  private readonly theme = inject(Theme);
  private chart: ECharts | null = null;
  private timer: ReturnType<typeof setTimeout> | null = null;
  /** Series ids on the chart now; a different set needs replaceMerge. */
  private shownIds = '';

  protected readonly initOpts = { renderer: 'svg' as const };
  protected readonly baseOptions = computed(() =>
    baseChartOptions(this.plan().kind, this.plan(), this.theme.dark()),
  );
  protected readonly ariaLabel = computed(() => {
    const kind = this.plan().kind === 'transfer' ? 'Transfer curve' : 'Anode curves';
    return `${kind}, ${this.points().length} points`;
  });

  constructor() {
    effect(() => {
      this.baseOptions();
      // ngx-echarts applies new base options with notMerge, which drops our series.
      this.shownIds = '';
      this.scheduleFlush();
    });
    effect(() => {
      this.points();
      this.scheduleFlush();
    });
    inject(DestroyRef).onDestroy(() => {
      if (this.timer) clearTimeout(this.timer);
      this.chart = null;
    });
  }

  protected chartReady(chart: ECharts): void {
    this.chart = chart;
    this.shownIds = '';
    // ngx-echarts emits chartInit before it applies [options]: series must wait for the axes.
    this.scheduleFlush();
  }

  private scheduleFlush(): void {
    if (this.timer) return;
    this.timer = setTimeout(() => {
      this.timer = null;
      this.flush();
    }, CHART_BATCH_MS);
  }

  private flush(): void {
    const chart = this.chart;
    if (!chart || chart.isDisposed()) return;
    const series = sweepSeries(untracked(this.plan), untracked(this.points), this.theme.dark());
    const ids = series.map((s) => s.id).join(',');
    const curvesChanged = ids !== this.shownIds;
    chart.setOption(
      { series, legend: { data: [...new Set(series.map((s) => s.name))] } },
      curvesChanged ? { replaceMerge: ['series'], lazyUpdate: true } : { lazyUpdate: true },
    );
    this.shownIds = ids;
  }
}

function baseChartOptions(kind: SweepKind, plan: SweepPlan, dark: boolean): EChartsCoreOption {
  const text = dark ? '#cbc6be' : '#4a4641';
  const faint = dark ? 'rgba(255,255,255,0.08)' : 'rgba(0,0,0,0.08)';
  const axisLine = dark ? 'rgba(255,255,255,0.28)' : 'rgba(0,0,0,0.35)';
  const mono = "'JetBrains Mono', ui-monospace, monospace";
  const valueAxis = (name: string) => ({
    type: 'value',
    name,
    nameLocation: 'middle',
    nameGap: 32,
    nameTextStyle: { color: text, fontSize: 13 },
    axisLabel: { color: text, fontFamily: mono, fontSize: 11 },
    axisLine: { show: true, lineStyle: { color: axisLine } },
    axisTick: { show: true, lineStyle: { color: axisLine } },
    splitLine: { lineStyle: { color: faint } },
  });
  const vg1 = plan.vg1Volts.length ? plan.vg1Volts : [0];
  const x =
    kind === 'transfer'
      ? { ...valueAxis('Vg1 (V)'), min: Math.min(...vg1), max: Math.max(...vg1) }
      : { ...valueAxis('Va (V)'), min: 0, max: Math.max(plan.vaStopVolts, 1) };
  return {
    backgroundColor: 'transparent',
    animation: false,
    textStyle: { fontFamily: 'Roboto, system-ui, sans-serif', color: text },
    grid: { left: 56, right: 128, top: 24, bottom: 48 },
    // Beside the plot, top to bottom like the curves: Vg1 = 0 V first.
    legend: {
      type: 'scroll',
      orient: 'vertical',
      right: 0,
      top: 16,
      bottom: 40,
      textStyle: { color: text, fontFamily: mono, fontSize: 11 },
      pageTextStyle: { color: text },
      icon: 'roundRect',
      itemWidth: 14,
      itemHeight: 4,
    },
    tooltip: {
      trigger: 'axis',
      axisPointer: { type: 'cross', label: { fontFamily: mono } },
      textStyle: { fontFamily: mono, fontSize: 12 },
      valueFormatter: (v: unknown) => (typeof v === 'number' ? `${v.toFixed(3)} mA` : String(v)),
    },
    xAxis: x,
    yAxis: { ...valueAxis(plan.vg2Volts > 0 ? 'Ia, Ig2 (mA)' : 'Ia (mA)'), nameGap: 40, min: 0 },
    series: [],
  };
}
