import {
  ChangeDetectionStrategy,
  Component,
  computed,
  DestroyRef,
  effect,
  inject,
  input,
  output,
  untracked,
} from '@angular/core';
import type { ECharts, EChartsCoreOption } from 'echarts/core';
import { NgxEchartsDirective } from 'ngx-echarts';
import type { SweepKind, SweepPlan, SweepPoint } from '../../../shared/domain/sweep';
import { Theme } from '../core/theme';
import { sweepSeries } from './sweep-series';

/** How often new points reach the chart, ms: often enough to look live, rarely enough to be cheap. */
export const CHART_BATCH_MS = 100;

/** A place on the anode plane under the pointer: Va in V, Ia in mA. */
export interface ChartPoint {
  /** Anode voltage, V. */
  vaVolts: number;
  /** Anode current, mA. */
  iaMilliamps: number;
}

/**
 * An extra series drawn over the measured curves (load lines, markers, model curves): an ECharts
 * series option with a stable id. Overlays stay out of the legend unless they have a `name`
 * (overlays sharing a name share one entry); with [crosshair] or [fitReadings] on, the readings
 * alone set the current axis.
 */
export type ChartOverlay = { id: string } & Record<string, unknown>;

/**
 * Anode curves of a sweep (Ia and dashed Ig2 against Va, one line per Vg1 step; Ia against Vg1
 * for a transfer curve). Used live on the bench page and static on a sweep's page.
 *
 * The [options] binding carries only axes and styling: a new object there rebuilds the chart.
 * Points go straight to the chart instance, batched, with stable series ids.
 *
 * With [crosshair] on, the tooltip box gives way to a readout kept by the host: the chart reports
 * where the pointer is over the plot (cursorMove, null when it leaves) and where it was clicked
 * (pointPick), in volts and milliamps.
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
  /** Series drawn over the curves, e.g. a load line. */
  readonly overlays = input<readonly ChartOverlay[]>([]);
  /** Report the pointer's place instead of showing the tooltip box. */
  readonly crosshair = input(false);
  /** Let the readings alone set the current axis (overlays beyond it are clipped). */
  readonly fitReadings = input(false);
  /** Mark every Ia reading with a dot (for comparing the readings with a model). */
  readonly showReadings = input(false);
  /** The pointer's place over the plot, or null when it leaves the plot. */
  readonly cursorMove = output<ChartPoint | null>();
  /** A click on the plot. */
  readonly pointPick = output<ChartPoint>();

  private readonly theme = inject(Theme);
  private chart: ECharts | null = null;
  private timer: ReturnType<typeof setTimeout> | null = null;
  /** Series ids on the chart now; a different set needs replaceMerge. */
  private shownIds = '';

  protected readonly initOpts = { renderer: 'svg' as const };
  protected readonly baseOptions = computed(() =>
    baseChartOptions(this.plan().kind, this.plan(), this.theme.dark(), this.crosshair()),
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
      this.overlays();
      this.showReadings();
      this.fitReadings();
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
    const zr = chart.getZr();
    zr.on('mousemove', (e) => {
      if (untracked(this.crosshair)) this.cursorMove.emit(this.plotPoint(e.offsetX, e.offsetY));
    });
    zr.on('globalout', () => {
      if (untracked(this.crosshair)) this.cursorMove.emit(null);
    });
    zr.on('click', (e) => {
      const at = untracked(this.crosshair) ? this.plotPoint(e.offsetX, e.offsetY) : null;
      if (at) this.pointPick.emit(at);
    });
    // ngx-echarts emits chartInit before it applies [options]: series must wait for the axes.
    this.scheduleFlush();
  }

  /** Va and Ia at a pixel of the chart, or null outside the plot. */
  private plotPoint(x: number, y: number): ChartPoint | null {
    const chart = this.chart;
    if (!chart || chart.isDisposed() || !chart.containPixel({ gridIndex: 0 }, [x, y])) return null;
    const [va, ia] = chart.convertFromPixel({ gridIndex: 0 }, [x, y]) as number[];
    return Number.isFinite(va) && Number.isFinite(ia) ? { vaVolts: va, iaMilliamps: ia } : null;
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
    const points = untracked(this.points);
    const measured = sweepSeries(untracked(this.plan), points, this.theme.dark());
    const dots = untracked(this.showReadings);
    const series = [
      ...(dots
        ? measured.map((s) =>
            s.id.startsWith('ia-') ? { ...s, showSymbol: true, symbolSize: 3 } : s,
          )
        : measured),
      ...untracked(this.overlays),
    ];
    const named = untracked(this.overlays)
      .map((o) => o['name'])
      .filter((n): n is string => typeof n === 'string');
    const ids = series.map((s) => s.id).join(',');
    const curvesChanged = ids !== this.shownIds;
    const option: EChartsCoreOption = {
      series,
      legend: { data: [...new Set([...measured.map((s) => s.name), ...named])] },
    };
    // Overlays such as a load line reach far above the curves: the readings set the scale.
    if (untracked(this.crosshair) || untracked(this.fitReadings)) {
      option['yAxis'] = { max: currentAxisMax(points) };
    }
    chart.setOption(
      option,
      curvesChanged ? { replaceMerge: ['series'], lazyUpdate: true } : { lazyUpdate: true },
    );
    this.shownIds = ids;
  }
}

/** Top of the current axis, mA: a round figure just above the largest reading (null: automatic). */
export function currentAxisMax(points: readonly SweepPoint[]): number | null {
  let top = 0;
  for (const p of points) top = Math.max(top, p.iaMilliamps, p.ig2Milliamps);
  if (!(top > 0)) return null;
  const target = top * 1.04;
  const decade = 10 ** Math.floor(Math.log10(target));
  const step =
    [1, 1.2, 1.5, 2, 2.5, 3, 3.5, 4, 5, 6, 7, 8, 10].find((m) => m * decade >= target) ?? 10;
  return step * decade;
}

function baseChartOptions(
  kind: SweepKind,
  plan: SweepPlan,
  dark: boolean,
  crosshair: boolean,
): EChartsCoreOption {
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
      // Long overlay names (a nominal curve's source) wrap within the legend's column.
      textStyle: {
        color: text,
        fontFamily: mono,
        fontSize: 11,
        width: 100,
        overflow: 'break',
        lineHeight: 13,
      },
      pageTextStyle: { color: text },
      icon: 'roundRect',
      itemWidth: 14,
      itemHeight: 4,
    },
    tooltip: crosshair
      ? // The host's readout replaces the box: a free cross-hair, not snapped to readings.
        { trigger: 'none', showContent: false }
      : {
          trigger: 'axis',
          axisPointer: { type: 'cross', label: { fontFamily: mono } },
          textStyle: { fontFamily: mono, fontSize: 12 },
          valueFormatter: (v: unknown) =>
            typeof v === 'number' ? `${v.toFixed(3)} mA` : String(v),
        },
    xAxis: crosshair ? { ...x, axisPointer: freePointer(1) } : x,
    yAxis: {
      ...valueAxis(plan.vg2Volts > 0 ? 'Ia, Ig2 (mA)' : 'Ia (mA)'),
      nameGap: 40,
      min: 0,
      ...(crosshair ? { axisPointer: freePointer(3) } : {}),
    },
    series: [],
  };
}

/** An axis pointer that follows the mouse freely and labels the axis with `precision` decimals. */
function freePointer(precision: number) {
  return {
    show: true,
    type: 'line',
    snap: false,
    triggerTooltip: false,
    lineStyle: { type: 'dashed', width: 1 },
    label: { show: true, precision, fontFamily: "'JetBrains Mono', ui-monospace, monospace" },
  };
}
