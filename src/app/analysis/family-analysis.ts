import {
  ChangeDetectionStrategy,
  Component,
  computed,
  effect,
  inject,
  input,
  signal,
  untracked,
  viewChild,
} from '@angular/core';
import { toObservable, toSignal } from '@angular/core/rxjs-interop';
import { catchError, filter, of, switchMap, take } from 'rxjs';
import type { SweepPlan, SweepPoint } from '../../../shared/domain/sweep';
import { Theme } from '../core/theme';
import { ValveTypesApi, type ValveTypeView } from '../core/valve-types-api';
import {
  currentAxisMax,
  SweepChart,
  type ChartOverlay,
  type ChartPoint,
} from '../sweeps/sweep-chart';
import {
  hyperbolaOverlay,
  loadLineOverlays,
  markerOverlay,
  modelOverlays,
} from './analysis-overlays';
import { CursorReadout } from './cursor-readout';
import { fitStart } from './fit-start';
import { LoadLinePanel } from './load-line-panel';
import { ModelFitPanel } from './model-fit-panel';
import type { MarkerRequest } from './operating-point';
import { OperatingPointPanel } from './operating-point-panel';
import { throttledFamily } from './throttled-family';

const NO_POINTS: readonly SweepPoint[] = [];

/** The type of a sweep in the library, by designation or equivalent, or null. */
export function findValveType(
  types: readonly ValveTypeView[] | null | undefined,
  designation: string | null,
): ValveTypeView | null {
  if (!types || !designation) return null;
  const name = designation.trim().toUpperCase();
  return (
    types.find((t) => t.designation.toUpperCase() === name) ??
    types.find((t) => t.equivalents.some((e) => e.toUpperCase() === name)) ??
    null
  );
}

/**
 * A sweep's curves with the analysis around them: the readout at the pointer, the
 * operating-point marker, a load line and a fitted model, all drawn on the chart. Recomputed
 * while a live sweep's points arrive (throttled); a transfer curve gets the plain chart.
 */
@Component({
  selector: 'app-family-analysis',
  imports: [CursorReadout, LoadLinePanel, ModelFitPanel, OperatingPointPanel, SweepChart],
  templateUrl: './family-analysis.html',
  styleUrl: './family-analysis.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class FamilyAnalysis {
  private readonly theme = inject(Theme);
  private readonly typesApi = inject(ValveTypesApi);

  readonly plan = input.required<SweepPlan>();
  readonly points = input<readonly SweepPoint[]>([]);
  /** Designation the sweep was taken as, e.g. "12AX7". */
  readonly valveType = input<string | null>(null);
  readonly valveLabel = input<string | null>(null);
  readonly sweepId = input(0);
  /** Text over the empty chart. */
  readonly emptyText = input('No points yet');
  /** Series the host draws under the analysis, e.g. the type's nominal curves. */
  readonly extraOverlays = input<readonly ChartOverlay[]>([]);

  /** Keys the template's one block by sweep, so a new sweep gets fresh tools and chart. */
  protected readonly sweepKey = computed(() => [this.sweepId()]);
  protected readonly anode = computed(() => this.plan().kind === 'anode');
  private readonly anodePoints = computed(() => (this.anode() ? this.points() : NO_POINTS));
  protected readonly familyState = throttledFamily(this.anodePoints);
  protected readonly family = computed(() => {
    const s = this.familyState();
    return s.status === 'ready' ? s.family : null;
  });
  protected readonly readoutHint = computed(() => {
    const s = this.familyState();
    if (s.status === 'ready') {
      return 'Point at the curves to read gm, ra and mu; click to place the marker.';
    }
    return s.status === 'refused'
      ? `No gm, ra or mu yet: ${s.reason.replace(/\.$/, '')}.`
      : 'gm, ra and mu can be read once three curves have four or more readings each.';
  });

  // The library is asked only once there is a family to analyse.
  private readonly types = toSignal(
    toObservable(computed(() => this.family() !== null)).pipe(
      filter(Boolean),
      take(1),
      switchMap(() => this.typesApi.list().pipe(catchError(() => of(null)))),
    ),
    { initialValue: undefined },
  );
  protected readonly type = computed(() => findValveType(this.types(), this.valveType()));
  protected readonly paMaxWatts = computed(() => this.type()?.ratings.paMaxWatts ?? null);
  protected readonly fitStart = computed(() => {
    const family = this.family();
    // Wait for the library: its published set is the better start.
    return family && this.types() !== undefined ? fitStart(this.type(), family) : null;
  });

  protected readonly cursor = signal<ChartPoint | null>(null);
  protected readonly marker = signal<MarkerRequest | null>(null);

  private readonly operatingPoint = viewChild(OperatingPointPanel);
  protected readonly loadLine = viewChild(LoadLinePanel);
  private readonly model = viewChild(ModelFitPanel);

  protected readonly markerPoint = computed(() => {
    const r = this.operatingPoint()?.result();
    return r?.ok ? r : null;
  });
  protected readonly modelShown = computed(() => this.model()?.shownModel() ?? null);

  /** The type's dissipation limit, drawn with the load line where it crosses the plot. */
  private readonly limitOverlay = computed(() => {
    const rating = this.paMaxWatts();
    const top = currentAxisMax(this.points());
    if (!this.loadLine()?.active() || rating === null || top === null) return null;
    return hyperbolaOverlay(rating, this.plan().vaStopVolts, top, this.theme.dark());
  });
  /** The key's words for the limit, or null when no limit is asked for. */
  protected readonly limitKey = computed(() => {
    const rating = this.paMaxWatts();
    if (!this.loadLine()?.active() || rating === null) return null;
    const watts = `Pa max ${Number(rating.toPrecision(3))} W`;
    return this.limitOverlay() ? watts : `${watts}, above the measured currents`;
  });

  protected readonly overlays = computed<ChartOverlay[]>(() => {
    const dark = this.theme.dark();
    const out: ChartOverlay[] = [...this.extraOverlays()];
    const family = this.family();
    if (!family) return out;
    const vaMax = this.plan().vaStopVolts;
    const model = this.modelShown();
    if (model) {
      const grids = family.curves.map((c) => c.vg1Volts);
      out.push(...modelOverlays(model, grids, family.vg2Volts, vaMax, dark));
    }
    const limit = this.limitOverlay();
    if (limit) out.push(limit);
    const analysis = this.loadLine()?.result();
    if (analysis?.ok) out.push(...loadLineOverlays(analysis, dark));
    const m = this.markerPoint();
    if (m) out.push(markerOverlay({ vaVolts: m.vaVolts, iaMilliamps: m.iaMilliamps.value }, dark));
    return out;
  });

  constructor() {
    effect(() => {
      this.sweepId();
      untracked(() => {
        this.marker.set(null);
        this.cursor.set(null);
      });
    });
  }

  /** A click on the chart places the marker at (Va, Ia), to the fields' precision. */
  protected placeMarker(at: ChartPoint): void {
    this.marker.set({
      by: 'current',
      vaVolts: Math.round(at.vaVolts * 10) / 10,
      iaMilliamps: Math.round(at.iaMilliamps * 1000) / 1000,
    });
  }
}
