import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { map, startWith } from 'rxjs';
import { hasScreen, type ValveClass } from '../../../shared/catalog/valve-types';
import { apiErrorBody, apiErrorMessage } from '../core/api-error-message';
import {
  buildNewTypeForm,
  CLASS_LABELS,
  fieldLabel,
  newTypeBody,
  newTypeProblems,
} from './new-type-form';
import { TypesApi, type TypeView } from './types-api';

/** Number fields of a section: control name, label and unit. */
type NumberField = readonly [name: string, label: string, unit: string];

/**
 * Adds a type to the library with its heater, reference operating point, maximum ratings and,
 * optionally, a published Koren model; every figure with its source. Closes with the new type.
 */
@Component({
  selector: 'app-new-type-dialog',
  imports: [
    MatButtonModule,
    MatCheckboxModule,
    MatDialogModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    ReactiveFormsModule,
  ],
  templateUrl: './new-type-dialog.html',
  styleUrl: './new-type-dialog.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class NewTypeDialog {
  private readonly api = inject(TypesApi);
  private readonly ref = inject<MatDialogRef<NewTypeDialog, TypeView>>(MatDialogRef);
  protected readonly form = buildNewTypeForm(inject(NonNullableFormBuilder));
  protected readonly classes = Object.entries(CLASS_LABELS) as [ValveClass, string][];
  protected readonly saving = signal(false);
  protected readonly error = signal<string | null>(null);
  /** The hub's word on each field it refused, e.g. "Reference point Va: above Va max 300 V". */
  protected readonly fieldErrors = signal<string[]>([]);

  private readonly values = toSignal(
    this.form.valueChanges.pipe(
      startWith(null),
      map(() => this.form.getRawValue()),
    ),
    { requireSync: true },
  );
  protected readonly screen = computed(() => hasScreen(this.values().valveClass));
  protected readonly withModel = computed(() => this.values().withModel);
  protected readonly problems = computed(() => {
    this.values();
    return newTypeProblems(this.form);
  });

  protected readonly pointFields = computed<NumberField[]>(() => [
    ['vaVolts', 'Va', 'V'],
    ...(this.screen() ? ([['vg2Volts', 'Vg2', 'V']] as const) : []),
    ['vg1Volts', 'Vg1', 'V'],
    ['iaMilliamps', 'Ia', 'mA'],
    ...(this.screen() ? ([['ig2Milliamps', 'Ig2', 'mA']] as const) : []),
    ['gmMilliampsPerVolt', 'gm', 'mA/V'],
    ['raKiloohms', 'ra', 'kΩ'],
    ['mu', 'mu', ''],
  ]);
  protected readonly ratingFields = computed<NumberField[]>(() => [
    ['vaMaxVolts', 'Va max', 'V'],
    ...(this.screen() ? ([['vg2MaxVolts', 'Vg2 max', 'V']] as const) : []),
    ['paMaxWatts', 'Pa max', 'W'],
    ...(this.screen() ? ([['pg2MaxWatts', 'Pg2 max', 'W']] as const) : []),
    ['vhkMaxVolts', 'Vhk max', 'V'],
  ]);
  protected readonly modelFields = computed<NumberField[]>(() => [
    ['modelMu', 'MU', ''],
    ['modelEx', 'EX', ''],
    ['modelKg1', 'KG1', ''],
    ['modelKp', 'KP', ''],
    ['modelKvb', 'KVB', ''],
    ...(this.screen() ? ([['modelKg2', 'KG2', '']] as const) : []),
  ]);

  protected save(): void {
    if (this.form.invalid || this.problems().length || this.saving()) return;
    this.saving.set(true);
    this.error.set(null);
    this.fieldErrors.set([]);
    this.api.create(newTypeBody(this.form)).subscribe({
      next: (type) => this.ref.close(type),
      error: (err: unknown) => {
        this.saving.set(false);
        const fields = Object.entries(apiErrorBody(err)?.fields ?? {});
        this.error.set(
          fields.length
            ? 'The type was not added:'
            : apiErrorMessage(err, 'The type was not added.'),
        );
        this.fieldErrors.set(fields.map(([path, why]) => `${fieldLabel(path)}: ${why}`));
      },
    });
  }
}
