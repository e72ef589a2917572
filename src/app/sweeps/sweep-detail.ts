import { DatePipe, DOCUMENT } from '@angular/common';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  inject,
  input,
  numberAttribute,
  signal,
} from '@angular/core';
import { takeUntilDestroyed, toObservable } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { RouterLink } from '@angular/router';
import { catchError, concat, EMPTY, of, scan, switchMap } from 'rxjs';
import { plannedPointCount } from '../../../shared/domain/sweep';
import { FamilyAnalysis } from '../analysis/family-analysis';
import { apiErrorMessage } from '../core/api-error-message';
import { LiveConnection } from '../core/live-connection';
import { dispositionFileName, saveBlob } from '../core/save-blob';
import {
  applySweepMessage,
  initialSweepWatchState,
  type SweepWatchState,
} from '../core/sweep-watch-state';
import { SweepsApi, type ExportFormat } from '../core/sweeps-api';
import { sweepStatusLabel } from './sweep-status-label';
import { SweepStatusChip } from './sweep-status-chip';

/** One sweep: its curves and their analysis, conditions, end state, and data as CSV or JSON. */
@Component({
  selector: 'app-sweep-detail',
  imports: [
    DatePipe,
    FamilyAnalysis,
    MatButtonModule,
    MatIconModule,
    MatProgressBarModule,
    RouterLink,
    SweepStatusChip,
  ],
  templateUrl: './sweep-detail.html',
  styleUrl: './sweep-detail.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SweepDetail {
  private readonly api = inject(SweepsApi);
  private readonly live = inject(LiveConnection);
  private readonly document = inject(DOCUMENT);
  private readonly snackBar = inject(MatSnackBar);

  /** Sweep id, from the route. */
  readonly id = input.required({ transform: numberAttribute });

  protected readonly error = signal<string | null>(null);
  protected readonly state = signal<SweepWatchState | null>(null);
  protected readonly downloading = signal<ExportFormat | null>(null);

  protected readonly sweep = computed(() => this.state()?.sweep ?? null);
  protected readonly points = computed(() => this.state()?.points ?? []);
  protected readonly ending = computed(() => {
    const status = this.sweep()?.status;
    return !status || status === 'pending' || status === 'running'
      ? null
      : sweepStatusLabel(status);
  });
  protected readonly planned = computed(() => {
    const sweep = this.sweep();
    return sweep ? plannedPointCount(sweep.plan) : 0;
  });
  protected readonly vg1Text = computed(() => this.sweep()?.plan.vg1Volts.join(', ') ?? '');
  protected readonly benchName = computed(() => {
    const sweep = this.sweep();
    const bench = sweep && (this.live.benches() ?? []).find((b) => b.id === sweep.benchId);
    return bench?.name ?? (sweep ? `Bench ${sweep.benchId}` : '');
  });

  constructor() {
    // The stored record first; a sweep still running then follows live on the socket.
    toObservable(this.id)
      .pipe(
        switchMap((id) => {
          this.state.set(null);
          this.error.set(null);
          return this.api.get(id).pipe(
            switchMap(({ points, ...sweep }) => {
              const stored: SweepWatchState = { ...initialSweepWatchState(id, sweep), points };
              const active = sweep.status === 'pending' || sweep.status === 'running';
              return active
                ? concat(of(stored), this.live.watchSweep(id).pipe(scan(applySweepMessage, stored)))
                : of(stored);
            }),
            catchError((err: unknown) => {
              this.error.set(apiErrorMessage(err, `Sweep #${id} could not be loaded.`));
              return EMPTY;
            }),
          );
        }),
        takeUntilDestroyed(),
      )
      .subscribe((state) => this.state.set(state));
  }

  protected download(format: ExportFormat): void {
    const id = this.id();
    this.downloading.set(format);
    this.api.exportFile(id, format).subscribe({
      next: (res) => {
        this.downloading.set(null);
        const name =
          dispositionFileName(res.headers.get('Content-Disposition')) ?? `sweep-${id}.${format}`;
        if (res.body) saveBlob(this.document, res.body, name);
      },
      error: (err: unknown) => {
        this.downloading.set(null);
        this.snackBar.open(`Download failed: ${apiErrorMessage(err)}`, 'Dismiss');
      },
    });
  }
}
