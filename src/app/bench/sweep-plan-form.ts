import { HttpErrorResponse } from '@angular/common/http';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  DestroyRef,
  inject,
  input,
  output,
  signal,
} from '@angular/core';
import { takeUntilDestroyed, toSignal } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatCheckboxModule } from '@angular/material/checkbox';
import type { ErrorStateMatcher } from '@angular/material/core';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { filter, finalize, map, switchMap, tap } from 'rxjs';
import { hasScreen, limitsFromType } from '../../../shared/catalog/valve-types';
import {
  checkPlan,
  limitsFromDevice,
  strictestLimits,
  type PlanLimits,
} from '../../../shared/domain/plan-check';
import { plannedPointCount, type SweepKind, type SweepPlan } from '../../../shared/domain/sweep';
import type { BenchView, SweepView } from '../../../shared/hub/messages';
import { apiErrorBody, apiErrorMessage } from '../core/api-error-message';
import { SweepsApi } from '../core/sweeps-api';
import { ValveRecordPicker } from '../valves/valve-record-picker';
import type { ValveView } from '../valves/valves-api';
import type { ValveTypeView } from '../core/valve-types-api';
import { StartSweepDialog, type StartSweepDialogData } from './start-sweep-dialog';
import { vg1Range, vg1Steps } from './vg1-steps';

/** Most curves one anode family may have; more would not be readable on one chart. */
export const MAX_FAMILY_CURVES = 40;
/** Most grid steps (points) of one transfer curve; the hub takes at most 200 grid voltages. */
export const MAX_TRANSFER_POINTS = 200;

const NUMBER_FIELDS = [
  'vaStartVolts',
  'vaStopVolts',
  'vaStepVolts',
  'vg1StartVolts',
  'vg1StopVolts',
  'vg1StepVolts',
  'vg2Volts',
  'heaterVolts',
  'iaMaxMilliamps',
  'paMaxWatts',
  'iaTripMilliamps',
  'warmupSeconds',
  'settleMs',
] as const;

type NumberField = (typeof NUMBER_FIELDS)[number];
/** Where a problem is shown: a number field, the generated grid list, the type, or the form. */
type ProblemKey = NumberField | 'vg1Volts' | 'valveType' | 'form';

const NO_LIMITS: PlanLimits = {
  vaMaxVolts: Number.POSITIVE_INFINITY,
  vg2MaxVolts: Number.POSITIVE_INFINITY,
  vg1MinVolts: Number.NEGATIVE_INFINITY,
  vg1MaxVolts: Number.POSITIVE_INFINITY,
  iaMaxMilliamps: Number.POSITIVE_INFINITY,
  paMaxWatts: Number.POSITIVE_INFINITY,
  heaterMaxVolts: Number.POSITIVE_INFINITY,
};

/**
 * The sweep plan form: valve type preset, voltages, limits and timing. It checks the plan the
 * way the hub does (checkPlan against the type's ratings and the bench's limits), shows each
 * problem beside its field, confirms the voltages in a dialog and then starts the sweep.
 */
/** Warm-up below which the plan form warns of a cold cathode, s (common practice: 10-20 s). */
const COLD_CATHODE_SECONDS = 15;

@Component({
  selector: 'app-sweep-plan-form',
  imports: [
    MatButtonModule,
    MatButtonToggleModule,
    MatCheckboxModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatSelectModule,
    ReactiveFormsModule,
    ValveRecordPicker,
  ],
  templateUrl: './sweep-plan-form.html',
  styleUrl: './sweep-plan-form.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SweepPlanForm {
  private readonly api = inject(SweepsApi);
  private readonly dialog = inject(MatDialog);
  private readonly destroyRef = inject(DestroyRef);

  /** The bench the sweep would run on. */
  readonly bench = input<BenchView | null>(null);
  readonly valveTypes = input<readonly ValveTypeView[]>([]);
  /** Admins may override the type's ratings (never the bench's limits). */
  readonly canOverride = input(false);
  /** A sweep is pending or running on the bench. */
  readonly busy = input(false);
  /** Emits the hub's record of a sweep once it has been accepted. */
  readonly started = output<SweepView>();

  private readonly fb = inject(NonNullableFormBuilder);
  protected readonly form = this.fb.group({
    valveType: [''],
    valveLabel: [''],
    kind: this.fb.control<SweepKind>('anode'),
    vaStartVolts: this.fb.control<number | null>(null),
    vaStopVolts: this.fb.control<number | null>(null),
    vaStepVolts: this.fb.control<number | null>(null),
    vg1StartVolts: this.fb.control<number | null>(null),
    vg1StopVolts: this.fb.control<number | null>(null),
    vg1StepVolts: this.fb.control<number | null>(null),
    vg2Volts: this.fb.control<number | null>(null),
    heaterVolts: this.fb.control<number | null>(null),
    iaMaxMilliamps: this.fb.control<number | null>(null),
    paMaxWatts: this.fb.control<number | null>(null),
    iaTripMilliamps: this.fb.control<number | null>(null),
    warmupSeconds: this.fb.control<number | null>(null),
    settleMs: this.fb.control<number | null>(null),
    section: this.fb.control<1 | 2>(1),
    override: [false],
  });

  private readonly value = toSignal(
    this.form.valueChanges.pipe(map(() => this.form.getRawValue())),
    { initialValue: this.form.getRawValue() },
  );
  private readonly serverProblems = signal<Partial<Record<ProblemKey, string>>>({});
  protected readonly submitting = signal(false);
  /** The valve record the sweep is saved to, or null. */
  protected readonly valveRecord = signal<ValveView | null>(null);
  protected readonly formError = signal<string | null>(null);

  protected readonly selectedType = computed(
    () => this.valveTypes().find((t) => t.designation === this.value().valveType) ?? null,
  );
  protected readonly isTransfer = computed(() => this.value().kind === 'transfer');
  protected readonly showScreen = computed(() => {
    const type = this.selectedType();
    return type ? hasScreen(type.valveClass) : false;
  });
  protected readonly overriding = computed(() => this.canOverride() && this.value().override);

  /** The generated grid-1 list (one more than the maximum when there are too many). */
  protected readonly vg1List = computed(() => {
    const v = this.value();
    const max = this.isTransfer() ? MAX_TRANSFER_POINTS : MAX_FAMILY_CURVES;
    return vg1Steps(v.vg1StartVolts, v.vg1StopVolts, v.vg1StepVolts, max);
  });

  private readonly typeLimits = computed(() => {
    const type = this.selectedType();
    return type ? limitsFromType(type) : null;
  });
  /** The tracer's own limits and those an admin set for the bench. */
  private readonly benchLimits = computed(() => {
    const bench = this.bench();
    const sets: PlanLimits[] = [];
    if (bench?.capabilities) sets.push(limitsFromDevice(bench.capabilities));
    if (bench?.limits) sets.push({ ...NO_LIMITS, ...bench.limits });
    return sets.length ? strictestLimits(...sets) : null;
  });
  /** What the plan is checked against: the bench always, the type unless overridden. */
  protected readonly limits = computed(() => {
    const sets = [this.overriding() ? null : this.typeLimits(), this.benchLimits()].filter(
      (s): s is PlanLimits => s !== null,
    );
    return sets.length ? strictestLimits(...sets) : NO_LIMITS;
  });

  /** The plan as entered, or null while a number is missing. */
  protected readonly plan = computed<SweepPlan | null>(() => {
    const v = this.value();
    if (NUMBER_FIELDS.some((f) => v[f] === null && this.fieldShown(f))) return null;
    const n = (f: NumberField) => v[f] ?? 0;
    const transfer = v.kind === 'transfer';
    return {
      kind: v.kind,
      vaStartVolts: n('vaStartVolts'),
      // A transfer curve holds Va fixed; the hub ignores stop and step, so keep them plain.
      vaStopVolts: transfer ? n('vaStartVolts') : n('vaStopVolts'),
      vaStepVolts: transfer ? 1 : n('vaStepVolts'),
      vg1Volts: this.vg1List(),
      vg2Volts: this.showScreen() ? n('vg2Volts') : 0,
      heaterVolts: n('heaterVolts'),
      iaMaxMilliamps: n('iaMaxMilliamps'),
      paMaxWatts: n('paMaxWatts'),
      iaTripMilliamps: n('iaTripMilliamps'),
      warmupSeconds: n('warmupSeconds'),
      settleMs: n('settleMs'),
      ...(v.section === 2 && (this.selectedType()?.sections ?? 1) >= 2 ? { section: 2 } : {}),
    };
  });

  protected readonly plannedPoints = computed(() => {
    const plan = this.plan();
    return plan && plan.vg1Volts.length ? plannedPointCount(plan) : 0;
  });

  /**
   * True when the warm-up is shorter than an indirectly heated cathode needs to emit fully
   * (common practice: about 10-20 s); such a sweep reads low and its curves may cross.
   */
  protected readonly shortWarmup = computed(() => {
    const seconds = this.value().warmupSeconds;
    return seconds !== null && seconds >= 0 && seconds < COLD_CATHODE_SECONDS;
  });

  /** Every problem of the plan, by where it is shown. */
  protected readonly problems = computed(() => {
    const out = new Map<ProblemKey, string>();
    const v = this.value();
    if (!this.selectedType())
      out.set('valveType', 'Choose the valve type: its ratings bound the plan');
    for (const f of NUMBER_FIELDS) {
      if (v[f] === null && this.fieldShown(f)) out.set(f, 'Enter a number');
    }
    if (v.vg1StepVolts !== null && v.vg1StepVolts <= 0)
      out.set('vg1StepVolts', 'Step must be above 0 V');
    const max = this.isTransfer() ? MAX_TRANSFER_POINTS : MAX_FAMILY_CURVES;
    if (this.vg1List().length > max) {
      out.set('vg1Volts', `That makes more than ${max} grid steps; use a larger step`);
    }
    const plan = this.plan();
    if (plan && out.size === 0) {
      for (const problem of checkPlan(plan, this.limits())) {
        const key = problemKey(problem.field);
        if (!out.has(key)) out.set(key, sentence(problem.message));
      }
    }
    for (const [key, message] of Object.entries(this.serverProblems())) {
      if (message && !out.has(key as ProblemKey)) out.set(key as ProblemKey, message);
    }
    return out;
  });

  /** Why Start is unavailable, or null when it is available. */
  protected readonly startBlocker = computed(() => {
    const bench = this.bench();
    if (!bench) return 'Select a bench.';
    if (!bench.bridgeOnline) return `${bench.name} is offline.`;
    if (bench.status && !bench.status.deviceOnline)
      return `The tracer of ${bench.name} is not connected.`;
    if (this.busy()) return `A sweep is already running on ${bench.name}.`;
    if (this.submitting()) return 'Starting…';
    if (!this.selectedType()) return 'Choose the valve type to start.';
    if (this.problems().size) return 'Correct the marked fields to start.';
    return null;
  });

  /** Error-state matchers: a field turns red when the plan has a problem shown at it. */
  protected readonly errors = this.errorMatchers();

  constructor() {
    this.form.controls.valveType.valueChanges
      .pipe(takeUntilDestroyed())
      .subscribe((designation) => {
        const type = this.valveTypes().find((t) => t.designation === designation);
        if (type) this.applyPlan(type.defaultPlan);
      });
    this.form.valueChanges.pipe(takeUntilDestroyed()).subscribe(() => {
      if (Object.keys(this.serverProblems()).length) this.serverProblems.set({});
    });
  }

  /** A picked record sets the type and label from the record. */
  protected pickRecord(valve: ValveView | null): void {
    this.valveRecord.set(valve);
    if (!valve) return;
    if (this.valveTypes().some((t) => t.designation === valve.type)) {
      this.form.controls.valveType.setValue(valve.type);
    }
    this.form.controls.valveLabel.setValue(valve.label);
  }

  /** The message shown at a field, or null. */
  protected problem(key: ProblemKey): string | null {
    return this.problems().get(key) ?? null;
  }

  /** The limit that binds a field: "max 300 V" from the type, "bench max 250 mA" otherwise. */
  protected limitHint(key: 'vaMaxVolts' | 'vg2MaxVolts' | 'paMaxWatts' | 'iaMaxMilliamps'): string {
    const value = this.limits()[key];
    if (!Number.isFinite(value)) return '';
    const unit = key === 'paMaxWatts' ? 'W' : key === 'iaMaxMilliamps' ? 'mA' : 'V';
    const fromType = !this.overriding() && this.typeLimits()?.[key] === value;
    return `${fromType ? 'max' : 'bench max'} ${round(value)} ${unit}`;
  }

  /** Opens the confirmation, then posts the plan. */
  protected requestStart(): void {
    const plan = this.plan();
    const bench = this.bench();
    if (!plan || !bench || this.startBlocker()) {
      this.form.markAllAsTouched();
      return;
    }
    const v = this.value();
    const valveId = this.valveRecord()?.id ?? null;
    const data: StartSweepDialogData = {
      benchName: bench.name,
      plan,
      valveType: v.valveType || null,
      valveLabel: v.valveLabel.trim() || null,
      override: this.overriding(),
    };
    this.formError.set(null);
    this.dialog
      .open(StartSweepDialog, { data, width: '560px', maxWidth: '95vw' })
      .afterClosed()
      .pipe(
        filter((confirmed) => confirmed === true),
        tap(() => this.submitting.set(true)),
        switchMap(() =>
          this.api
            .start({
              benchId: bench.id,
              plan,
              ...(data.valveType ? { valveType: data.valveType } : {}),
              ...(data.valveLabel ? { valveLabel: data.valveLabel } : {}),
              ...(valveId !== null ? { valveId } : {}),
              ...(data.override ? { override: true } : {}),
            })
            .pipe(finalize(() => this.submitting.set(false))),
        ),
        takeUntilDestroyed(this.destroyRef),
      )
      .subscribe({
        next: (sweep) => this.started.emit(sweep),
        error: (err: unknown) => this.showStartError(err),
      });
  }

  private showStartError(err: unknown): void {
    const body = apiErrorBody(err);
    if (body?.fields) {
      const fields: Partial<Record<ProblemKey, string>> = {};
      for (const [field, message] of Object.entries(body.fields)) {
        fields[problemKey(field.replace(/^plan\./, ''))] = sentence(message);
      }
      this.serverProblems.set(fields);
    }
    const status = err instanceof HttpErrorResponse ? err.status : 0;
    const fallback =
      status === 403
        ? 'Your role may not start sweeps.'
        : status === 409
          ? 'The bench is offline or busy.'
          : 'The hub did not start the sweep.';
    this.formError.set(apiErrorMessage(err, fallback));
  }

  private applyPlan(plan: SweepPlan): void {
    const grid = vg1Range(plan.vg1Volts);
    this.form.patchValue({
      kind: plan.kind,
      vaStartVolts: plan.vaStartVolts,
      vaStopVolts: plan.vaStopVolts,
      vaStepVolts: plan.vaStepVolts,
      vg1StartVolts: grid.startVolts,
      vg1StopVolts: grid.stopVolts,
      vg1StepVolts: grid.stepVolts,
      vg2Volts: plan.vg2Volts,
      heaterVolts: plan.heaterVolts,
      iaMaxMilliamps: plan.iaMaxMilliamps,
      paMaxWatts: plan.paMaxWatts,
      iaTripMilliamps: plan.iaTripMilliamps,
      warmupSeconds: plan.warmupSeconds,
      settleMs: plan.settleMs,
      section: plan.section ?? 1,
    });
  }

  private errorMatchers(): Record<NumberField | 'valveType', ErrorStateMatcher> {
    const matchers = {} as Record<NumberField | 'valveType', ErrorStateMatcher>;
    for (const key of NUMBER_FIELDS) {
      const gridEnd = key === 'vg1StartVolts' || key === 'vg1StopVolts';
      matchers[key] = {
        isErrorState: () =>
          this.problems().has(key) || (gridEnd && this.problems().has('vg1Volts')),
      };
    }
    // No type yet is where every plan starts, not a mistake: red only once the user was there.
    matchers.valveType = {
      isErrorState: (control) => !!control?.touched && this.problems().has('valveType'),
    };
    return matchers;
  }

  private fieldShown(field: NumberField): boolean {
    if (field === 'vg2Volts') return this.showScreen();
    if (field === 'vaStopVolts' || field === 'vaStepVolts') return !this.isTransfer();
    return true;
  }
}

/** Where a plan field's problem is shown in this form. */
function problemKey(field: string): ProblemKey {
  if (field === 'vg1Volts') return 'vg1Volts';
  if ((NUMBER_FIELDS as readonly string[]).includes(field)) return field as NumberField;
  if (field === 'valveType') return 'valveType';
  return 'form';
}

function sentence(message: string): string {
  return message.charAt(0).toUpperCase() + message.slice(1);
}

function round(x: number): number {
  return Math.round(x * 100) / 100;
}
