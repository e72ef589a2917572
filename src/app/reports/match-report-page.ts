import { DOCUMENT } from '@angular/common';
import {
  ChangeDetectionStrategy,
  Component,
  inject,
  input,
  numberAttribute,
  signal,
} from '@angular/core';
import { takeUntilDestroyed, toObservable } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { Title } from '@angular/platform-browser';
import { RouterLink } from '@angular/router';
import { catchError, of, switchMap } from 'rxjs';
import { apiErrorMessage } from '../core/api-error-message';
import { dispositionFileName, saveBlob } from '../core/save-blob';
import { MatchReportView } from './match-report-view';
import { ReportsApi, type MatchReportData } from './reports-api';

/**
 * The printable match report of a set, outside the shell so nothing but the report reaches the
 * paper; a small toolbar (screen only) goes back to the set, prints, or downloads the PDF.
 */
@Component({
  selector: 'app-match-report-page',
  imports: [MatButtonModule, MatIconModule, MatProgressBarModule, MatchReportView, RouterLink],
  templateUrl: './match-report-page.html',
  styleUrl: './report-paper.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class MatchReportPage {
  private readonly api = inject(ReportsApi);
  private readonly document = inject(DOCUMENT);
  private readonly title = inject(Title);

  /** Match set id, from the route. */
  readonly id = input.required({ transform: numberAttribute });

  protected readonly report = signal<MatchReportData | null>(null);
  protected readonly error = signal<string | null>(null);
  protected readonly downloading = signal(false);

  constructor() {
    toObservable(this.id)
      .pipe(
        switchMap((id) => {
          this.report.set(null);
          this.error.set(null);
          return this.api.report(id).pipe(
            catchError((err: unknown) => {
              this.error.set(apiErrorMessage(err, 'The report could not be loaded.'));
              return of(null);
            }),
          );
        }),
        takeUntilDestroyed(),
      )
      .subscribe((report) => {
        this.report.set(report);
        // The browser prints the title in its page header and offers it as the PDF's name.
        if (report) this.title.setTitle(`Match report ${report.code} · ${report.workshop}`);
      });
  }

  protected printReport(): void {
    this.document.defaultView?.print();
  }

  protected downloadPdf(): void {
    const id = this.id();
    this.downloading.set(true);
    this.api.reportPdf(id).subscribe({
      next: (res) => {
        this.downloading.set(false);
        const name =
          dispositionFileName(res.headers.get('content-disposition')) ??
          `match-report-${this.report()?.code ?? id}.pdf`;
        if (res.body) saveBlob(this.document, res.body, name);
      },
      error: (err: unknown) => {
        this.downloading.set(false);
        this.error.set(apiErrorMessage(err, 'The PDF could not be made.'));
      },
    });
  }
}
