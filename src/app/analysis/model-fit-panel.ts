import { DOCUMENT } from '@angular/common';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  DestroyRef,
  inject,
  input,
  signal,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressSpinnerModule } from '@angular/material/progress-spinner';
import { MatSlideToggleModule } from '@angular/material/slide-toggle';
import type { KorenFit, KorenParamName } from '../../../shared/analysis/koren-fit';
import type { SweepPoint } from '../../../shared/domain/sweep';
import { saveBlob } from '../core/save-blob';
import type { FitStart } from './fit-start';
import { decimalsForUncertainty, formatFixed, reasonSentence } from './format-readout';
import { ModelFitter } from './model-fitter';
import { spiceModelFile } from './spice-model-file';

/** Where the fit stands. */
type FitState =
  | { status: 'idle' }
  | { status: 'running'; pointCount: number }
  | { status: 'done'; fit: KorenFit; pointCount: number; start: FitStart }
  | { status: 'refused'; reason: string };

const PARAM_ORDER: readonly KorenParamName[] = ['mu', 'ex', 'kg1', 'kg2', 'kp', 'kvb'];
/** RMS error below which a fit reads as close, and from which it reads as poor, % of full scale. */
const FAIR_FIT_PERCENT = 2;
const POOR_FIT_PERCENT = 5;

/**
 * The Koren model fitted to the readings (off the main thread): fit quality as RMS % of the
 * full-scale Ia, each parameter with its uncertainty, the model curves on the chart, and the
 * model as a SPICE subcircuit to download.
 */
@Component({
  selector: 'app-model-fit-panel',
  imports: [MatButtonModule, MatIconModule, MatProgressSpinnerModule, MatSlideToggleModule],
  templateUrl: './model-fit-panel.html',
  styleUrl: './tool-panel.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ModelFitPanel {
  private readonly fitter = inject(ModelFitter);
  private readonly document = inject(DOCUMENT);

  readonly points = input<readonly SweepPoint[]>([]);
  /** Starting values, or null while there is no family to fit. */
  readonly start = input<FitStart | null>(null);
  readonly designation = input<string | null>(null);
  readonly sweepId = input(0);
  readonly valveLabel = input<string | null>(null);

  protected readonly state = signal<FitState>({ status: 'idle' });
  protected readonly showCurves = signal(true);
  private run = 0;

  /** The model to draw on the chart, or null. */
  readonly shownModel = computed(() => {
    const s = this.state();
    return s.status === 'done' && this.showCurves() ? s.fit.model : null;
  });

  protected readonly running = computed(() => this.state().status === 'running');
  protected readonly done = computed(() => {
    const s = this.state();
    return s.status === 'done' ? s : null;
  });
  protected readonly refusal = computed(() => {
    const s = this.state();
    return s.status === 'refused' ? reasonSentence(s.reason) : null;
  });
  protected readonly kindText = computed(() => {
    const kind = this.done()?.fit.model.kind ?? this.start()?.model.kind ?? 'triode';
    return kind === 'pentode' ? 'Koren pentode' : 'Koren triode';
  });
  protected readonly params = computed(() => {
    const d = this.done();
    if (!d) return [];
    const values = d.fit.model.params as unknown as Record<KorenParamName, number>;
    return PARAM_ORDER.filter((name) => values[name] !== undefined).map((name) => ({
      name: name.toUpperCase(),
      value: values[name],
      text: paramText(values[name], d.fit.uncertainty[name]),
      note: name === 'kg2' && !d.fit.kg2Fitted ? 'as started: no screen currents' : '',
    }));
  });
  protected readonly quality = computed(() => {
    const d = this.done();
    if (!d) return null;
    return {
      rms: formatFixed(d.fit.rmsErrorPercent, 2),
      worst: formatFixed(d.fit.maxErrorPercent, 2),
      fullScale: String(Number(d.fit.fullScaleMilliamps.toPrecision(3))),
      readings: d.fit.pointCount,
    };
  });
  /**
   * How well the model describes the readings. The bounds are our own rule of thumb, not a
   * published one: a sound valve's family fits the Koren model to a few per cent of full scale.
   */
  protected readonly verdict = computed(() => {
    const rms = this.done()?.fit.rmsErrorPercent;
    if (rms === undefined) return null;
    if (rms < FAIR_FIT_PERCENT) return { tone: 'ok', sentence: 'Close fit.' };
    if (rms < POOR_FIT_PERCENT) {
      return { tone: 'neutral', sentence: 'Fair fit: the model misses parts of the family.' };
    }
    return {
      tone: 'warn',
      sentence:
        'Poor fit: the model does not describe these readings. Curves that cross or sag (a ' +
        'cathode still warming up, a fault) cannot be fitted; check the sweep.',
    };
  });
  /** Readings that arrived after the fit (a live sweep goes on). */
  protected readonly newReadings = computed(() => {
    const d = this.done();
    return d ? Math.max(0, this.points().length - d.pointCount) : 0;
  });

  constructor() {
    inject(DestroyRef).onDestroy(() => this.run++);
  }

  protected async fit(): Promise<void> {
    const start = this.start();
    if (!start || this.running()) return;
    const points = this.points();
    const run = ++this.run;
    this.state.set({ status: 'running', pointCount: points.length });
    const result = await this.fitter.fit(points, start.model);
    if (run !== this.run) return;
    this.state.set(
      result.ok
        ? { status: 'done', fit: result, pointCount: points.length, start }
        : { status: 'refused', reason: result.reason },
    );
    if (result.ok) this.showCurves.set(true);
  }

  protected downloadSpice(): void {
    const d = this.done();
    if (!d) return;
    const file = spiceModelFile(d.fit, this.designation(), this.sweepId(), this.valveLabel());
    saveBlob(this.document, new Blob([file.text], { type: 'text/plain' }), file.fileName);
  }
}

/** A parameter as "value ± uncertainty" with the uncertainty's two significant figures. */
function paramText(value: number, uncertainty: number | undefined): string {
  if (uncertainty === undefined || !Number.isFinite(uncertainty) || !(uncertainty > 0)) {
    return `${Number(value.toPrecision(4))}${uncertainty === undefined ? '' : ' ±\u00a0?'}`;
  }
  const decimals = decimalsForUncertainty(uncertainty);
  return `${formatFixed(value, decimals)} ±\u00a0${formatFixed(uncertainty, decimals)}`;
}
