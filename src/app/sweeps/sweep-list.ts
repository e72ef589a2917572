import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { takeUntilDestroyed, toObservable } from '@angular/core/rxjs-interop';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatPaginatorModule, type PageEvent } from '@angular/material/paginator';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatSortModule, type Sort } from '@angular/material/sort';
import { MatTableModule } from '@angular/material/table';
import { Router } from '@angular/router';
import { catchError, debounceTime, distinctUntilChanged, EMPTY, switchMap, tap } from 'rxjs';
import type { SweepStatus } from '../../../shared/domain/sweep';
import type { SweepView } from '../../../shared/hub/messages';
import { apiErrorMessage } from '../core/api-error-message';
import { LiveConnection } from '../core/live-connection';
import { SweepsApi, type SweepPage, type SweepQuery } from '../core/sweeps-api';
import { SWEEP_STATUSES, sweepStatusLabel } from './sweep-status-label';
import { SweepStatusChip } from './sweep-status-chip';

/** Every sweep, newest first: paged, sorted and filtered by the hub. */
@Component({
  selector: 'app-sweep-list',
  imports: [
    DatePipe,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatPaginatorModule,
    MatProgressBarModule,
    MatSelectModule,
    MatSortModule,
    MatTableModule,
    ReactiveFormsModule,
    SweepStatusChip,
  ],
  templateUrl: './sweep-list.html',
  styleUrl: './sweep-list.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SweepList {
  private readonly api = inject(SweepsApi);
  private readonly router = inject(Router);
  private readonly live = inject(LiveConnection);

  protected readonly columns = [
    'id',
    'createdAt',
    'valveType',
    'valveLabel',
    'bench',
    'kind',
    'status',
    'pointCount',
    'operator',
  ];
  protected readonly statuses = SWEEP_STATUSES.map((s) => ({ value: s, ...sweepStatusLabel(s) }));
  protected readonly pageSizes = [10, 20, 50, 100];

  protected readonly query = signal<SweepQuery>({
    page: 1,
    pageSize: 20,
    sort: 'createdAt',
    order: 'desc',
    status: '',
    q: '',
  });
  protected readonly search = new FormControl('', { nonNullable: true });
  protected readonly loading = signal(false);
  protected readonly error = signal<string | null>(null);
  protected readonly result = signal<SweepPage | null>(null);
  protected readonly rows = computed(() => this.result()?.items ?? []);

  private readonly benchNames = computed(
    () => new Map((this.live.benches() ?? []).map((b) => [b.id, b.name])),
  );

  constructor() {
    this.search.valueChanges
      .pipe(debounceTime(300), distinctUntilChanged(), takeUntilDestroyed())
      .subscribe((q) => this.query.update((x) => ({ ...x, q, page: 1 })));
    toObservable(this.query)
      .pipe(
        tap(() => this.loading.set(true)),
        switchMap((q) =>
          this.api.list(q).pipe(
            catchError((err: unknown) => {
              this.error.set(apiErrorMessage(err, 'Loading the sweeps failed.'));
              this.loading.set(false);
              return EMPTY;
            }),
          ),
        ),
        takeUntilDestroyed(),
      )
      .subscribe((page) => {
        this.loading.set(false);
        this.error.set(null);
        this.result.set(page);
      });
  }

  protected benchName(id: number): string {
    return this.benchNames().get(id) ?? `Bench ${id}`;
  }

  protected changePage(event: PageEvent): void {
    this.query.update((x) => ({ ...x, page: event.pageIndex + 1, pageSize: event.pageSize }));
  }

  protected changeSort(sort: Sort): void {
    const order = sort.direction || 'desc';
    this.query.update((x) => ({ ...x, sort: sort.active, order, page: 1 }));
  }

  protected changeStatus(status: SweepStatus | ''): void {
    this.query.update((x) => ({ ...x, status, page: 1 }));
  }

  protected openSweep(sweep: SweepView): void {
    void this.router.navigate(['/sweeps', sweep.id]);
  }
}
