import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { apiErrorMessage } from '../core/api-error-message';
import { MatchSetsApi, type SentReport } from './match-sets-api';

/** The set whose report is sent. */
export interface SendReportDialogData {
  setId: number;
  code: string;
}

/** Mails a set's report as a PDF to a buyer; closes with the mailing. */
@Component({
  selector: 'app-send-report-dialog',
  imports: [
    MatButtonModule,
    MatDialogModule,
    MatFormFieldModule,
    MatInputModule,
    ReactiveFormsModule,
  ],
  template: `
    <h2 mat-dialog-title>Send the report of {{ data.code }}</h2>
    <mat-dialog-content>
      <form [formGroup]="form" class="fields" (ngSubmit)="send()">
        <mat-form-field>
          <mat-label>Buyer’s e-mail</mat-label>
          <input matInput type="email" formControlName="to" autocomplete="email" />
          <mat-error>An e-mail address, e.g. name&#64;example.com</mat-error>
        </mat-form-field>
        <mat-form-field>
          <mat-label>Message (optional)</mat-label>
          <textarea matInput formControlName="message" rows="4"></textarea>
          <mat-hint
            >Empty: a short note naming the set. The report goes as a PDF attachment.</mat-hint
          >
        </mat-form-field>
      </form>
      @if (error(); as message) {
        <p class="error-text" role="alert">{{ message }}</p>
      }
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button mat-button type="button" mat-dialog-close>Cancel</button>
      <button mat-flat-button type="button" (click)="send()" [disabled]="form.invalid || sending()">
        {{ sending() ? 'Sending…' : 'Send report' }}
      </button>
    </mat-dialog-actions>
  `,
  styles: `
    .fields {
      display: flex;
      flex-direction: column;
      gap: 12px;
      min-width: min(440px, 80vw);
      padding-top: 4px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SendReportDialog {
  private readonly api = inject(MatchSetsApi);
  private readonly ref = inject<MatDialogRef<SendReportDialog, SentReport>>(MatDialogRef);
  protected readonly data = inject<SendReportDialogData>(MAT_DIALOG_DATA);
  protected readonly form = inject(NonNullableFormBuilder).group({
    to: ['', [Validators.required, Validators.email, Validators.maxLength(200)]],
    message: ['', Validators.maxLength(4000)],
  });
  protected readonly sending = signal(false);
  protected readonly error = signal<string | null>(null);

  protected send(): void {
    if (this.form.invalid || this.sending()) return;
    this.sending.set(true);
    this.error.set(null);
    const { to, message } = this.form.getRawValue();
    this.api.sendReport(this.data.setId, to.trim(), message.trim() || undefined).subscribe({
      next: (sent) => this.ref.close(sent),
      error: (err: unknown) => {
        this.sending.set(false);
        this.error.set(apiErrorMessage(err, 'The report was not sent.'));
      },
    });
  }
}
