import {
  ChangeDetectionStrategy,
  Component,
  computed,
  DestroyRef,
  effect,
  inject,
  input,
  signal,
  untracked,
} from '@angular/core';
import { catchError, forkJoin, map, of, type Subscription } from 'rxjs';
import { SweepsApi } from '../core/sweeps-api';
import { Theme } from '../core/theme';
import { SweepChart } from '../sweeps/sweep-chart';
import { memberCurveOverlays, overlayPlan, type MemberFamily } from './member-curve-series';

/** A valve whose curves are overlaid, and the sweep to draw. */
export interface CurveMember {
  label: string;
  sweepId: number | null;
}

/** Whether two member lists draw the same curves. */
export function sameMembers(a: readonly CurveMember[], b: readonly CurveMember[]): boolean {
  return (
    a.length === b.length && a.every((m, i) => m.label === b[i].label && m.sweepId === b[i].sweepId)
  );
}

/** The anode curves of a group's members overlaid, one colour per valve, legend by label. */
@Component({
  selector: 'app-member-curves',
  imports: [SweepChart],
  template: `
    @if (plan(); as p) {
      <app-sweep-chart
        [plan]="p"
        [overlays]="overlays()"
        [crosshair]="true"
        emptyText=""
        [attr.aria-label]="'Anode curves of ' + labels()"
      />
      <p class="note">
        Ia against Va at each measured Vg1 of every member’s newest anode family; one colour per
        valve. Click a label to hide its curves.
      </p>
    } @else if (loading()) {
      <p class="note">Loading the curves…</p>
    }
    @if (missing().length) {
      <p class="error-text" role="alert">No curves for {{ missing().join(', ') }}.</p>
    }
  `,
  styles: `
    :host {
      display: block;
      --sweep-chart-height: 380px;
    }
    .note {
      margin: 4px 0 0;
      color: var(--mat-sys-on-surface-variant);
      font: var(--mat-sys-body-small);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class MemberCurves {
  readonly members = input.required<readonly CurveMember[]>();

  private readonly sweeps = inject(SweepsApi);
  private readonly theme = inject(Theme);
  protected readonly families = signal<MemberFamily[]>([]);
  protected readonly missing = signal<string[]>([]);
  protected readonly loading = signal(false);
  protected readonly plan = computed(() => overlayPlan(this.families()));
  protected readonly overlays = computed(() =>
    memberCurveOverlays(this.families(), this.theme.dark()),
  );
  protected readonly labels = computed(() =>
    this.families()
      .map((f) => f.label)
      .join(', '),
  );
  private loadSub: Subscription | null = null;

  constructor() {
    effect(() => {
      const members = this.members();
      untracked(() => this.load(members));
    });
    inject(DestroyRef).onDestroy(() => this.loadSub?.unsubscribe());
  }

  private load(members: readonly CurveMember[]): void {
    this.loadSub?.unsubscribe();
    this.families.set([]);
    this.missing.set([]);
    if (!members.length) return;
    this.loading.set(true);
    const requests = members.map((m) =>
      m.sweepId === null
        ? of(null)
        : this.sweeps.get(m.sweepId).pipe(
            map((s): MemberFamily => ({ label: m.label, plan: s.plan, points: s.points })),
            catchError(() => of(null)),
          ),
    );
    this.loadSub = forkJoin(requests).subscribe((found) => {
      this.loading.set(false);
      this.families.set(found.filter((f): f is MemberFamily => f !== null));
      this.missing.set(members.filter((_, i) => found[i] === null).map((m) => m.label));
    });
  }
}
