import { DatePipe } from '@angular/common';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  effect,
  inject,
  input,
  signal,
  untracked,
} from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { RouterLink } from '@angular/router';
import { apiErrorMessage } from '../core/api-error-message';
import { Auth } from '../core/auth';
import { NominalCurveChart, type DrawnCurve } from './nominal-curve-chart';
import { NominalUpload } from './nominal-upload';
import { TypesApi, type NominalCurves, type TypeView } from './types-api';

/** A row of the ratings table. */
interface RatingRow {
  name: string;
  value: number | null;
  unit: string;
}

/** One type of the library: heater, operating points, ratings, model, nominal curves, sources. */
@Component({
  selector: 'app-type-detail',
  imports: [
    DatePipe,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    NominalCurveChart,
    NominalUpload,
    ReactiveFormsModule,
    RouterLink,
  ],
  templateUrl: './type-detail.html',
  styleUrl: './type-detail.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TypeDetail {
  /** Route parameter. */
  readonly designation = input.required<string>();

  private readonly api = inject(TypesApi);
  protected readonly auth = inject(Auth);
  protected readonly type = signal<TypeView | null>(null);
  protected readonly nominal = signal<NominalCurves | null>(null);
  protected readonly error = signal<string | null>(null);
  protected readonly editing = signal(false);
  protected readonly editMessage = signal<string | null>(null);

  private readonly fb = inject(NonNullableFormBuilder);
  protected readonly form = this.fb.group({
    base: ['', Validators.required],
    heaterVolts: [0, [Validators.required, Validators.min(0.1)]],
    heaterAmps: [0, [Validators.required, Validators.min(0.01)]],
    vaMaxVolts: [0, [Validators.required, Validators.min(1)]],
    paMaxWatts: [0, [Validators.required, Validators.min(0.01)]],
    ratingsSource: ['', Validators.required],
    ratingsConfidence: [''],
    notes: [''],
  });

  protected readonly ratingRows = computed<RatingRow[]>(() => {
    const r = this.type()?.ratings;
    if (!r) return [];
    return [
      { name: 'Va max', value: r.vaMaxVolts, unit: 'V' },
      { name: 'Vg2 max', value: r.vg2MaxVolts, unit: 'V' },
      { name: 'Pa max', value: r.paMaxWatts, unit: 'W' },
      { name: 'Pg2 max', value: r.pg2MaxWatts, unit: 'W' },
      { name: 'Ik max', value: r.ikMaxMilliamps, unit: 'mA' },
      { name: 'Vhk max', value: r.vhkMaxVolts, unit: 'V' },
    ].filter((row) => row.value !== null);
  });
  protected readonly modelParams = computed(() =>
    Object.entries(this.type()?.model?.params ?? {}).map(([name, value]) => ({ name, value })),
  );
  protected readonly drawnNominal = computed<DrawnCurve[]>(() =>
    (this.nominal()?.curves ?? []).map((c) => ({
      vg1Volts: c.vg1Volts,
      points: c.points.map((p) => [p.vaVolts, p.iaMilliamps] as [number, number]),
    })),
  );

  constructor() {
    effect(() => {
      const designation = this.designation();
      untracked(() => this.load(designation));
    });
  }

  protected startEdit(): void {
    const t = this.type();
    if (!t) return;
    this.form.reset({
      base: t.base,
      heaterVolts: t.heaterVolts,
      heaterAmps: t.heaterAmps,
      vaMaxVolts: t.ratings.vaMaxVolts,
      paMaxWatts: t.ratings.paMaxWatts,
      ratingsSource: t.ratings.source,
      ratingsConfidence: t.ratings.confidence ?? '',
      notes: t.notes ?? '',
    });
    this.editMessage.set(null);
    this.editing.set(true);
  }

  protected saveEdit(): void {
    const t = this.type();
    if (!t || this.form.invalid) return;
    const v = this.form.getRawValue();
    this.api
      .update(t.designation, {
        base: v.base.trim(),
        heaterVolts: v.heaterVolts,
        heaterAmps: v.heaterAmps,
        ratings: {
          vaMaxVolts: v.vaMaxVolts,
          paMaxWatts: v.paMaxWatts,
          source: v.ratingsSource.trim(),
          confidence: v.ratingsConfidence.trim() || null,
        },
        notes: v.notes.trim() || null,
      })
      .subscribe({
        next: (updated) => {
          this.type.set(updated);
          this.editing.set(false);
        },
        error: (err: unknown) => this.editMessage.set(apiErrorMessage(err, 'Not saved.')),
      });
  }

  protected curvesSaved(curves: NominalCurves): void {
    this.nominal.set(curves);
  }

  private load(designation: string): void {
    this.api.get(designation).subscribe({
      next: (t) => {
        this.type.set(t);
        this.error.set(null);
      },
      error: (err: unknown) => this.error.set(apiErrorMessage(err, 'The type did not load.')),
    });
    this.api.nominalCurves(designation).subscribe({
      next: (n) => this.nominal.set(n),
      error: () => this.nominal.set(null),
    });
  }
}
