import { HttpErrorResponse } from '@angular/common/http';
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
import { takeUntilDestroyed, toSignal } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatExpansionModule } from '@angular/material/expansion';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { Router } from '@angular/router';
import { catchError, merge, of } from 'rxjs';
import { METRIC_DESCRIPTION } from '../../../shared/matching/metric-description';
import { apiErrorMessage } from '../core/api-error-message';
import { Auth } from '../core/auth';
import { ValveTypesApi, type ValveTypeView } from '../core/valve-types-api';
import { CriteriaFormView } from './criteria-form';
import {
  buildCriteriaForm,
  criteriaDefaults,
  criteriaValue,
  runRequest,
  syncCriteriaControls,
  type CriteriaValue,
} from './criteria-form-model';
import { MatchGroupList } from './match-group-list';
import { groupNoun, groupTitle } from './match-labels';
import { MatchSetsApi } from './match-sets-api';
import { MatchingApi, type MatchRun, type MatchRunRequest } from './matching-api';
import { MemberCurves, sameMembers } from './member-curves';

/** Fields a change of type keeps: the pool, the set size and how strict the match is. */
const KEPT_ON_TYPE_CHANGE = [
  'groupSize',
  'statuses',
  'minGrade',
  'sweptSince',
  'compareAt',
  'iaWeight',
  'gmWeight',
  'curveWeight',
  'tolerancePercent',
] as const satisfies readonly (keyof CriteriaValue)[];

/** Matching: criteria, a run over the stock, its groups, their curves, and reserving a set. */
@Component({
  selector: 'app-matching-page',
  imports: [
    CriteriaFormView,
    MatButtonModule,
    MatExpansionModule,
    MatIconModule,
    MatProgressBarModule,
    MatchGroupList,
    MemberCurves,
  ],
  templateUrl: './matching-page.html',
  styleUrl: './matching-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class MatchingPage {
  /** Query parameter ?run=ID: the run shown, kept so the page survives a reload. */
  readonly run = input<string>();

  private readonly api = inject(MatchingApi);
  private readonly sets = inject(MatchSetsApi);
  private readonly router = inject(Router);
  protected readonly auth = inject(Auth);
  protected readonly types = toSignal(
    inject(ValveTypesApi)
      .list()
      .pipe(catchError(() => of([] as ValveTypeView[]))),
    { initialValue: null },
  );
  protected readonly form = buildCriteriaForm(inject(NonNullableFormBuilder));
  protected readonly chosenType = signal<string>('');
  protected readonly type = computed(
    () => this.types()?.find((t) => t.designation === this.chosenType()) ?? null,
  );

  protected readonly result = signal<MatchRun | null>(null);
  protected readonly running = signal(false);
  protected readonly loadingRun = signal(false);
  protected readonly runError = signal<string | null>(null);
  protected readonly selected = signal<number | null>(null);
  protected readonly reserving = signal(false);
  protected readonly reserveError = signal<string | null>(null);
  protected readonly metric = computed(
    () => this.result()?.metricDescription ?? METRIC_DESCRIPTION,
  );
  protected readonly selectedGroup = computed(() => {
    const i = this.selected();
    return i === null ? null : (this.result()?.groups[i] ?? null);
  });
  protected readonly selectedTitle = computed(() => {
    const g = this.selectedGroup();
    return g ? groupTitle(g.members.length, this.selected()!) : '';
  });
  protected readonly curveMembers = computed(
    () =>
      (this.selectedGroup()?.members ?? []).map((m) => ({ label: m.label, sweepId: m.sweepId })),
    // The same members again (a reloaded set or run) must not fetch their sweeps again.
    { equal: sameMembers },
  );
  protected readonly reserveLabel = computed(() => {
    const g = this.selectedGroup();
    return g ? `Reserve this ${groupNoun(g.members.length)}` : 'Reserve this set';
  });
  /** The criteria of a run from the URL, waiting for the type library. */
  private readonly pendingCriteria = signal<Partial<MatchRunRequest> | null>(null);

  constructor() {
    const f = this.form.controls;
    syncCriteriaControls(this.form, null);
    f.valveType.valueChanges
      .pipe(takeUntilDestroyed())
      .subscribe((designation) => this.changeType(designation));
    merge(f.compareAt.valueChanges, f.useDrive.valueChanges)
      .pipe(takeUntilDestroyed())
      .subscribe(() => syncCriteriaControls(this.form, this.type()));
    effect(() => {
      const id = Number(this.run());
      untracked(() => {
        if (Number.isInteger(id) && id > 0 && this.result()?.id !== id) this.loadRun(id);
      });
    });
    effect(() => {
      const types = this.types();
      const criteria = this.pendingCriteria();
      if (!types || !criteria) return;
      untracked(() => this.restoreCriteria(types, criteria));
    });
  }

  protected resetDefaults(): void {
    const type = this.type();
    if (!type) return;
    this.setForm(type, criteriaDefaults(type));
  }

  protected runMatching(): void {
    if (this.form.invalid || this.running()) return;
    this.running.set(true);
    this.runError.set(null);
    this.reserveError.set(null);
    this.api.run(runRequest(this.form)).subscribe({
      next: (run) => {
        this.running.set(false);
        this.show(run);
        void this.router.navigate([], { queryParams: { run: run.id } });
      },
      error: (err: unknown) => {
        this.running.set(false);
        this.runError.set(apiErrorMessage(err, 'The matching run failed.'));
      },
    });
  }

  protected selectGroup(index: number): void {
    this.selected.set(index);
    this.reserveError.set(null);
  }

  protected reserve(): void {
    const run = this.result();
    const index = this.selected();
    if (!run || index === null || this.reserving()) return;
    this.reserving.set(true);
    this.reserveError.set(null);
    this.sets.reserve(run.id, index).subscribe({
      next: (set) => {
        this.reserving.set(false);
        void this.router.navigate(['/match-sets', set.id]);
      },
      error: (err: unknown) => {
        this.reserving.set(false);
        const message = apiErrorMessage(err, 'The set was not reserved.');
        this.reserveError.set(
          err instanceof HttpErrorResponse && err.status === 409
            ? `Not reserved: ${message}. Run the matching again to group what is still free.`
            : message,
        );
      },
    });
  }

  private changeType(designation: string): void {
    const previous = this.chosenType();
    if (designation === previous) return;
    this.chosenType.set(designation);
    const type = this.type();
    if (!type) return;
    const raw = this.form.getRawValue();
    // The first choice of a type takes its defaults whole; later ones keep the user's pool.
    const kept = previous ? Object.fromEntries(KEPT_ON_TYPE_CHANGE.map((k) => [k, raw[k]])) : {};
    this.setForm(type, { ...criteriaDefaults(type), ...kept });
  }

  private setForm(type: ValveTypeView, value: CriteriaValue): void {
    this.chosenType.set(type.designation);
    this.form.setValue(value, { emitEvent: false });
    syncCriteriaControls(this.form, type);
  }

  private loadRun(id: number): void {
    this.loadingRun.set(true);
    this.runError.set(null);
    this.api.getRun(id).subscribe({
      next: (run) => {
        this.loadingRun.set(false);
        this.show(run);
        this.pendingCriteria.set(run.criteria);
      },
      error: (err: unknown) => {
        this.loadingRun.set(false);
        this.runError.set(apiErrorMessage(err, `Run ${id} could not be loaded.`));
      },
    });
  }

  private restoreCriteria(types: readonly ValveTypeView[], criteria: Partial<MatchRunRequest>) {
    this.pendingCriteria.set(null);
    const name = (criteria.valveType ?? '').toUpperCase();
    const type = types.find(
      (t) =>
        t.designation.toUpperCase() === name || t.equivalents.some((e) => e.toUpperCase() === name),
    );
    if (type) this.setForm(type, criteriaValue(criteria, type));
  }

  private show(run: MatchRun): void {
    this.result.set(run);
    this.selected.set(run.groups.length ? 0 : null);
  }
}
