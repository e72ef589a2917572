import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule } from '@angular/material/dialog';

/** What the confirmation names: the record and what stays after it. */
export interface DeleteValveDialogData {
  label: string;
  type: string;
  sweepCount: number;
  quickTestCount: number;
}

/** Asks an admin to confirm deleting a valve record; closes with true to delete. */
@Component({
  selector: 'app-delete-valve-dialog',
  imports: [MatButtonModule, MatDialogModule],
  template: `
    <h2 mat-dialog-title>Delete {{ data.label }}?</h2>
    <mat-dialog-content>
      <p>
        The record of the {{ data.type }} labelled <strong>{{ data.label }}</strong> goes, with its
        photos. This cannot be undone.
      </p>
      <p class="muted">
        Its {{ data.sweepCount }} {{ data.sweepCount === 1 ? 'sweep' : 'sweeps' }} and
        {{ data.quickTestCount }} {{ data.quickTestCount === 1 ? 'quick test' : 'quick tests' }}
        stay in the sweep list and the audit, no longer on a record.
      </p>
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button mat-button type="button" [mat-dialog-close]="false">Keep the record</button>
      <button mat-flat-button type="button" class="danger" [mat-dialog-close]="true">
        Delete {{ data.label }}
      </button>
    </mat-dialog-actions>
  `,
  styles: `
    .muted {
      color: var(--mat-sys-on-surface-variant);
    }
    .danger {
      --mat-button-filled-container-color: var(--mat-sys-error);
      --mat-button-filled-label-text-color: var(--mat-sys-on-error);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class DeleteValveDialog {
  protected readonly data = inject<DeleteValveDialogData>(MAT_DIALOG_DATA);
}
