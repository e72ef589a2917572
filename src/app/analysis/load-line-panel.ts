import { ChangeDetectionStrategy, Component, computed, input, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { commonCathodeGain } from '../../../shared/analysis/amplifier-stage';
import type { AnodeFamily } from '../../../shared/analysis/anode-family';
import { analyseLoadLine, type LoadLineAnalysis } from '../../../shared/analysis/load-line';
import type { OperatingPoint } from '../../../shared/analysis/operating-point';
import type { Refusal } from '../../../shared/analysis/refusal';
import { formatFixed, formatPower, reasonSentence, type ReadoutText } from './format-readout';
import {
  defaultLoadLineForm,
  readLoadLineForm,
  throughMarker,
  type LoadLineForm,
} from './load-line-form';

/** One figure of the load-line results. */
interface Figure extends ReadoutText {
  key: string;
  label: string;
  /** How it was found, in small print. */
  method?: string;
}

/**
 * A load line on the measured family: resistive or transformer load, fixed or cathode bias, and
 * a peak grid swing; the quiescent point, gain, output swing and power, and distortion by the
 * three- and five-point methods. Refusals (the line leaving the measured region) show as reasons.
 */
@Component({
  selector: 'app-load-line-panel',
  imports: [
    MatButtonModule,
    MatButtonToggleModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
  ],
  templateUrl: './load-line-panel.html',
  styleUrl: './tool-panel.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class LoadLinePanel {
  readonly family = input<AnodeFamily | null>(null);
  /** Anode dissipation rating of the type, W (null: not known). */
  readonly paMaxWatts = input<number | null>(null);
  /** The operating-point marker, if it is set and inside the family. */
  readonly marker = input<OperatingPoint | null>(null);

  /** The fields; null until the user asks for a load line. */
  protected readonly form = signal<LoadLineForm | null>(null);
  /** Whether a load line is asked for (drawn, or refused with a reason). */
  readonly active = computed(() => this.form() !== null);

  /** The analysis on the family, a refusal, or null with no load line asked for. */
  readonly result = computed<LoadLineAnalysis | Refusal | null>(() => {
    const form = this.form();
    const family = this.family();
    if (!form || !family) return null;
    const stage = readLoadLineForm(form);
    if (!stage.ok) return stage;
    const rating = this.paMaxWatts();
    return analyseLoadLine(family, stage.load, stage.bias, {
      ...(stage.swingPeakVolts !== null ? { gridSwingPeakVolts: stage.swingPeakVolts } : {}),
      ...(rating !== null ? { paMaxWatts: rating } : {}),
    });
  });

  /** mu·RL/(RL + ra) with mu and ra of the family at the quiescent point (cathode bypassed). */
  readonly smallSignalGain = computed(() => {
    const r = this.result();
    const family = this.family();
    const form = this.form();
    if (!r?.ok || !family || !form) return null;
    const stage = readLoadLineForm(form);
    if (!stage.ok) return null;
    const op = family.operatingPoint(r.quiescent.vaVolts, r.quiescent.vg1Volts);
    if (!op.ok) return null;
    return commonCathodeGain({
      mu: op.mu.value,
      raKiloohms: op.raKiloohms.value,
      loadKiloohms: stage.load.loadKiloohms,
    });
  });

  protected readonly quiescent = computed<Figure[]>(() => {
    const r = this.result();
    if (!r?.ok) return [];
    const q = r.quiescent;
    return [
      { key: 'va', label: 'Va', text: formatFixed(q.vaVolts, 1), unit: 'V' },
      { key: 'ia', label: 'Ia', text: formatFixed(q.iaMilliamps, 3), unit: 'mA' },
      { key: 'vg1', label: 'Vg1', text: formatFixed(q.vg1Volts, 2), unit: 'V' },
      { key: 'pa', label: 'Pa', text: formatFixed(q.paWatts, 3), unit: 'W' },
    ];
  });
  protected readonly dissipation = computed(() => {
    const r = this.result();
    const d = r?.ok ? r.dissipation : null;
    if (!r?.ok || !d) return null;
    return {
      within: d.withinRating,
      text: `${formatFixed((100 * r.quiescent.paWatts) / d.paMaxWatts, 0)} % of the ${d.paMaxWatts} W rating`,
    };
  });
  protected readonly swing = computed<Figure[]>(() => {
    const r = this.result();
    const s = r?.ok ? r.swing : null;
    const out: Figure[] = [];
    const small = this.smallSignalGain();
    if (s) {
      const power = formatPower(s.outputPowerWatts);
      out.push({
        key: 'gain',
        label: 'Gain',
        text: formatFixed(s.voltageGain, 1),
        unit: '',
        method: 'from the swing',
      });
      if (small !== null) {
        out.push({
          key: 'gain-small',
          label: 'Gain',
          text: formatFixed(small, 1),
          unit: '',
          method: 'mu·RL/(RL + ra)',
        });
      }
      out.push(
        {
          key: 'swing',
          label: 'Output',
          text: formatFixed(s.outputSwingPeakToPeakVolts, 1),
          unit: 'V p-p',
        },
        { key: 'power', label: 'Power', text: power.text, unit: power.unit },
        {
          key: 'd2-three',
          label: 'D2',
          text: formatFixed(Math.abs(s.secondHarmonicThreePointPercent), 2),
          unit: '%',
          method: 'three-point',
        },
        {
          key: 'd2-five',
          label: 'D2',
          text: formatFixed(s.fivePoint.d2Percent, 2),
          unit: '%',
          method: 'five-point',
        },
        {
          key: 'd3-five',
          label: 'D3',
          text: formatFixed(s.fivePoint.d3Percent, 2),
          unit: '%',
          method: 'five-point',
        },
      );
    } else if (small !== null) {
      out.push({
        key: 'gain-small',
        label: 'Gain',
        text: formatFixed(small, 1),
        unit: '',
        method: 'mu·RL/(RL + ra)',
      });
    }
    return out;
  });
  protected readonly refusal = computed(() => {
    const r = this.result();
    return r && !r.ok ? reasonSentence(r.reason) : null;
  });

  protected start(): void {
    const family = this.family();
    if (family) this.form.set(defaultLoadLineForm(family, this.marker()));
  }

  protected remove(): void {
    this.form.set(null);
  }

  protected alignWithMarker(): void {
    const form = this.form();
    const marker = this.marker();
    const family = this.family();
    if (form && marker && family) this.form.set(throughMarker(form, marker, family));
  }

  /** A resistor and a transformer want different supplies and loads: start the new one afresh. */
  protected setLoad(load: LoadLineForm['load']): void {
    const family = this.family();
    if (family) this.form.set(defaultLoadLineForm(family, this.marker(), load));
  }

  protected setBias(bias: LoadLineForm['bias']): void {
    this.edit({ bias });
  }

  protected type(field: keyof LoadLineForm, event: Event): void {
    this.edit({ [field]: (event.target as HTMLInputElement).value });
  }

  private edit(change: Partial<LoadLineForm>): void {
    this.form.update((form) => (form ? { ...form, ...change } : form));
  }
}
