import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { ECharts } from 'echarts/core';
import { NgxEchartsDirective } from 'ngx-echarts';
import { REPORT_CHART_SIZE, reportChartOption } from './report-chart-option';
import type { ReportMember } from './reports-api';

/**
 * The members' anode curves overlaid, one colour and dash per valve. Drawn once as SVG at a
 * fixed size whose viewBox scales to the box, so the screen and the printed page show the same
 * crisp drawing without a resize at print time.
 */
@Component({
  selector: 'app-match-report-chart',
  imports: [NgxEchartsDirective],
  template: `
    <div
      echarts
      class="chart"
      [options]="option()"
      [initOpts]="initOpts"
      [autoResize]="false"
      (chartInit)="chartReady($event)"
      role="img"
      [attr.aria-label]="ariaLabel()"
    ></div>
  `,
  styles: `
    :host {
      display: block;
    }
    .chart {
      width: 100%;
      // REPORT_CHART_SIZE
      max-width: 680px;
      aspect-ratio: 680 / 380;
    }
    // ECharts sets its own px sizes on the inner box; the viewBox lets the drawing follow ours.
    .chart ::ng-deep > div,
    .chart ::ng-deep svg {
      width: 100% !important;
      height: 100% !important;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class MatchReportChart {
  readonly members = input.required<readonly ReportMember[]>();

  protected readonly initOpts = { renderer: 'svg' as const, ...REPORT_CHART_SIZE };
  protected readonly option = computed(() => reportChartOption(this.members()));
  protected readonly ariaLabel = computed(
    () =>
      `Anode curves, Ia against Va, of ${this.members()
        .map((m) => m.label)
        .join(', ')}`,
  );

  protected chartReady(chart: ECharts): void {
    // ECharts' live SVG has a fixed width and height but no viewBox: without one, CSS can only
    // crop the drawing, not scale it to a narrow screen.
    const fit = () => {
      const svg = chart.isDisposed() ? null : chart.getDom().querySelector('svg');
      svg?.setAttribute('viewBox', `0 0 ${REPORT_CHART_SIZE.width} ${REPORT_CHART_SIZE.height}`);
    };
    chart.on('finished', fit);
    fit();
  }
}
