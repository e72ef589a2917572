import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { apiErrorMessage } from '../core/api-error-message';
import { ValveFieldsForm } from './valve-fields-form';
import { ValvesApi, type ValveView } from './valves-api';

/** What the dialog is opened with: the type library, for the type list. */
export interface CreateValveDialogData {
  types: readonly { designation: string }[];
}

/** Adds a valve record; closes with the created record. */
@Component({
  selector: 'app-create-valve-dialog',
  imports: [
    MatButtonModule,
    MatDialogModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    ReactiveFormsModule,
    ValveFieldsForm,
  ],
  template: `
    <h2 mat-dialog-title>New valve record</h2>
    <mat-dialog-content>
      <p class="hint">The label is generated from the workshop prefix when left empty.</p>
      <app-valve-fields-form [form]="form" [types]="data.types" />
      @if (error(); as message) {
        <p class="error" role="alert">{{ message }}</p>
      }
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button mat-button type="button" mat-dialog-close>Cancel</button>
      <button mat-flat-button type="button" (click)="save()" [disabled]="form.invalid || saving()">
        Add record
      </button>
    </mat-dialog-actions>
  `,
  styles: `
    .hint {
      margin-top: 0;
      color: var(--mat-sys-on-surface-variant);
    }
    .error {
      color: var(--mat-sys-error);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CreateValveDialog {
  private readonly api = inject(ValvesApi);
  private readonly ref = inject<MatDialogRef<CreateValveDialog, ValveView>>(MatDialogRef);
  protected readonly data = inject<CreateValveDialogData>(MAT_DIALOG_DATA);
  protected readonly form = ValveFieldsForm.build(inject(NonNullableFormBuilder));
  protected readonly saving = signal(false);
  protected readonly error = signal<string | null>(null);

  constructor() {
    this.form.controls.type.addValidators(Validators.required);
  }

  protected save(): void {
    if (this.form.invalid) return;
    this.saving.set(true);
    this.error.set(null);
    const fields = ValveFieldsForm.fields(this.form);
    this.api.create({ ...fields, type: this.form.controls.type.value }).subscribe({
      next: (valve) => this.ref.close(valve),
      error: (err: unknown) => {
        this.saving.set(false);
        this.error.set(apiErrorMessage(err, 'The record was not added.'));
      },
    });
  }
}
