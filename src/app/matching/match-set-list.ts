import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatPaginatorModule, type PageEvent } from '@angular/material/paginator';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatTableModule } from '@angular/material/table';
import { Router, RouterLink } from '@angular/router';
import { pagedList } from '../shared/paged-list';
import { SET_STATUS_LABELS } from './match-labels';
import { MatchSetsApi, type MatchSetStatus, type MatchSetSummary } from './match-sets-api';
import { MatchSetStatusChip } from './match-set-status-chip';

interface ListQuery {
  page: number;
  pageSize: number;
  status: MatchSetStatus | '';
}

/** Every match set, newest first, paged and filtered by status. */
@Component({
  selector: 'app-match-set-list',
  imports: [
    DatePipe,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatPaginatorModule,
    MatProgressBarModule,
    MatSelectModule,
    MatTableModule,
    MatchSetStatusChip,
    RouterLink,
  ],
  template: `
    <div class="page">
      <div class="head">
        <h1 class="page-title">Match sets</h1>
        <a mat-stroked-button routerLink="/matching">Match stock into sets</a>
      </div>
      <div class="filters">
        <mat-form-field class="status">
          <mat-label>Status</mat-label>
          <mat-select [value]="query().status" (selectionChange)="filterStatus($event.value)">
            <mat-option value="">Any status</mat-option>
            @for (s of statuses; track s.value) {
              <mat-option [value]="s.value">{{ s.label }}</mat-option>
            }
          </mat-select>
        </mat-form-field>
      </div>
      @if (error(); as message) {
        <p class="error" role="alert">
          <mat-icon svgIcon="error" aria-hidden="true" />{{ message }}
        </p>
      }
      <div class="table-wrap panel">
        @if (loading()) {
          <mat-progress-bar class="loading" mode="indeterminate" aria-label="Loading sets" />
        }
        <table mat-table [dataSource]="rows()" aria-label="Match sets">
          <ng-container matColumnDef="code">
            <th mat-header-cell *matHeaderCellDef>Set</th>
            <td mat-cell *matCellDef="let s" class="readout">{{ s.code }}</td>
          </ng-container>
          <ng-container matColumnDef="valveType">
            <th mat-header-cell *matHeaderCellDef>Type</th>
            <td mat-cell *matCellDef="let s">{{ s.valveType }}</td>
          </ng-container>
          <ng-container matColumnDef="labels">
            <th mat-header-cell *matHeaderCellDef>Valves</th>
            <td mat-cell *matCellDef="let s" class="readout">
              {{ s.memberCount }} × {{ s.labels.join(', ') }}
            </td>
          </ng-container>
          <ng-container matColumnDef="status">
            <th mat-header-cell *matHeaderCellDef>Status</th>
            <td mat-cell *matCellDef="let s"><app-match-set-status-chip [status]="s.status" /></td>
          </ng-container>
          <ng-container matColumnDef="createdAt">
            <th mat-header-cell *matHeaderCellDef>Reserved</th>
            <td mat-cell *matCellDef="let s" class="readout">
              {{ s.createdAt | date: 'yyyy-MM-dd HH:mm'
              }}{{ s.createdBy ? ' by ' + s.createdBy : '' }}
            </td>
          </ng-container>
          <tr mat-header-row *matHeaderRowDef="columns"></tr>
          <tr
            mat-row
            *matRowDef="let s; columns: columns"
            class="row"
            tabindex="0"
            [attr.aria-label]="'Open set ' + s.code"
            (click)="open(s)"
            (keydown.enter)="open(s)"
          ></tr>
        </table>
        @if (!loading() && !rows().length && !error()) {
          <p class="empty">
            {{
              query().status
                ? 'No sets with this status.'
                : 'No match sets yet: reserve a group on the Matching page.'
            }}
          </p>
        }
        <mat-paginator
          [length]="result()?.total ?? 0"
          [pageIndex]="query().page - 1"
          [pageSize]="query().pageSize"
          [pageSizeOptions]="[10, 25, 50, 100]"
          (page)="changePage($event)"
          aria-label="Pages of match sets"
        />
      </div>
    </div>
  `,
  styleUrl: './match-set-list.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class MatchSetList {
  private readonly api = inject(MatchSetsApi);
  private readonly router = inject(Router);

  protected readonly columns = ['code', 'valveType', 'labels', 'status', 'createdAt'];
  protected readonly statuses = (Object.keys(SET_STATUS_LABELS) as MatchSetStatus[]).map((s) => ({
    value: s,
    label: SET_STATUS_LABELS[s],
  }));
  private readonly list = pagedList<ListQuery, MatchSetSummary>(
    { page: 1, pageSize: 25, status: '' },
    (q) => this.api.list(q.page, q.pageSize, q.status),
    'Loading the match sets failed.',
  );
  protected readonly query = this.list.query;
  protected readonly loading = this.list.loading;
  protected readonly error = this.list.error;
  protected readonly result = this.list.result;
  protected readonly rows = this.list.rows;

  protected filterStatus(status: MatchSetStatus | ''): void {
    this.list.refine({ status });
  }

  protected changePage(event: PageEvent): void {
    this.list.changePage(event);
  }

  protected open(set: MatchSetSummary): void {
    void this.router.navigate(['/match-sets', set.id]);
  }
}
