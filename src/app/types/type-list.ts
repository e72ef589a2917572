import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { Router, RouterLink } from '@angular/router';
import { apiErrorMessage } from '../core/api-error-message';
import { Auth } from '../core/auth';
import { GradeSettings } from './grade-settings';
import { NewTypeDialog } from './new-type-dialog';
import { TypesApi, type TypeView } from './types-api';

/** The type library: every type with its heater, base and reference point. */
@Component({
  selector: 'app-type-list',
  imports: [GradeSettings, MatButtonModule, MatIconModule, RouterLink],
  template: `
    <div class="page">
      <header class="head">
        <h1 class="page-title">Types</h1>
        @if (auth.isAdmin()) {
          <button mat-flat-button type="button" (click)="addType()">
            <mat-icon svgIcon="add" />New type
          </button>
        }
      </header>
      @if (error(); as message) {
        <p class="error" role="alert">{{ message }}</p>
      }
      <div class="panel table-panel">
        <table class="types" aria-label="Valve types">
          <thead>
            <tr>
              <th>Type</th>
              <th>Equivalents</th>
              <th>Class</th>
              <th>Base</th>
              <th class="num">Heater</th>
              <th>Reference point</th>
              <th>Nominal curves</th>
            </tr>
          </thead>
          <tbody>
            @for (t of types(); track t.designation) {
              <tr>
                <td>
                  <a [routerLink]="['/types', t.designation]">{{ t.designation }}</a>
                </td>
                <td>{{ t.equivalents.join(', ') }}</td>
                <td>{{ t.valveClass }}</td>
                <td>{{ t.base }}</td>
                <td class="num readout">{{ t.heaterVolts }} V {{ t.heaterAmps }} A</td>
                <td class="readout">{{ referenceText(t) }}</td>
                <td>{{ t.hasNominalCurves ? 'uploaded' : '—' }}</td>
              </tr>
            } @empty {
              <tr>
                <td colspan="7" class="muted">{{ loading() ? 'Loading…' : 'No types yet.' }}</td>
              </tr>
            }
          </tbody>
        </table>
      </div>
      <section class="panel">
        <app-grade-settings />
      </section>
    </div>
  `,
  styles: `
    .head {
      display: flex;
      flex-wrap: wrap;
      align-items: center;
      justify-content: space-between;
      gap: 12px;
      margin-bottom: 12px;
      .page-title {
        margin: 0;
      }
    }
    .table-panel {
      overflow: auto;
      margin-bottom: 16px;
    }
    table {
      border-collapse: collapse;
      width: 100%;
    }
    th,
    td {
      padding: 8px 12px;
      text-align: left;
      border-bottom: 1px solid var(--mat-sys-outline-variant);
    }
    .num {
      text-align: right;
    }
    a {
      color: var(--mat-sys-primary);
      font-weight: 500;
    }
    .muted {
      color: var(--mat-sys-on-surface-variant);
    }
    .error {
      color: var(--mat-sys-error);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TypeList {
  protected readonly auth = inject(Auth);
  private readonly dialog = inject(MatDialog);
  private readonly router = inject(Router);
  protected readonly types = signal<TypeView[]>([]);
  protected readonly loading = signal(true);
  protected readonly error = signal<string | null>(null);

  constructor() {
    inject(TypesApi)
      .list()
      .subscribe({
        next: (types) => {
          this.types.set(types);
          this.loading.set(false);
        },
        error: (err: unknown) => {
          this.loading.set(false);
          this.error.set(apiErrorMessage(err, 'The type library did not load.'));
        },
      });
  }

  /** Admin only: the new-type form; a type added opens on its own page. */
  protected addType(): void {
    this.dialog
      .open<NewTypeDialog, void, TypeView>(NewTypeDialog, { width: '820px', maxWidth: '95vw' })
      .afterClosed()
      .subscribe((type) => {
        if (type) void this.router.navigate(['/types', type.designation]);
      });
  }

  protected referenceText(t: TypeView): string {
    const op = t.operatingPoints[0];
    if (!op) return '';
    const vg2 = op.vg2Volts !== null ? `, Vg2 ${op.vg2Volts} V` : '';
    return `Va ${op.vaVolts} V, Vg1 ${op.vg1Volts} V${vg2}: Ia ${op.iaMilliamps} mA`;
  }
}
