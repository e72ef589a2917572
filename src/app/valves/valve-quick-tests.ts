import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { RouterLink } from '@angular/router';
import { figureText } from './family-figures';
import { ValveGradeChip } from './valve-grade-chip';
import type { QuickTestSummary } from './valves-api';

/** How a quick test ended without a grade, in a word. */
const ENDINGS: Record<QuickTestSummary['status'], string> = {
  pending: 'Waiting',
  running: 'Running',
  complete: 'Complete',
  aborted: 'Aborted',
  'link-lost': 'Link lost',
  failed: 'Failed',
};

/** A valve's quick tests, newest first: grade and reason, gm and Ia at the reference point. */
@Component({
  selector: 'app-valve-quick-tests',
  imports: [DatePipe, RouterLink, ValveGradeChip],
  template: `
    @if (rows().length) {
      <table class="tests" aria-label="Quick tests of this valve">
        <thead>
          <tr>
            <th scope="col">#</th>
            <th scope="col">Ended</th>
            <th scope="col">Grade</th>
            <th scope="col">Reason</th>
            <th scope="col" class="num">gm (mA/V)</th>
            <th scope="col" class="num">Ia (mA)</th>
            <th scope="col">Operator</th>
          </tr>
        </thead>
        <tbody>
          @for (r of rows(); track r.test.id) {
            <tr>
              <td class="readout">{{ r.test.id }}</td>
              <td class="readout">{{ r.test.at | date: 'yyyy-MM-dd HH:mm' }}</td>
              <td>
                @if (r.test.grade) {
                  <app-valve-grade-chip [grade]="r.test.grade" [percent]="r.test.percent" />
                } @else {
                  {{ r.ending }}
                }
              </td>
              <td class="reason">{{ r.test.reason ?? '' }}</td>
              <td class="num readout">{{ r.gm }}</td>
              <td class="num readout">{{ r.ia }}</td>
              <td>{{ r.test.operator }}</td>
            </tr>
          }
        </tbody>
      </table>
    } @else {
      <p class="muted">
        No quick tests of this valve yet: <a routerLink="/box-check">Box check</a> runs one on a
        bench by its label.
      </p>
    }
  `,
  styles: `
    :host {
      display: block;
      overflow-x: auto;
    }
    .tests {
      border-collapse: collapse;
      width: 100%;
    }
    th,
    td {
      padding: 6px 12px 6px 0;
      text-align: left;
      border-bottom: 1px solid var(--mat-sys-outline-variant);
      vertical-align: top;
    }
    .num {
      text-align: right;
    }
    .reason {
      max-width: 420px;
    }
    .muted {
      color: var(--mat-sys-on-surface-variant);
    }
    a {
      color: var(--mat-sys-primary);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ValveQuickTests {
  /** Newest first. */
  readonly tests = input<readonly QuickTestSummary[]>([]);

  protected readonly rows = computed(() =>
    this.tests().map((test) => ({
      test,
      ending: ENDINGS[test.status],
      gm: figureText(test.gmMicrosiemens === null ? null : test.gmMicrosiemens / 1000),
      ia: figureText(test.iaMilliamps),
    })),
  );
}
