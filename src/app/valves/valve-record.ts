import { DatePipe, DOCUMENT } from '@angular/common';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  effect,
  inject,
  input,
  signal,
  untracked,
} from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { HttpClient } from '@angular/common/http';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { MatSnackBar } from '@angular/material/snack-bar';
import { Router, RouterLink } from '@angular/router';
import { catchError, filter, of, switchMap } from 'rxjs';
import type { GradeThresholds } from '../../../shared/grading/grade-thresholds';
import { apiErrorMessage } from '../core/api-error-message';
import { Auth } from '../core/auth';
import { PartnerPanel } from '../matching/partner-panel';
import { SweepStatusChip } from '../sweeps/sweep-status-chip';
import { typeFor } from '../sweeps/sweep-nominal';
import { TypesApi } from '../types/types-api';
import { DeleteValveDialog, type DeleteValveDialogData } from './delete-valve-dialog';
import { figureText } from './family-figures';
import { recordGrade } from './record-grade';
import { trendPoints } from './trend-points';
import { ValveFamily } from './valve-family';
import { ValveFieldsForm } from './valve-fields-form';
import { ValveGradeChip } from './valve-grade-chip';
import { ORIGIN_LABELS, STATUS_LABELS } from './valve-labels';
import { ValvePhotos } from './valve-photos';
import { ValveQuickTests } from './valve-quick-tests';
import { ValveTrendChart } from './valve-trend-chart';
import { ValvesApi, type ValveDetail } from './valves-api';

/**
 * One valve's record: its grade and why, fields, label, its curves against the type's nominal
 * ones, the trend of its figures, its quick tests, sweeps and photos.
 */
@Component({
  selector: 'app-valve-record',
  imports: [
    DatePipe,
    MatButtonModule,
    MatIconModule,
    PartnerPanel,
    ReactiveFormsModule,
    RouterLink,
    SweepStatusChip,
    ValveFamily,
    ValveFieldsForm,
    ValveGradeChip,
    ValvePhotos,
    ValveQuickTests,
    ValveTrendChart,
  ],
  templateUrl: './valve-record.html',
  styleUrl: './valve-record.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ValveRecord {
  /** Route parameter. */
  readonly id = input.required<string>();

  private readonly api = inject(ValvesApi);
  private readonly document = inject(DOCUMENT);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  private readonly router = inject(Router);
  protected readonly auth = inject(Auth);
  protected readonly types = toSignal(
    inject(TypesApi)
      .list()
      .pipe(catchError(() => of([]))),
    { initialValue: [] },
  );
  protected readonly thresholds = toSignal(
    inject(HttpClient)
      .get<{ gradeThresholds: GradeThresholds }>('/api/settings')
      .pipe(catchError(() => of(null))),
    { initialValue: null },
  );

  protected readonly valve = signal<ValveDetail | null>(null);
  protected readonly error = signal<string | null>(null);
  protected readonly saveMessage = signal<string | null>(null);
  protected readonly saving = signal(false);
  protected readonly labelUrl = signal<string | null>(null);
  protected readonly form = ValveFieldsForm.build(inject(NonNullableFormBuilder));
  protected readonly statusLabels = STATUS_LABELS;
  protected readonly originLabels = ORIGIN_LABELS;
  private labelSvg = '';

  protected readonly valveId = computed(() => Number(this.id()));
  protected readonly grade = computed(() => {
    const v = this.valve();
    return v ? recordGrade(v) : null;
  });
  protected readonly trend = computed(() =>
    trendPoints(this.valve()?.trend ?? [], this.valve()?.quickTests ?? []),
  );
  /** The data sheet's gm (mA/V) and Ia (mA) at the reference point. */
  protected readonly trendNominal = computed(() => {
    const p = this.valve()?.referencePoint;
    return p
      ? {
          gmMilliampsPerVolt: p.gmMicrosiemens === null ? null : p.gmMicrosiemens / 1000,
          iaMilliamps: p.iaMilliamps,
        }
      : null;
  });
  /** gm (mA/V) and Ia (mA) of each sweep at the reference point, by sweep id. */
  protected readonly sweepFigures = computed(
    () =>
      new Map(
        (this.valve()?.trend ?? []).map((f) => [
          f.sweepId,
          {
            gm: figureText(f.gmMicrosiemens === null ? null : f.gmMicrosiemens / 1000),
            ia: figureText(f.iaMilliamps),
          },
        ]),
      ),
  );
  protected readonly type = computed(() => {
    const v = this.valve();
    return v ? typeFor(this.types(), v.type) : null;
  });

  constructor() {
    effect(() => {
      const id = this.valveId();
      untracked(() => this.load(id));
    });
  }

  protected save(): void {
    const v = this.valve();
    if (!v || this.form.invalid) return;
    this.saving.set(true);
    this.saveMessage.set(null);
    this.api.update(v.id, ValveFieldsForm.fields(this.form)).subscribe({
      next: () => {
        this.saving.set(false);
        this.saveMessage.set('Saved.');
        this.load(v.id);
      },
      error: (err: unknown) => {
        this.saving.set(false);
        this.saveMessage.set(apiErrorMessage(err, 'The changes were not saved.'));
      },
    });
  }

  /** Admin only: asks, naming the label, then deletes the record and returns to the list. */
  protected deleteRecord(): void {
    const v = this.valve();
    if (!v) return;
    const data: DeleteValveDialogData = {
      label: v.label,
      type: v.type,
      sweepCount: v.sweeps.length,
      quickTestCount: v.quickTests.length,
    };
    this.dialog
      .open<DeleteValveDialog, DeleteValveDialogData, boolean>(DeleteValveDialog, {
        data,
        width: '480px',
        maxWidth: '95vw',
      })
      .afterClosed()
      .pipe(
        filter((yes) => yes === true),
        switchMap(() => this.api.remove(v.id)),
      )
      .subscribe({
        next: () => {
          this.snackBar.open(`${v.label} deleted.`, 'Dismiss', { duration: 5000 });
          void this.router.navigate(['/valves']);
        },
        error: (err: unknown) =>
          this.snackBar.open(
            `${v.label} was not deleted: ${apiErrorMessage(err, 'the hub refused.')}`,
            'Dismiss',
          ),
      });
  }

  /** Opens a window holding only the label and asks the browser to print it. */
  protected printLabel(): void {
    const win = this.document.defaultView?.open('', '_blank', 'width=480,height=320');
    if (!win || !this.labelSvg) return;
    const doc = win.document;
    doc.title = `Label ${this.valve()?.label ?? ''}`;
    const style = doc.createElement('style');
    style.textContent =
      '@page { size: 50mm 25mm; margin: 0 } html, body { margin: 0 } svg { width: 50mm; height: 25mm; display: block }';
    doc.head.appendChild(style);
    const holder = doc.createElement('div');
    // The SVG is our own hub's label; parse it as SVG so no script of it can run here.
    const svg = new DOMParser().parseFromString(this.labelSvg, 'image/svg+xml').documentElement;
    holder.appendChild(doc.importNode(svg, true));
    doc.body.appendChild(holder);
    win.focus();
    win.print();
  }

  private load(id: number): void {
    this.api.get(id).subscribe({
      next: (valve) => {
        this.valve.set(valve);
        this.error.set(null);
        this.form.reset({
          label: valve.label,
          type: valve.type,
          maker: valve.maker ?? '',
          dateCode: valve.dateCode ?? '',
          originKind: valve.originKind ?? '',
          originText: valve.originText ?? '',
          location: valve.location ?? '',
          status: valve.status,
          notes: valve.notes ?? '',
        });
        if (!this.auth.canOperate()) this.form.disable();
      },
      error: (err: unknown) =>
        this.error.set(apiErrorMessage(err, 'The valve record did not load.')),
    });
    this.api.labelSvg(id).subscribe({
      next: (svg) => {
        this.labelSvg = svg;
        // A data: URL: the content policy blocks blob: images.
        this.labelUrl.set(`data:image/svg+xml;charset=utf-8,${encodeURIComponent(svg)}`);
      },
      error: () => this.labelUrl.set(null),
    });
  }
}
