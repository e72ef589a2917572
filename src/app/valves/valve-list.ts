import { DatePipe, DOCUMENT } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { takeUntilDestroyed, toSignal } from '@angular/core/rxjs-interop';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatPaginatorModule, type PageEvent } from '@angular/material/paginator';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatSortModule, type Sort } from '@angular/material/sort';
import { MatTableModule } from '@angular/material/table';
import { Router } from '@angular/router';
import { catchError, debounceTime, distinctUntilChanged, of } from 'rxjs';
import { HARD_FAILS } from '../../../shared/grading/grade-quick-test';
import { VALVE_GRADES } from '../../../shared/grading/grade-thresholds';
import { apiErrorMessage } from '../core/api-error-message';
import { Auth } from '../core/auth';
import { dispositionFileName, saveBlob } from '../core/save-blob';
import { ValveTypesApi } from '../core/valve-types-api';
import { pagedList } from '../shared/paged-list';
import { CreateValveDialog } from './create-valve-dialog';
import { ValveGradeChip } from './valve-grade-chip';
import { GRADE_LABELS, HARD_FAIL_LABELS, STATUS_LABELS } from './valve-labels';
import {
  VALVE_STATUSES,
  ValvesApi,
  type ValveImportReport,
  type ValveQuery,
  type ValveView,
} from './valves-api';

/** Every valve record: paged, sorted, filtered and searched by the hub. */
@Component({
  selector: 'app-valve-list',
  imports: [
    DatePipe,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatPaginatorModule,
    MatProgressBarModule,
    MatSelectModule,
    MatSortModule,
    MatTableModule,
    ReactiveFormsModule,
    ValveGradeChip,
  ],
  templateUrl: './valve-list.html',
  styleUrl: './valve-list.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ValveList {
  private readonly api = inject(ValvesApi);
  private readonly router = inject(Router);
  private readonly dialog = inject(MatDialog);
  private readonly document = inject(DOCUMENT);
  protected readonly auth = inject(Auth);

  protected readonly columns = [
    'label',
    'type',
    'maker',
    'status',
    'grade',
    'location',
    'sweepCount',
    'updatedAt',
  ];
  protected readonly statuses = VALVE_STATUSES.map((s) => ({ value: s, label: STATUS_LABELS[s] }));
  protected readonly grades = [
    ...VALVE_GRADES.map((g) => ({ value: g, label: GRADE_LABELS[g] })),
    ...HARD_FAILS.map((g) => ({ value: g, label: HARD_FAIL_LABELS[g] })),
    { value: 'ungraded' as const, label: 'Not graded' },
  ];
  protected readonly pageSizes = [10, 25, 50, 100];
  protected readonly types = toSignal(
    inject(ValveTypesApi)
      .list()
      .pipe(catchError(() => of([]))),
    { initialValue: [] },
  );

  private readonly list = pagedList<ValveQuery, ValveView>(
    {
      page: 1,
      pageSize: 25,
      sort: 'label',
      order: 'asc',
      type: '',
      status: '',
      grade: '',
      location: '',
      q: '',
    },
    (q) => this.api.list(q),
    'Loading the valve records failed.',
  );
  protected readonly query = this.list.query;
  protected readonly search = new FormControl('', { nonNullable: true });
  protected readonly locationFilter = new FormControl('', { nonNullable: true });
  protected readonly loading = this.list.loading;
  protected readonly error = this.list.error;
  protected readonly result = this.list.result;
  protected readonly rows = computed(() => this.result()?.items ?? []);
  protected readonly importReport = signal<ValveImportReport | null>(null);
  protected readonly busy = signal<'export' | 'import' | null>(null);

  constructor() {
    this.search.valueChanges
      .pipe(debounceTime(300), distinctUntilChanged(), takeUntilDestroyed())
      .subscribe((q) => this.list.refine({ q }));
    this.locationFilter.valueChanges
      .pipe(debounceTime(300), distinctUntilChanged(), takeUntilDestroyed())
      .subscribe((location) => this.list.refine({ location }));
  }

  protected statusLabel(valve: ValveView): string {
    return STATUS_LABELS[valve.status];
  }

  protected changePage(event: PageEvent): void {
    this.list.changePage(event);
  }

  protected changeSort(sort: Sort): void {
    const order = sort.direction || 'asc';
    this.list.refine({ sort: sort.active as ValveQuery['sort'], order });
  }

  protected filterBy(key: 'type' | 'status' | 'grade', value: string): void {
    this.list.refine({ [key]: value });
  }

  protected openValve(valve: ValveView): void {
    void this.router.navigate(['/valves', valve.id]);
  }

  protected openCreate(): void {
    this.dialog
      .open(CreateValveDialog, { data: { types: this.types() }, width: '640px', maxWidth: '95vw' })
      .afterClosed()
      .subscribe((created: ValveView | undefined) => {
        if (created) void this.router.navigate(['/valves', created.id]);
      });
  }

  protected exportCsv(): void {
    this.busy.set('export');
    this.api.exportCsv().subscribe({
      next: (res) => {
        this.busy.set(null);
        const name = dispositionFileName(res.headers.get('Content-Disposition')) ?? 'valves.csv';
        if (res.body) saveBlob(this.document, res.body, name);
      },
      error: (err: unknown) => {
        this.busy.set(null);
        this.error.set(apiErrorMessage(err, 'The export failed.'));
      },
    });
  }

  protected importCsv(input: HTMLInputElement): void {
    const file = input.files?.[0];
    input.value = '';
    if (!file) return;
    if (file.size > 1024 * 1024) {
      this.error.set(`${file.name} is larger than 1 MiB; split it into smaller files.`);
      return;
    }
    this.busy.set('import');
    this.importReport.set(null);
    this.api.importCsv(file).subscribe({
      next: (report) => {
        this.busy.set(null);
        this.importReport.set(report);
        this.query.update((x) => ({ ...x, page: 1 }));
      },
      error: (err: unknown) => {
        this.busy.set(null);
        this.error.set(apiErrorMessage(err, 'The import failed.'));
      },
    });
  }
}
