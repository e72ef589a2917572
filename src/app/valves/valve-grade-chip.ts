import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { QuickTestGradeName, HardFail } from '../../../shared/grading/grade-quick-test';
import type { ValveGrade } from '../../../shared/grading/grade-thresholds';
import { GRADE_LABELS, HARD_FAIL_LABELS } from './valve-labels';

/**
 * A valve's grade as a coloured chip with its word and percentage: colour is never the only
 * sign, so the word stays. A fault a quick test found (short, gas...) shows as a failed chip
 * without a percentage; ungraded valves show a neutral chip.
 */
@Component({
  selector: 'app-valve-grade-chip',
  template: `<span class="chip" [class]="'chip grade-' + tone()">
    <span class="dot" aria-hidden="true"></span>{{ text() }}
  </span>`,
  styles: `
    .chip {
      display: inline-flex;
      align-items: center;
      gap: 6px;
      padding: 2px 10px;
      border-radius: 999px;
      font: var(--mat-sys-label-large);
      white-space: nowrap;
      border: 1px solid currentColor;
    }
    .dot {
      width: 8px;
      height: 8px;
      border-radius: 50%;
      background: currentColor;
    }
    .grade-strong {
      color: light-dark(#1b6b3a, #7fd89b);
      background: light-dark(#e3f4e8, #163323);
    }
    .grade-fair {
      color: light-dark(#7a5600, #f0c15a);
      background: light-dark(#fbf0d4, #3a2e10);
    }
    .grade-weak {
      color: light-dark(#a3261b, #ff9d8f);
      background: light-dark(#fde4e0, #451a15);
    }
    .grade-fail {
      color: light-dark(#fff, #2b0a06);
      background: light-dark(#a3261b, #ff9d8f);
      border-color: light-dark(#a3261b, #ff9d8f);
    }
    .grade-none {
      color: var(--mat-sys-on-surface-variant);
      background: transparent;
      border-style: dashed;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ValveGradeChip {
  /** A quality grade, a quick test's fault, or null for none. */
  readonly grade = input<QuickTestGradeName | null>(null);
  /** The graded figure as % of nominal. */
  readonly percent = input<number | null>(null);

  protected readonly tone = computed(() => {
    const grade = this.grade();
    if (grade === null || grade === 'incomplete') return 'none';
    return grade in GRADE_LABELS ? grade : 'fail';
  });
  protected readonly text = computed(() => {
    const grade = this.grade();
    if (!grade) return 'Not graded';
    if (grade === 'incomplete') return 'Incomplete';
    if (!(grade in GRADE_LABELS)) return HARD_FAIL_LABELS[grade as HardFail];
    const percent = this.percent();
    return percent === null
      ? GRADE_LABELS[grade as ValveGrade]
      : `${GRADE_LABELS[grade as ValveGrade]} · ${Math.round(percent)} %`;
  });
}
