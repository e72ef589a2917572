import { DOCUMENT } from '@angular/common';
import {
  afterNextRender,
  ChangeDetectionStrategy,
  Component,
  computed,
  effect,
  ElementRef,
  inject,
  Injector,
  signal,
  untracked,
  viewChild,
} from '@angular/core';
import { toObservable, toSignal } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { MatSnackBar } from '@angular/material/snack-bar';
import { catchError, distinctUntilChanged, of, scan, startWith, switchMap } from 'rxjs';
import type { BenchView, SweepView } from '../../../shared/hub/messages';
import { apiErrorMessage } from '../core/api-error-message';
import { Auth } from '../core/auth';
import { BenchesApi } from '../core/benches-api';
import { LiveConnection } from '../core/live-connection';
import {
  applySweepMessage,
  initialSweepWatchState,
  type SweepWatchState,
} from '../core/sweep-watch-state';
import { SweepsApi, type SweepQuery } from '../core/sweeps-api';
import { ValveTypesApi, type ValveTypeView } from '../core/valve-types-api';
import { BenchList } from './bench-list';
import { LiveSweep } from './live-sweep';
import { SweepPlanForm } from './sweep-plan-form';

const LATEST_SWEEP_QUERY: SweepQuery = {
  page: 1,
  pageSize: 1,
  sort: 'createdAt',
  order: 'desc',
  status: '',
  q: '',
};

/**
 * The bench page: choose a bench, plan and start a sweep, watch it live and abort it. Viewers
 * get the live view only.
 */
@Component({
  selector: 'app-bench-page',
  imports: [BenchList, LiveSweep, MatButtonModule, MatIconModule, SweepPlanForm],
  templateUrl: './bench-page.html',
  styleUrl: './bench-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { '(document:keydown.escape)': 'abortOnEscape()' },
})
export class BenchPage {
  private readonly live = inject(LiveConnection);
  private readonly sweepsApi = inject(SweepsApi);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  protected readonly auth = inject(Auth);
  private readonly document = inject(DOCUMENT);
  private readonly injector = inject(Injector);
  private readonly livePanel = viewChild<ElementRef<HTMLElement>>('livePanel');

  protected readonly loadError = signal<string | null>(null);
  private readonly restBenches = toSignal(
    inject(BenchesApi)
      .list()
      .pipe(catchError((err: unknown) => this.failLoad(err, null))),
    { initialValue: null },
  );
  protected readonly valveTypes = toSignal(
    inject(ValveTypesApi)
      .list()
      .pipe(catchError((err: unknown) => this.failLoad<ValveTypeView[]>(err, []))),
    { initialValue: [] as ValveTypeView[] },
  );
  /** The socket's view once it has reported; REST until then. */
  protected readonly benches = computed<readonly BenchView[]>(
    () => this.live.benches() ?? this.restBenches() ?? [],
  );
  private readonly connected = this.live.connected;
  protected readonly linkDown = this.live.linkDown;

  private readonly chosenBenchId = signal<number | null>(null);
  protected readonly bench = computed(() => {
    const benches = this.benches();
    return benches.find((b) => b.id === this.chosenBenchId()) ?? benches.at(0) ?? null;
  });

  /** Last sweep seen on each bench, so an ended sweep stays on screen with its end state. */
  private readonly lastSweepByBench = signal<ReadonlyMap<number, number>>(new Map());
  /** Records from our own POSTs, shown before the hub's first live report. */
  private readonly startedSweeps = new Map<number, SweepView>();

  protected readonly sweepId = computed(() => {
    const bench = this.bench();
    if (!bench) return null;
    return bench.status?.sweepId ?? this.lastSweepByBench().get(bench.id) ?? null;
  });

  protected readonly watch = toSignal(
    toObservable(this.sweepId).pipe(
      distinctUntilChanged(),
      switchMap((id) => {
        if (id === null) return of(null);
        const initial = initialSweepWatchState(id, this.startedSweeps.get(id) ?? null);
        return this.live
          .watchSweep(id)
          .pipe(scan(applySweepMessage, initial), startWith<SweepWatchState>(initial));
      }),
    ),
    { initialValue: null },
  );

  protected readonly showingSweep = computed(() => !!this.watch()?.sweep);
  protected readonly sweepActive = computed(() => {
    const status = this.watch()?.sweep?.status;
    const bench = this.bench();
    return status === 'pending' || status === 'running' || bench?.status?.sweepId != null;
  });
  protected readonly canAbort = computed(
    () => this.auth.canOperate() && this.sweepActive() && this.sweepId() !== null,
  );

  /** Benches whose latest stored sweep has been asked for. */
  private readonly latestRequested = new Set<number>();

  constructor() {
    // After a reload nothing is running: show the bench's latest stored sweep instead of nothing.
    effect(() => {
      const bench = this.bench();
      if (!bench || bench.status?.sweepId != null) return;
      if (untracked(this.lastSweepByBench).has(bench.id)) return;
      if (this.latestRequested.has(bench.id)) return;
      this.latestRequested.add(bench.id);
      this.sweepsApi
        .list({ ...LATEST_SWEEP_QUERY, benchId: bench.id })
        .pipe(catchError(() => of(null)))
        .subscribe((page) => {
          const latest = page?.items[0];
          if (latest && !this.lastSweepByBench().has(bench.id)) {
            this.lastSweepByBench.update((m) => new Map(m).set(bench.id, latest.id));
          }
        });
    });
    effect(() => {
      const seen = untracked(this.lastSweepByBench);
      const updates = this.benches().filter(
        (b) => b.status?.sweepId != null && seen.get(b.id) !== b.status.sweepId,
      );
      if (!updates.length) return;
      const next = new Map(seen);
      for (const b of updates) next.set(b.id, b.status!.sweepId!);
      this.lastSweepByBench.set(next);
    });
  }

  protected selectBench(id: number): void {
    this.chosenBenchId.set(id);
  }

  protected sweepStarted(sweep: SweepView): void {
    this.startedSweeps.set(sweep.id, sweep);
    // On a tablet the live view can be off screen below the form: bring it up.
    afterNextRender(
      () => {
        const panel = this.livePanel()?.nativeElement;
        const view = this.document.defaultView;
        if (!panel || !view) return;
        const top = panel.getBoundingClientRect().top;
        if (top >= 0 && top < view.innerHeight * 0.5) return;
        const reduced = view.matchMedia?.('(prefers-reduced-motion: reduce)').matches;
        panel.scrollIntoView({ block: 'start', behavior: reduced ? 'auto' : 'smooth' });
      },
      { injector: this.injector },
    );
    this.lastSweepByBench.update((m) => new Map(m).set(sweep.benchId, sweep.id));
    this.snackBar.open(
      `Sweep #${sweep.id} sent to ${this.bench()?.name ?? 'the bench'}`,
      undefined,
      {
        duration: 3000,
      },
    );
  }

  /** Aborts over the socket and over REST: either one reaching the hub is enough. */
  protected abortSweep(): void {
    const id = this.sweepId();
    if (id === null || !this.canAbort()) return;
    this.live.abortSweep(id);
    this.sweepsApi.abort(id).subscribe({
      error: (err: unknown) => {
        if (!this.connected()) {
          this.snackBar.open(`Abort failed: ${apiErrorMessage(err)}`, 'Dismiss');
        }
      },
    });
    this.snackBar.open(`Abort sent for sweep #${id}`, undefined, { duration: 3000 });
  }

  protected abortOnEscape(): void {
    // Escape in an open dialog belongs to the dialog.
    if (this.dialog.openDialogs.length === 0) this.abortSweep();
  }

  private failLoad<T>(err: unknown, fallback: T) {
    this.loadError.set(apiErrorMessage(err, 'Loading the benches failed.'));
    return of(fallback);
  }
}
