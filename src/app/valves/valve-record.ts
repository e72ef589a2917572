import { DatePipe, DecimalPipe, DOCUMENT } from '@angular/common';
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
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import { catchError, of } from 'rxjs';
import type { GradeThresholds } from '../../../shared/grading/grade-thresholds';
import { apiErrorMessage } from '../core/api-error-message';
import { Auth } from '../core/auth';
import { ValveTypesApi } from '../core/valve-types-api';
import { SweepStatusChip } from '../sweeps/sweep-status-chip';
import { gradeReason, latestFigures } from './grade-reason';
import { ValveFieldsForm } from './valve-fields-form';
import { ValveGradeChip } from './valve-grade-chip';
import { ORIGIN_LABELS, STATUS_LABELS } from './valve-labels';
import { ValvePhotos } from './valve-photos';
import { ValveTrendChart } from './valve-trend-chart';
import { ValvesApi, type ValveDetail } from './valves-api';

/** A row of the measured-against-nominal table. */
interface NominalRow {
  figure: string;
  unit: string;
  measured: number | null;
  nominal: number | null;
  percent: number | null;
}

/** One valve's record: its fields, grade, photos, label, sweeps and the trend of its figures. */
@Component({
  selector: 'app-valve-record',
  imports: [
    DatePipe,
    DecimalPipe,
    MatButtonModule,
    MatIconModule,
    ReactiveFormsModule,
    RouterLink,
    SweepStatusChip,
    ValveFieldsForm,
    ValveGradeChip,
    ValvePhotos,
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
  protected readonly auth = inject(Auth);
  protected readonly types = toSignal(
    inject(ValveTypesApi)
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
  protected readonly latest = computed(() => latestFigures(this.valve()?.trend ?? []));
  protected readonly referenceText = computed(() => {
    const p = this.valve()?.referencePoint;
    if (!p) return '';
    const vg2 = p.vg2Volts !== null ? `, Vg2 ${p.vg2Volts} V` : '';
    return `Va ${p.vaVolts} V, Vg1 ${p.vg1Volts} V${vg2}`;
  });
  protected readonly reason = computed(() => {
    const v = this.valve();
    return v ? gradeReason(v.trend, v.referencePoint) : '';
  });
  private readonly type = computed(
    () => this.types().find((t) => t.designation === this.valve()?.type) ?? null,
  );
  protected readonly nominalRows = computed<NominalRow[]>(() => {
    const v = this.valve();
    const f = this.latest();
    if (!v || !f) return [];
    const op = this.type()?.operatingPoints[0];
    const pct = (m: number | null, n: number | null | undefined) =>
      m !== null && n ? (m / n) * 100 : null;
    const nominalRa = op?.raKiloohms ?? null;
    const nominalMu = op?.mu ?? null;
    return [
      {
        figure: 'Ia',
        unit: 'mA',
        measured: f.iaMilliamps,
        nominal: v.referencePoint.iaMilliamps,
        percent: f.iaPercent,
      },
      {
        figure: 'gm',
        unit: 'mA/V',
        measured: f.gmMicrosiemens === null ? null : f.gmMicrosiemens / 1000,
        nominal:
          v.referencePoint.gmMicrosiemens === null ? null : v.referencePoint.gmMicrosiemens / 1000,
        percent: f.gmPercent,
      },
      {
        figure: 'ra',
        unit: 'kΩ',
        measured: f.raKiloohms,
        nominal: nominalRa,
        percent: pct(f.raKiloohms, nominalRa),
      },
      { figure: 'mu', unit: '', measured: f.mu, nominal: nominalMu, percent: pct(f.mu, nominalMu) },
    ];
  });

  constructor() {
    effect(() => {
      const id = this.valveId();
      untracked(() => this.load(id));
    });
  }

  /** A measured or nominal figure to three significant digits: 0.0545 mA stays readable. */
  protected figure(value: number | null): string {
    if (value === null) return '—';
    return Math.abs(value) >= 100
      ? String(Math.round(value * 10) / 10)
      : String(Number(value.toPrecision(3)));
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
