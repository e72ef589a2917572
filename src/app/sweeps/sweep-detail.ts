import { DatePipe, DecimalPipe, DOCUMENT } from '@angular/common';
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
import { MatSlideToggleModule } from '@angular/material/slide-toggle';
import { MatSnackBar } from '@angular/material/snack-bar';
import { RouterLink } from '@angular/router';
import { catchError, concat, distinctUntilChanged, EMPTY, of, scan, switchMap } from 'rxjs';
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
import { Theme } from '../core/theme';
import { TypesApi } from '../types/types-api';
import type { ChartOverlay } from './sweep-chart';
import {
  loadNominalSource,
  nominalDrawing,
  nominalOverlays,
  referenceComparison,
  type NominalSource,
} from './sweep-nominal';
import { sweepStatusLabel } from './sweep-status-label';
import { SweepStatusChip } from './sweep-status-chip';

/** One sweep: its curves and their analysis, conditions, end state, and data as CSV or JSON. */
@Component({
  selector: 'app-sweep-detail',
  imports: [
    DatePipe,
    DecimalPipe,
    FamilyAnalysis,
    MatButtonModule,
    MatIconModule,
    MatProgressBarModule,
    MatSlideToggleModule,
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
  private readonly typesApi = inject(TypesApi);
  private readonly theme = inject(Theme);

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

  /** Whether the type's nominal curves are drawn over the measured ones. */
  protected readonly showNominal = signal(true);
  private readonly nominalSource = signal<NominalSource | null>(null);
  /** The type's uploaded curves or published model, sampled for this sweep. */
  protected readonly nominal = computed(() => {
    const source = this.nominalSource();
    const sweep = this.sweep();
    if (!source || !sweep) return null;
    return nominalDrawing(source.type, source.stored, sweep.plan, this.points());
  });
  protected readonly nominalOverlays = computed<readonly ChartOverlay[]>(() => {
    const drawing = this.nominal();
    return drawing && this.showNominal() ? nominalOverlays(drawing, this.theme.dark()) : [];
  });
  /** Ia at the type's reference point, published, nominal and measured. */
  protected readonly reference = computed(() => {
    const drawing = this.nominal();
    const sweep = this.sweep();
    return drawing && sweep ? referenceComparison(drawing, sweep.plan, this.points()) : null;
  });

  constructor() {
    // The type's nominal curves, asked once per sweep and type.
    toObservable(computed(() => this.sweep()?.valveType ?? null))
      .pipe(
        distinctUntilChanged(),
        switchMap((designation) => {
          this.nominalSource.set(null);
          return loadNominalSource(this.typesApi, designation);
        }),
        takeUntilDestroyed(),
      )
      .subscribe((source) => this.nominalSource.set(source));

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
