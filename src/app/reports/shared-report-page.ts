import { DatePipe, DOCUMENT } from '@angular/common';
import { HttpErrorResponse } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { takeUntilDestroyed, toObservable } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { Title } from '@angular/platform-browser';
import { catchError, map, of, startWith, switchMap } from 'rxjs';
import { apiErrorMessage } from '../core/api-error-message';
import { MatchReportView } from './match-report-view';
import { ReportsApi, sharedReportPdfUrl, type SharedMatchReport } from './reports-api';

/** What a buyer's link led to. */
export type SharedReportState =
  | { kind: 'loading' }
  | { kind: 'ok'; report: SharedMatchReport }
  | { kind: 'gone' }
  | { kind: 'unknown' }
  | { kind: 'error'; message: string };

/**
 * The buyer's read-only view of a match report, reached through a link without signing in. It
 * shows the report and the link's expiry and offers the PDF; nothing leads into the product.
 */
@Component({
  selector: 'app-shared-report-page',
  imports: [DatePipe, MatButtonModule, MatIconModule, MatchReportView],
  templateUrl: './shared-report-page.html',
  styleUrl: './report-paper.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SharedReportPage {
  private readonly api = inject(ReportsApi);
  private readonly document = inject(DOCUMENT);
  private readonly title = inject(Title);

  /** The buyer's token, from the route. */
  readonly token = input.required<string>();

  protected readonly state = signal<SharedReportState>({ kind: 'loading' });
  protected readonly pdfUrl = computed(() => sharedReportPdfUrl(this.token()));

  constructor() {
    toObservable(this.token)
      .pipe(
        switchMap((token) =>
          this.api.shared(token).pipe(
            map((report): SharedReportState => ({ kind: 'ok', report })),
            catchError((err: unknown) => of(stateOfError(err))),
            startWith<SharedReportState>({ kind: 'loading' }),
          ),
        ),
        takeUntilDestroyed(),
      )
      .subscribe((state) => {
        this.state.set(state);
        if (state.kind === 'ok') {
          this.title.setTitle(`Match report ${state.report.code} · ${state.report.workshop}`);
        }
      });
  }

  protected printReport(): void {
    this.document.defaultView?.print();
  }
}

function stateOfError(err: unknown): SharedReportState {
  if (err instanceof HttpErrorResponse && err.status === 410) return { kind: 'gone' };
  if (err instanceof HttpErrorResponse && err.status === 404) return { kind: 'unknown' };
  return { kind: 'error', message: apiErrorMessage(err, 'The report could not be loaded.') };
}
