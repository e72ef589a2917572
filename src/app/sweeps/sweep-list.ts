import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
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
import { debounceTime, distinctUntilChanged } from 'rxjs';
import type { SweepStatus } from '../../../shared/domain/sweep';
import type { SweepView } from '../../../shared/hub/messages';
import { LiveConnection } from '../core/live-connection';
import { SweepsApi, type SweepQuery } from '../core/sweeps-api';
import { pagedList } from '../shared/paged-list';
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

  private readonly list = pagedList<SweepQuery, SweepView>(
    { page: 1, pageSize: 20, sort: 'createdAt', order: 'desc', status: '', q: '' },
    (q) => this.api.list(q),
    'Loading the sweeps failed.',
  );
  protected readonly query = this.list.query;
  protected readonly search = new FormControl('', { nonNullable: true });
  protected readonly loading = this.list.loading;
  protected readonly error = this.list.error;
  protected readonly result = this.list.result;
  protected readonly rows = this.list.rows;

  private readonly benchNames = computed(
    () => new Map((this.live.benches() ?? []).map((b) => [b.id, b.name])),
  );

  constructor() {
    this.search.valueChanges
      .pipe(debounceTime(300), distinctUntilChanged(), takeUntilDestroyed())
      .subscribe((q) => this.list.refine({ q }));
  }

  protected benchName(id: number): string {
    return this.benchNames().get(id) ?? `Bench ${id}`;
  }

  protected changePage(event: PageEvent): void {
    this.list.changePage(event);
  }

  protected changeSort(sort: Sort): void {
    const order = sort.direction || 'desc';
    this.list.refine({ sort: sort.active, order });
  }

  protected changeStatus(status: SweepStatus | ''): void {
    this.list.refine({ status });
  }

  protected openSweep(sweep: SweepView): void {
    void this.router.navigate(['/sweeps', sweep.id]);
  }
}
