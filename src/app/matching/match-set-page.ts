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
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import { catchError, filter, of, switchMap, type Observable } from 'rxjs';
import { apiErrorMessage } from '../core/api-error-message';
import { Auth } from '../core/auth';
import { dispositionFileName, saveBlob } from '../core/save-blob';
import { ValveTypesApi, type ValveTypeView } from '../core/valve-types-api';
import { GRADE_LABELS, STATUS_LABELS } from '../valves/valve-labels';
import { BuyerLinks } from './buyer-links';
import { ConfirmDialog, type ConfirmDialogData } from './confirm-dialog';
import { figureText, groupNoun, percentText } from './match-labels';
import { MatchSetsApi, type MatchSetDetail, type MatchSetMember } from './match-sets-api';
import { MatchSetStatusChip } from './match-set-status-chip';
import { MemberCurves, sameMembers } from './member-curves';
import { pointConditions } from './point-conditions';
import { PointSpreadTable } from './point-spread-table';
import { SendReportDialog, type SendReportDialogData } from './send-report-dialog';

/** An operating point column of the members table. */
interface PointColumn {
  label: string;
  /** Where the point lies, in words (V, mA). */
  conditions: string;
  /** Each valve taken at the Vg1 giving the point's Ia: its Vg1 is a reading. */
  equalCurrent: boolean;
}

/** A match set's own page: members, figures, curves, report, mailings, buyer links, actions. */
@Component({
  selector: 'app-match-set-page',
  imports: [
    BuyerLinks,
    DatePipe,
    MatButtonModule,
    MatIconModule,
    MatchSetStatusChip,
    MemberCurves,
    PointSpreadTable,
    RouterLink,
  ],
  templateUrl: './match-set-page.html',
  styleUrl: './match-set-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class MatchSetPage {
  /** Route parameter. */
  readonly id = input.required<string>();

  private readonly api = inject(MatchSetsApi);
  private readonly dialog = inject(MatDialog);
  private readonly document = inject(DOCUMENT);
  protected readonly auth = inject(Auth);
  private readonly types = toSignal(
    inject(ValveTypesApi)
      .list()
      .pipe(catchError(() => of([] as ValveTypeView[]))),
    { initialValue: [] as ValveTypeView[] },
  );

  protected readonly set = signal<MatchSetDetail | null>(null);
  protected readonly error = signal<string | null>(null);
  protected readonly actionError = signal<string | null>(null);
  protected readonly notice = signal<string | null>(null);
  protected readonly busy = signal<'release' | 'sell' | 'pdf' | null>(null);
  protected readonly percent = percentText;
  protected readonly figure = figureText;

  protected readonly setId = computed(() => Number(this.id()));
  protected readonly reserved = computed(() => this.set()?.status === 'reserved');
  protected readonly noun = computed(() => groupNoun(this.set()?.memberCount ?? 0));
  protected readonly pointColumns = computed<PointColumn[]>(() => {
    const s = this.set();
    if (!s) return [];
    const where = this.conditions();
    const labels = [...new Set(s.members.flatMap((m) => m.readings.map((r) => r.label)))];
    return labels.map((label) => ({
      label,
      conditions: where.get(label) ?? '',
      equalCurrent: s.figures.points.some((p) => p.label === label && p.kind === 'equal-current'),
    }));
  });
  /** Where each operating point lies, by label (V, mA). */
  protected readonly conditions = computed(() => {
    const s = this.set();
    if (!s) return new Map<string, string>();
    const type = this.types().find((t) => t.designation === s.valveType) ?? null;
    return pointConditions(s.criteria, type);
  });
  protected readonly curveMembers = computed(
    () => (this.set()?.members ?? []).map((m) => ({ label: m.label, sweepId: m.sweepId })),
    // The same members again (a reloaded set or run) must not fetch their sweeps again.
    { equal: sameMembers },
  );
  protected readonly windowText = computed(() => {
    const w = this.set()?.criteria['window'] as
      | { vaMinVolts: number; vaMaxVolts: number; iaMinMilliamps: number; iaMaxMilliamps: number }
      | undefined;
    return w
      ? `Whole curves compared over Va ${w.vaMinVolts}–${w.vaMaxVolts} V, ` +
          `Ia ${w.iaMinMilliamps}–${w.iaMaxMilliamps} mA.`
      : '';
  });

  constructor() {
    effect(() => {
      const id = this.setId();
      untracked(() => this.load(id));
    });
  }

  protected reading(member: MatchSetMember, label: string) {
    return member.readings.find((r) => r.label === label) ?? null;
  }

  protected gradeText(m: MatchSetMember): string {
    if (!m.grade) return 'Not graded';
    const word = GRADE_LABELS[m.grade as keyof typeof GRADE_LABELS] ?? m.grade;
    return m.gradePercent === null ? word : `${word} · ${Math.round(m.gradePercent)} %`;
  }

  protected statusText(m: MatchSetMember): string {
    return STATUS_LABELS[m.status as keyof typeof STATUS_LABELS] ?? m.status;
  }

  /** The sweep's conditions in words; units stay on their numbers' line. */
  protected conditionsText(m: MatchSetMember): string {
    const c = m.conditions;
    if (!c) return '—';
    const v = (x: number) => `${x}\u00a0V`;
    const parts = [`Va ${c.vaStartVolts}–${v(c.vaStopVolts)} in ${v(c.vaStepVolts)} steps`];
    if (c.vg1Volts.length) {
      const curves = `${c.vg1Volts.length}\u00a0curves`;
      parts.push(`Vg1 ${Math.max(...c.vg1Volts)} to ${v(Math.min(...c.vg1Volts))} (${curves})`);
    }
    if (c.vg2Volts > 0) parts.push(`Vg2 ${v(c.vg2Volts)}`);
    parts.push(`heater ${v(c.heaterVolts)}`);
    return parts.join(', ');
  }

  protected release(): void {
    const s = this.set();
    if (!s) return;
    this.confirmThen(
      {
        title: `Release ${s.code}?`,
        message: `${s.labels.join(', ')} go back to stock and can be matched again.`,
        confirm: 'Release set',
      },
      'release',
      () => this.api.release(s.id),
    );
  }

  protected sell(): void {
    const s = this.set();
    if (!s) return;
    this.confirmThen(
      {
        title: `Mark ${s.code} sold?`,
        message: `${s.labels.join(', ')} are marked sold. This cannot be undone here.`,
        confirm: 'Mark sold',
      },
      'sell',
      () => this.api.sell(s.id),
    );
  }

  protected sendReport(): void {
    const s = this.set();
    if (!s) return;
    const data: SendReportDialogData = { setId: s.id, code: s.code };
    this.dialog
      .open(SendReportDialog, { data, autoFocus: 'first-tabbable' })
      .afterClosed()
      .pipe(filter((sent) => !!sent))
      .subscribe((sent) => {
        this.notice.set(`Report sent to ${sent!.to}.`);
        this.load(s.id);
      });
  }

  protected downloadPdf(): void {
    const s = this.set();
    if (!s || this.busy()) return;
    this.busy.set('pdf');
    this.actionError.set(null);
    this.api.reportPdf(s.id).subscribe({
      next: (res) => {
        this.busy.set(null);
        const name =
          dispositionFileName(res.headers.get('Content-Disposition')) ??
          `match-report-${s.code}.pdf`;
        if (res.body) saveBlob(this.document, res.body, name);
      },
      error: (err: unknown) => {
        this.busy.set(null);
        this.actionError.set(apiErrorMessage(err, 'The PDF could not be made.'));
      },
    });
  }

  protected reload(): void {
    this.load(this.setId());
  }

  private confirmThen(
    data: ConfirmDialogData,
    action: 'release' | 'sell',
    call: () => Observable<MatchSetDetail>,
  ): void {
    this.dialog
      .open(ConfirmDialog, { data })
      .afterClosed()
      .pipe(
        filter((yes) => yes === true),
        switchMap(() => {
          this.busy.set(action);
          this.actionError.set(null);
          this.notice.set(null);
          return call();
        }),
      )
      .subscribe({
        next: (set) => {
          this.busy.set(null);
          this.set.set(set);
        },
        error: (err: unknown) => {
          this.busy.set(null);
          this.actionError.set(apiErrorMessage(err, 'The set was not changed.'));
        },
      });
  }

  private load(id: number): void {
    this.api.get(id).subscribe({
      next: (set) => {
        this.set.set(set);
        this.error.set(null);
      },
      error: (err: unknown) => this.error.set(apiErrorMessage(err, `Set ${id} could not be read.`)),
    });
  }
}
