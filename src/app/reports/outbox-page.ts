import { DatePipe, DOCUMENT } from '@angular/common';
import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { apiErrorMessage } from '../core/api-error-message';
import { saveBlob } from '../core/save-blob';
import { ReportsApi, type DevMailAttachment, type DevMailMessage } from './reports-api';

/** Messages the list asks for at once. */
const OUTBOX_LIMIT = 100;

/** A size in bytes as people read it: B, kB, MB (1 kB = 1000 B). */
export function byteSize(bytes: number): string {
  if (bytes < 1000) return `${bytes} B`;
  if (bytes < 1_000_000) return `${(bytes / 1000).toFixed(bytes < 10_000 ? 1 : 0)} kB`;
  return `${(bytes / 1_000_000).toFixed(1)} MB`;
}

/**
 * What the development mail server received (demo mode), newest first: who sent what to whom,
 * a preview of the text and the attachments to download. Admins only, as the API is.
 */
@Component({
  selector: 'app-outbox-page',
  imports: [DatePipe, MatButtonModule, MatIconModule, MatProgressBarModule],
  templateUrl: './outbox-page.html',
  styleUrl: './outbox-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class OutboxPage {
  private readonly api = inject(ReportsApi);
  private readonly document = inject(DOCUMENT);
  private readonly snackBar = inject(MatSnackBar);

  protected readonly messages = signal<DevMailMessage[] | null>(null);
  protected readonly loading = signal(false);
  protected readonly error = signal<string | null>(null);
  protected readonly byteSize = byteSize;

  constructor() {
    this.reload();
  }

  protected reload(): void {
    this.loading.set(true);
    this.error.set(null);
    this.api.devMail(OUTBOX_LIMIT).subscribe({
      next: (messages) => {
        this.messages.set(messages);
        this.loading.set(false);
      },
      error: (err: unknown) => {
        this.error.set(apiErrorMessage(err, 'The outbox could not be read.'));
        this.loading.set(false);
      },
    });
  }

  protected downloadAttachment(message: DevMailMessage, a: DevMailAttachment): void {
    this.api.devMailAttachment(message.id, a.index).subscribe({
      next: (blob) => saveBlob(this.document, blob, a.filename),
      error: (err: unknown) =>
        this.snackBar.open(apiErrorMessage(err, 'The attachment could not be read.'), 'Close', {
          duration: 6000,
        }),
    });
  }
}
