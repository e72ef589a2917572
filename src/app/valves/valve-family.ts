import { DatePipe, DecimalPipe } from '@angular/common';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  inject,
  input,
  linkedSignal,
  signal,
} from '@angular/core';
import { takeUntilDestroyed, toObservable } from '@angular/core/rxjs-interop';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatSlideToggleModule } from '@angular/material/slide-toggle';
import { RouterLink } from '@angular/router';
import { catchError, distinctUntilChanged, map, of, switchMap } from 'rxjs';
import type { SweepView } from '../../../shared/hub/messages';
import { apiErrorMessage } from '../core/api-error-message';
import { SweepsApi, type SweepWithPoints } from '../core/sweeps-api';
import { Theme } from '../core/theme';
import { SweepChart, type ChartOverlay } from '../sweeps/sweep-chart';
import { nominalDrawing, nominalIaAt, nominalOverlays } from '../sweeps/sweep-nominal';
import { TypesApi, type NominalCurves, type TypeView } from '../types/types-api';
import { figuresAtOperatingPoints, figureText, operatingPointText } from './family-figures';

/** A sweep with its points, or why it could not be read. */
type Loaded = { sweep: SweepWithPoints; error: null } | { sweep: null; error: string };

/**
 * A valve's measured anode family (its newest, or one the user picks) drawn over its type's
 * nominal curves (uploaded ones, else the published model), with the figures at each of the
 * type's typical operating points against the data sheet.
 */
@Component({
  selector: 'app-valve-family',
  imports: [
    DatePipe,
    DecimalPipe,
    MatFormFieldModule,
    MatProgressBarModule,
    MatSelectModule,
    MatSlideToggleModule,
    RouterLink,
    SweepChart,
  ],
  templateUrl: './valve-family.html',
  styleUrl: './valve-family.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ValveFamily {
  /** The valve's sweeps, newest first. */
  readonly sweeps = input.required<readonly SweepView[]>();
  /** The valve's type as the library has it, or null while unknown. */
  readonly type = input<TypeView | null>(null);

  private readonly sweepsApi = inject(SweepsApi);
  private readonly typesApi = inject(TypesApi);
  private readonly theme = inject(Theme);

  /** Anode-family sweeps with readings, newest first: the ones worth drawing. */
  protected readonly families = computed(() =>
    this.sweeps().filter((s) => s.plan.kind === 'anode' && s.pointCount > 0),
  );
  /**
   * The sweep shown: the newest family of section 1 (the section the grade and trend follow),
   * else the newest of any, until the user picks another.
   */
  protected readonly chosenId = linkedSignal(() => {
    const all = this.families();
    return (all.find((s) => s.plan.section !== 2) ?? all[0])?.id ?? null;
  });
  protected readonly showNominal = signal(true);
  protected readonly loaded = signal<Loaded | null>(null);
  protected readonly stored = signal<NominalCurves | null>(null);

  protected readonly sweep = computed(() => {
    const loaded = this.loaded();
    return loaded?.sweep && loaded.sweep.id === this.chosenId() ? loaded.sweep : null;
  });
  protected readonly nominal = computed(() => {
    const type = this.type();
    const sweep = this.sweep();
    return type && sweep ? nominalDrawing(type, this.stored(), sweep.plan, sweep.points) : null;
  });
  protected readonly overlays = computed<readonly ChartOverlay[]>(() => {
    const drawing = this.nominal();
    return drawing && this.showNominal() ? nominalOverlays(drawing, this.theme.dark()) : [];
  });
  /** Each typical operating point with the measured figures, and Ia on the nominal curves. */
  protected readonly points = computed(() => {
    const type = this.type();
    const sweep = this.sweep();
    if (!type || !sweep) return [];
    const drawing = this.nominal();
    return figuresAtOperatingPoints(type.operatingPoints, sweep.plan, sweep.points).map((f) => {
      const curveIa = drawing ? nominalIaAt(drawing, f.point.vaVolts, f.point.vg1Volts) : null;
      const measuredIa = f.figures.find((x) => x.figure === 'Ia')?.measured ?? null;
      return {
        ...f,
        title: operatingPointText(f.point),
        curveIa,
        curvePercent: curveIa && measuredIa !== null ? (100 * measuredIa) / curveIa : null,
      };
    });
  });
  protected readonly figureText = figureText;

  constructor() {
    toObservable(this.chosenId)
      .pipe(
        distinctUntilChanged(),
        switchMap((id) =>
          id === null
            ? of(null)
            : this.sweepsApi.get(id).pipe(
                map((sweep): Loaded => ({ sweep, error: null })),
                catchError((err: unknown) =>
                  of<Loaded>({
                    sweep: null,
                    error: apiErrorMessage(err, `Sweep #${id} could not be loaded.`),
                  }),
                ),
              ),
        ),
        takeUntilDestroyed(),
      )
      .subscribe((loaded) => this.loaded.set(loaded));

    toObservable(computed(() => this.type()?.designation ?? null))
      .pipe(
        distinctUntilChanged(),
        switchMap((designation) =>
          designation
            ? this.typesApi.nominalCurves(designation).pipe(catchError(() => of(null)))
            : of(null),
        ),
        takeUntilDestroyed(),
      )
      .subscribe((stored) => this.stored.set(stored));
  }
}
