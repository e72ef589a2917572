import {
  afterNextRender,
  ChangeDetectionStrategy,
  Component,
  computed,
  DestroyRef,
  type ElementRef,
  inject,
  Injector,
  signal,
  viewChild,
} from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatSlideToggleModule } from '@angular/material/slide-toggle';
import { RouterLink } from '@angular/router';
import { filter } from 'rxjs';
import type { QuickTestGradeName } from '../../../shared/grading/grade-quick-test';
import { partTitle } from '../../../shared/grading/quick-test-results';
import type { BenchView, QuickTestStatus, QuickTestView } from '../../../shared/hub/messages';
import { apiErrorMessage } from '../core/api-error-message';
import { BenchesApi } from '../core/benches-api';
import { LiveConnection } from '../core/live-connection';
import { ValvesApi, type ValveView } from '../valves/valves-api';
import { gradeLook } from './box-check-grade';
import { partSummary } from './part-figures';
import { QuickTestsApi } from './quick-tests-api';

/** One finished valve of this session. */
export interface BoxCheckRow {
  quickTestId: number;
  label: string;
  valveType: string;
  valveId: number | null;
  grade: QuickTestGradeName | null;
  /** How the test ended. */
  status: QuickTestStatus;
  reason: string;
  /** ISO time the test ended. */
  endedAt: string;
}

const ACTIVE = new Set(['pending', 'running']);

/**
 * Box check: scan or type a label, look the record up, run the quick-test set on a bench, see
 * the grade and its reason, and move to the next valve; this session's results stay listed.
 */
@Component({
  selector: 'app-box-check',
  imports: [
    FormsModule,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressBarModule,
    MatSelectModule,
    MatSlideToggleModule,
    RouterLink,
  ],
  templateUrl: './box-check.html',
  styleUrl: './box-check.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class BoxCheck {
  private readonly live = inject(LiveConnection);
  private readonly valvesApi = inject(ValvesApi);
  private readonly quickTests = inject(QuickTestsApi);
  private readonly injector = inject(Injector);

  private readonly labelInput = viewChild<ElementRef<HTMLInputElement>>('labelInput');
  private readonly restBenches = signal<BenchView[]>([]);

  /** Benches, live when the socket has reported them. */
  protected readonly benches = computed(() => this.live.benches() ?? this.restBenches());
  protected readonly benchId = signal<number | null>(null);
  protected readonly label = signal('');
  protected readonly autoStart = signal(false);
  protected readonly valve = signal<ValveView | null>(null);
  protected readonly looking = signal(false);
  protected readonly starting = signal(false);
  protected readonly problem = signal<string | null>(null);
  /** The quick test started from this page, while running and after it ends. */
  protected readonly test = signal<QuickTestView | null>(null);
  /** This session's finished tests, newest first. */
  protected readonly rows = signal<BoxCheckRow[]>([]);

  protected readonly running = computed(() => {
    const t = this.test();
    return t !== null && ACTIVE.has(t.status);
  });
  protected readonly finished = computed(() => {
    const t = this.test();
    return t !== null && !ACTIVE.has(t.status) ? t : null;
  });
  protected readonly currentPartTitle = computed(() => {
    const part = this.test()?.currentPart;
    return part ? partTitle(part) : null;
  });
  /** Warm-up seconds left: the quick test's own figure, else the bench's status. */
  protected readonly warmupLeftSeconds = computed(() => {
    const t = this.test();
    if (!t || !ACTIVE.has(t.status)) return 0;
    if (t.warmupLeftSeconds > 0) return t.warmupLeftSeconds;
    const bench = this.benches().find((b) => b.id === t.benchId);
    return bench?.status?.warmupLeftSeconds ?? 0;
  });
  protected readonly progressPercent = computed(() => {
    const t = this.test();
    return t && t.stepCount > 0 ? (100 * t.stepsDone) / t.stepCount : 0;
  });
  protected readonly parts = computed(() => (this.test()?.results ?? []).map(partSummary));
  protected readonly look = computed(() =>
    gradeLook(this.finished()?.grade?.grade ?? null, this.finished()?.status),
  );
  protected readonly gradeLook = gradeLook;
  protected readonly canStart = computed(
    () => this.valve() !== null && this.benchId() !== null && !this.running() && !this.starting(),
  );

  constructor() {
    inject(BenchesApi)
      .list()
      .pipe(takeUntilDestroyed())
      .subscribe({
        next: (benches) => {
          this.restBenches.set(benches);
          if (this.benchId() === null && benches.length > 0) this.benchId.set(benches[0].id);
        },
        error: (err: unknown) => this.problem.set(apiErrorMessage(err, 'Benches could not load.')),
      });
    this.live.messages$
      .pipe(
        filter((m) => m.type === 'quick-test'),
        takeUntilDestroyed(inject(DestroyRef)),
      )
      .subscribe((m) => this.update(m.quickTest));
    afterNextRender(() => this.focusLabel(), { injector: this.injector });
  }

  /** Enter in the label field: look the record up, and start at once when auto-start is on. */
  protected lookUp(): void {
    const label = this.label().trim();
    if (!label || this.looking()) return;
    this.looking.set(true);
    this.problem.set(null);
    this.valve.set(null);
    this.valvesApi
      .list({
        page: 1,
        pageSize: 10,
        sort: 'label',
        order: 'asc',
        type: '',
        status: '',
        grade: '',
        location: '',
        q: label,
      })
      .subscribe({
        next: (page) => {
          this.looking.set(false);
          const wanted = label.toLowerCase();
          const found =
            page.items.find((v) => v.label.toLowerCase() === wanted) ??
            (page.items.length === 1 ? page.items[0] : null);
          if (!found) {
            this.problem.set(`No valve record has the label ${label}.`);
            this.focusLabel();
            return;
          }
          this.valve.set(found);
          if (this.autoStart()) this.start();
        },
        error: (err: unknown) => {
          this.looking.set(false);
          this.problem.set(apiErrorMessage(err, 'The valve record could not be looked up.'));
        },
      });
  }

  /** Starts the quick-test set for the valve looked up, on the chosen bench. */
  protected start(): void {
    const valve = this.valve();
    const benchId = this.benchId();
    if (!valve || benchId === null || this.running() || this.starting()) return;
    this.starting.set(true);
    this.problem.set(null);
    this.quickTests.start({ benchId, valveType: valve.type, valveId: valve.id }).subscribe({
      next: (view) => {
        this.starting.set(false);
        this.update(view, true);
      },
      error: (err: unknown) => {
        this.starting.set(false);
        this.problem.set(apiErrorMessage(err, 'The quick test could not start.'));
        this.focusLabel();
      },
    });
  }

  /** Aborts the running test over the socket and over REST (whichever reaches the hub first). */
  protected abort(): void {
    const t = this.test();
    if (!t || !ACTIVE.has(t.status)) return;
    this.live.abortQuickTest(t.id);
    this.quickTests.abort(t.id).subscribe({
      error: (err: unknown) => {
        // 409: it had already ended (often by the socket's abort); the live update shows that.
        if (!(err instanceof Object && 'status' in err && err.status === 409)) {
          this.problem.set(apiErrorMessage(err, 'The abort request failed; use the bench stop.'));
        }
      },
    });
  }

  protected timeOf(iso: string): string {
    return new Date(iso).toLocaleTimeString([], {
      hour: '2-digit',
      minute: '2-digit',
      second: '2-digit',
    });
  }

  /** Takes a newer view of the test started here; views of other benches' tests are ignored. */
  private update(view: QuickTestView, started = false): void {
    const current = this.test();
    if (!started && current?.id !== view.id) return;
    const wasActive = started || (current !== null && ACTIVE.has(current.status));
    this.test.set(view);
    if (wasActive && !ACTIVE.has(view.status)) this.finish(view);
  }

  private finish(view: QuickTestView): void {
    const row: BoxCheckRow = {
      quickTestId: view.id,
      label: view.valveLabel ?? this.valve()?.label ?? '—',
      valveType: view.valveType,
      valveId: view.valveId,
      grade: view.grade?.grade ?? null,
      status: view.status,
      reason: view.grade?.reason ?? view.endMessage ?? view.status,
      endedAt: view.endedAt ?? new Date().toISOString(),
    };
    this.rows.update((rows) => [row, ...rows.filter((r) => r.quickTestId !== view.id)]);
    this.label.set('');
    this.valve.set(null);
    this.focusLabel();
  }

  private focusLabel(): void {
    this.labelInput()?.nativeElement.focus();
  }
}
