import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import {
  FormControl,
  NonNullableFormBuilder,
  ReactiveFormsModule,
  Validators,
} from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { RouterLink } from '@angular/router';
import { startWith } from 'rxjs';
import { apiErrorMessage } from '../core/api-error-message';
import { LIMIT_FIELDS } from './quick-test-limit-fields';
import { SettingsApi, type QuickTestLimits, type WorkshopSettingsView } from './settings-api';

/** The workshop's label scheme and quick-test limits (admin); grade thresholds live with Types. */
@Component({
  selector: 'app-workshop-settings',
  imports: [MatButtonModule, MatFormFieldModule, MatInputModule, ReactiveFormsModule, RouterLink],
  templateUrl: './workshop-settings.html',
  styleUrl: './workshop-settings.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class WorkshopSettings {
  private readonly api = inject(SettingsApi);
  private readonly fb = inject(NonNullableFormBuilder);
  protected readonly fields = LIMIT_FIELDS;
  protected readonly loaded = signal<WorkshopSettingsView | null>(null);
  protected readonly error = signal<string | null>(null);
  protected readonly labelMessage = signal<string | null>(null);
  protected readonly limitMessage = signal<string | null>(null);

  protected readonly labels = this.fb.group({
    labelPrefix: ['V', [Validators.required, Validators.pattern(/^[A-Za-z0-9]{1,8}$/)]],
    labelDigits: [4, [Validators.required, Validators.min(3), Validators.max(8)]],
    nextLabelNumber: [1, [Validators.required, Validators.min(1), Validators.max(99_999_999)]],
  });

  protected readonly limits = this.fb.group(
    Object.fromEntries(
      LIMIT_FIELDS.map((f) => [
        f.key,
        this.fb.control(0, [Validators.required, Validators.min(f.min), Validators.max(f.max)]),
      ]),
    ) as Record<keyof QuickTestLimits, FormControl<number>>,
  );

  private readonly labelValue = toSignal(
    this.labels.valueChanges.pipe(startWith(this.labels.getRawValue())),
  );

  /** The label the next new record gets, as the form stands. */
  protected readonly nextLabel = computed(() => {
    const v = this.labelValue();
    if (!v || this.labels.invalid) return null;
    const digits = Number(v.labelDigits);
    return `${String(v.labelPrefix).toUpperCase()}-${String(v.nextLabelNumber).padStart(digits, '0')}`;
  });

  constructor() {
    this.api.get().subscribe({
      next: (s) => this.show(s),
      error: (err: unknown) =>
        this.error.set(apiErrorMessage(err, 'The workshop settings did not load.')),
    });
  }

  protected saveLabels(): void {
    this.labelMessage.set(null);
    this.api.save(this.labels.getRawValue()).subscribe({
      next: (s) => {
        this.show(s);
        this.labelMessage.set('Saved.');
      },
      error: (err: unknown) => this.labelMessage.set(apiErrorMessage(err, 'Not saved.')),
    });
  }

  protected saveLimits(): void {
    this.limitMessage.set(null);
    const v: QuickTestLimits = this.limits.getRawValue();
    if (v.shortMinMicroamps <= Math.max(v.leakageMaxMicroamps, v.electrodeLeakageMaxMicroamps)) {
      this.limitMessage.set('"Short from" must be above both leakage limits.');
      return;
    }
    this.api.save({ quickTestLimits: v }).subscribe({
      next: (s) => {
        this.show(s);
        this.limitMessage.set('Saved. Quick tests started from now on use these limits.');
      },
      error: (err: unknown) => this.limitMessage.set(apiErrorMessage(err, 'Not saved.')),
    });
  }

  private show(s: WorkshopSettingsView): void {
    this.loaded.set(s);
    this.labels.reset({
      labelPrefix: s.labelPrefix,
      labelDigits: s.labelDigits,
      nextLabelNumber: s.nextLabelNumber,
    });
    this.limits.reset(s.quickTestLimits);
  }
}
