import { ChangeDetectionStrategy, Component, inject, input, output, signal } from '@angular/core';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { apiErrorMessage } from '../core/api-error-message';
import { curvesOfCsv, NominalCurveChart, type DrawnCurve } from './nominal-curve-chart';
import { TypesApi, type NominalCurves, type NominalPreview } from './types-api';

/** Largest nominal-curve file the hub takes, bytes. */
export const NOMINAL_CSV_MAX_BYTES = 1024 * 1024;

/**
 * Uploads a type's nominal curves in two steps: the hub reads the CSV and reports the curves it
 * found (or the first bad line and why), the admin looks at the chart and the point counts,
 * names the source and only then saves, which replaces the stored curves.
 */
@Component({
  selector: 'app-nominal-upload',
  imports: [
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    NominalCurveChart,
    ReactiveFormsModule,
  ],
  template: `
    <p class="muted">
      CSV with the header <code>va,vg1,ia</code> or <code>va,vg1,ia,ig2</code> (V, V, mA, mA), one
      point a row, read off the data sheet; rows with the same Vg1 make one curve. At most 1 MiB.
    </p>
    <button mat-stroked-button type="button" (click)="picker.click()">
      <mat-icon svgIcon="upload" />Choose CSV…
    </button>
    <input
      #picker
      class="hidden-input"
      type="file"
      accept=".csv,text/csv,text/plain"
      aria-label="Nominal-curve CSV"
      (change)="choose(picker)"
    />
    @if (fileName(); as name) {
      <span class="file">{{ name }}</span>
    }
    @if (error(); as message) {
      <p class="error" role="alert">{{ message }}</p>
    }
    @if (preview(); as p) {
      <div class="preview" aria-label="Preview">
        <p>
          <strong>{{ p.curves.length }}</strong> curves,
          <strong>{{ p.pointCount }}</strong> points{{
            p.hasScreenCurrent ? ', with screen current' : ''
          }}. Nothing is saved yet.
        </p>
        <app-nominal-curve-chart [curves]="drawn()" />
        <table class="counts">
          <thead>
            <tr>
              <th class="num">Vg1 (V)</th>
              <th class="num">Points</th>
              <th class="num">Va from (V)</th>
              <th class="num">Va to (V)</th>
            </tr>
          </thead>
          <tbody>
            @for (c of p.curves; track c.vg1Volts) {
              <tr>
                <td class="num readout">{{ c.vg1Volts }}</td>
                <td class="num readout">{{ c.pointCount }}</td>
                <td class="num readout">{{ c.vaMinVolts }}</td>
                <td class="num readout">{{ c.vaMaxVolts }}</td>
              </tr>
            }
          </tbody>
        </table>
        <div class="save-row">
          <mat-form-field class="source">
            <mat-label>Source of the curves</mat-label>
            <input matInput [formControl]="source" placeholder="e.g. maker's data sheet, fig. 3" />
          </mat-form-field>
          <button
            mat-flat-button
            type="button"
            (click)="save()"
            [disabled]="!source.value.trim() || saving()"
          >
            Save curves
          </button>
          <button mat-button type="button" (click)="reset()">Discard</button>
        </div>
      </div>
    }
  `,
  styles: `
    .muted {
      color: var(--mat-sys-on-surface-variant);
    }
    .hidden-input {
      display: none;
    }
    .file {
      margin-left: 12px;
    }
    .error {
      color: var(--mat-sys-error);
      font-weight: 500;
    }
    .counts {
      border-collapse: collapse;
      margin: 8px 0;
      th,
      td {
        padding: 4px 12px;
        border-bottom: 1px solid var(--mat-sys-outline-variant);
        text-align: right;
      }
    }
    .save-row {
      display: flex;
      flex-wrap: wrap;
      align-items: center;
      gap: 12px;
    }
    .source {
      flex: 1 1 320px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class NominalUpload {
  readonly designation = input.required<string>();
  /** Emits the stored curves once saved. */
  readonly saved = output<NominalCurves>();

  private readonly api = inject(TypesApi);
  protected readonly fileName = signal<string | null>(null);
  protected readonly preview = signal<NominalPreview | null>(null);
  protected readonly drawn = signal<DrawnCurve[]>([]);
  protected readonly error = signal<string | null>(null);
  protected readonly saving = signal(false);
  protected readonly source = new FormControl('', { nonNullable: true });
  private text = '';

  protected choose(picker: HTMLInputElement): void {
    const file = picker.files?.[0];
    picker.value = '';
    if (!file) return;
    this.reset();
    this.fileName.set(file.name);
    if (file.size > NOMINAL_CSV_MAX_BYTES) {
      this.error.set(`${file.name} is larger than 1 MiB.`);
      return;
    }
    void file.text().then((text) => this.check(text));
  }

  /** Sends the text to the hub's preview; shows the chart or the line at fault. */
  check(text: string): void {
    this.text = text;
    this.api.previewNominal(this.designation(), text).subscribe({
      next: (preview) => {
        this.preview.set(preview);
        this.drawn.set(curvesOfCsv(text));
      },
      error: (err: unknown) =>
        this.error.set(apiErrorMessage(err, 'The hub could not read the file.')),
    });
  }

  protected save(): void {
    this.saving.set(true);
    this.api.saveNominal(this.designation(), this.text, this.source.value.trim()).subscribe({
      next: (curves) => {
        this.reset();
        this.saved.emit(curves);
      },
      error: (err: unknown) => {
        this.saving.set(false);
        this.error.set(apiErrorMessage(err, 'The curves were not saved.'));
      },
    });
  }

  protected reset(): void {
    this.preview.set(null);
    this.drawn.set([]);
    this.error.set(null);
    this.saving.set(false);
    this.fileName.set(null);
  }
}
