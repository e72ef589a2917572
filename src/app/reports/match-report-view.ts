import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatchReportChart } from './match-report-chart';
import { memberStyle } from './member-styles';
import { reportFigure, reportPercent } from './report-figure';
import type { MatchReportData, ReportConditions, ReportMember } from './reports-api';

const STATUS_LABELS: Record<string, string> = {
  reserved: 'Reserved',
  sold: 'Sold',
  released: 'Released to stock',
};

/** A member's row: its line style and readings in the order of the set's operating points. */
interface MemberRow {
  member: ReportMember;
  colour: string;
  /** SVG stroke-dasharray of its line. */
  dash: string;
  grade: string;
  cells: { ia: string; gm: string; vg1: string }[];
  conditions: { va: string; vg1: string; vg2: string; heater: string } | null;
}

/**
 * A match report: heading, members with their readings, conditions of measurement, spreads
 * against the tolerance, the members' anode curves overlaid, and the notes and cautions. Used
 * by the printable page and by the buyer's page, from one shape.
 */
@Component({
  selector: 'app-match-report-view',
  imports: [DatePipe, MatchReportChart],
  templateUrl: './match-report-view.html',
  styleUrl: './match-report-view.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class MatchReportView {
  readonly report = input.required<MatchReportData>();

  protected readonly figure = reportFigure;
  protected readonly percent = reportPercent;

  protected readonly statusLabel = computed(
    () => STATUS_LABELS[this.report().status] ?? this.report().status,
  );
  /** Operating points of section 1, in the order every member's readings follow. */
  protected readonly points = computed(() =>
    this.report().figures.points.filter((p) => p.section === 1),
  );
  protected readonly hasSection2 = computed(() =>
    this.report().figures.points.some((p) => p.section === 2),
  );
  protected readonly rows = computed<MemberRow[]>(() =>
    this.report().members.map((member, i) => {
      const style = memberStyle(i);
      return {
        member,
        colour: style.colour,
        dash: style.dash.join(' '),
        grade: member.grade
          ? `${member.grade}${member.gradePercent === null ? '' : ` (${Math.round(member.gradePercent)} %)`}`
          : '–',
        cells: this.points().map((p) => {
          const r = member.readings.find((x) => x.label === p.label);
          return {
            ia: reportFigure(r?.iaMilliamps),
            gm: reportFigure(r?.gmMicrosiemens, 5),
            vg1: reportFigure(r?.vg1Volts, 3),
          };
        }),
        conditions: member.conditions && conditionCells(member.conditions),
      };
    }),
  );
  /** Grid voltages of the curves, most current first. */
  protected readonly curveGrids = computed(() => {
    const all = this.report().members.flatMap((m) => m.curves.map((c) => c.vg1Volts));
    return [...new Set(all)].sort((a, b) => b - a).map((v) => reportFigure(v, 3));
  });
}

function conditionCells(c: ReportConditions) {
  const grids = [...c.vg1Volts].sort((a, b) => b - a);
  const vg1 =
    grids.length <= 5
      ? grids.map((v) => reportFigure(v, 3)).join(', ')
      : `${reportFigure(grids[0], 3)} to ${reportFigure(grids.at(-1), 3)}, ${grids.length} curves`;
  return {
    va: `${reportFigure(c.vaStartVolts)} to ${reportFigure(c.vaStopVolts)}, step ${reportFigure(c.vaStepVolts)}`,
    vg1,
    vg2: c.vg2Volts > 0 ? reportFigure(c.vg2Volts) : '–',
    heater: reportFigure(c.heaterVolts, 3),
  };
}
