import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { DEFAULT_GRADE_THRESHOLDS } from '../../../shared/grading/grade-thresholds';
import { apiErrorMessage } from '../core/api-error-message';
import { Auth } from '../core/auth';
import { TypesApi } from './types-api';

/** How grading works, the workshop's thresholds, and (for admins) a form to change them. */
@Component({
  selector: 'app-grade-settings',
  imports: [MatButtonModule, MatFormFieldModule, MatInputModule, ReactiveFormsModule],
  template: `
    <h2 class="panel-title">Grading against nominal</h2>
    <p>
      A valve is graded by its gm at its type's reference operating point (the first typical
      point), as a percentage of the data-sheet figure there: <strong>strong</strong> from
      {{ shown().strongMinPercent }}&nbsp;%, <strong>fair</strong> from
      {{ shown().fairMinPercent }}&nbsp;%, <strong>weak</strong> below. Its newest sweep or quick
      test decides; a fault a quick test finds (short, leakage, gas, worn cathode, open heater)
      fails it whatever its gm. Ia is shown beside gm but does not grade: data sheets and the
      published models disagree on Ia by up to 20 % at the same conditions, and gm is what falls
      as a cathode wears (common practice). Where a type publishes no gm, Ia grades instead.
    </p>
    <p class="muted">
      The defaults ({{ defaults.strongMinPercent }} % and {{ defaults.fairMinPercent }} %) follow
      common practice rather than any one source: data-sheet values are averages, new valves spread
      roughly 20-30 % around them, and a valve below about 60-70 % of nominal is usually replaced.
      The workshop can set its own thresholds; every grade shown afterwards uses them.
    </p>
    @if (auth.isAdmin()) {
      <form class="row" [formGroup]="form" (ngSubmit)="save()">
        <mat-form-field>
          <mat-label>Strong from</mat-label>
          <input matInput type="number" formControlName="strongMinPercent" />
          <span matTextSuffix>%</span>
        </mat-form-field>
        <mat-form-field>
          <mat-label>Fair from</mat-label>
          <input matInput type="number" formControlName="fairMinPercent" />
          <span matTextSuffix>%</span>
        </mat-form-field>
        <button mat-flat-button type="submit" [disabled]="form.invalid || form.pristine">
          Save thresholds
        </button>
        @if (message(); as m) {
          <span role="status">{{ m }}</span>
        }
      </form>
    }
  `,
  styles: `
    .muted {
      color: var(--mat-sys-on-surface-variant);
    }
    .row {
      display: flex;
      flex-wrap: wrap;
      align-items: center;
      gap: 12px;
    }
    mat-form-field {
      width: 150px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class GradeSettings {
  private readonly api = inject(TypesApi);
  protected readonly auth = inject(Auth);
  protected readonly defaults = DEFAULT_GRADE_THRESHOLDS;
  protected readonly shown = signal(DEFAULT_GRADE_THRESHOLDS);
  protected readonly message = signal<string | null>(null);
  protected readonly form = inject(NonNullableFormBuilder).group({
    strongMinPercent: [
      DEFAULT_GRADE_THRESHOLDS.strongMinPercent,
      [Validators.required, Validators.min(1), Validators.max(200)],
    ],
    fairMinPercent: [
      DEFAULT_GRADE_THRESHOLDS.fairMinPercent,
      [Validators.required, Validators.min(1), Validators.max(200)],
    ],
  });

  constructor() {
    this.api.settings().subscribe({
      next: (s) => {
        this.shown.set(s.gradeThresholds);
        this.form.reset(s.gradeThresholds);
      },
      error: () => this.message.set('The workshop settings did not load; defaults shown.'),
    });
  }

  protected save(): void {
    const t = this.form.getRawValue();
    if (t.strongMinPercent <= t.fairMinPercent) {
      this.message.set('"Strong from" must be above "Fair from".');
      return;
    }
    this.api.saveThresholds(t).subscribe({
      next: (s) => {
        this.shown.set(s.gradeThresholds);
        this.form.reset(s.gradeThresholds);
        this.message.set('Saved.');
      },
      error: (err: unknown) => this.message.set(apiErrorMessage(err, 'Not saved.')),
    });
  }
}
