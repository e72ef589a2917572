import {
  ChangeDetectionStrategy,
  Component,
  computed,
  effect,
  input,
  model,
  signal,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import type { AnodeFamily } from '../../../shared/analysis/anode-family';
import {
  formatEstimate,
  formatFixed,
  parseTypedNumber,
  reasonSentence,
  type ReadoutText,
} from './format-readout';
import { extensionNote, muCheck, resolveMarker, type MarkerRequest } from './operating-point';

/** One tile of the operating-point figures. */
interface Figure extends ReadoutText {
  label: string;
  /** Longer name for screen readers and the tooltip. */
  title: string;
}

/**
 * The operating-point marker: placed by a click on the chart or typed as Va with Vg1 or Ia, with
 * Ia, gm (mA/V), ra (kΩ), mu and the check of mu against gm·ra there.
 */
@Component({
  selector: 'app-operating-point-panel',
  imports: [
    MatButtonModule,
    MatButtonToggleModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
  ],
  templateUrl: './operating-point-panel.html',
  styleUrl: './tool-panel.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class OperatingPointPanel {
  readonly family = input<AnodeFamily | null>(null);
  /** Anode dissipation rating of the type, W (null: not known). */
  readonly paMaxWatts = input<number | null>(null);
  /** Where the marker is; set by the chart or by typing here. */
  readonly request = model<MarkerRequest | null>(null);

  protected readonly mode = signal<MarkerRequest['by']>('grid');
  protected readonly vaText = signal('');
  protected readonly secondText = signal('');
  /** The last request typed here, told apart from one set from outside (a click). */
  private typed: MarkerRequest | null = null;

  /** The figures at the marker, a refusal, or null without a marker or family. */
  readonly result = computed(() => {
    const family = this.family();
    const request = this.request();
    return family && request ? resolveMarker(family, request) : null;
  });

  protected readonly figures = computed<Figure[]>(() => {
    const op = this.result();
    if (!op?.ok) return [];
    return [
      {
        label: 'Ia',
        title: 'Anode current',
        text: formatEstimate(op.iaMilliamps, 1, 3),
        unit: 'mA',
      },
      {
        label: 'Vg1',
        title: 'Grid voltage',
        text: formatEstimate(op.vg1Volts, 1, 2),
        unit: 'V',
      },
      {
        label: 'gm',
        title: 'Mutual conductance',
        text: formatEstimate(op.gmMicrosiemens, 1e-3),
        unit: 'mA/V',
      },
      {
        label: 'ra',
        title: 'Anode resistance',
        text: formatEstimate(op.raKiloohms, 1, 1),
        unit: 'kΩ',
      },
      { label: 'mu', title: 'Amplification factor', text: formatEstimate(op.mu, 1, 1), unit: '' },
      {
        label: 'gm·ra',
        title: 'gm times ra',
        text: formatEstimate(op.muFromGmRa, 1, 1),
        unit: '',
      },
    ];
  });
  protected readonly check = computed(() => {
    const op = this.result();
    return op?.ok ? muCheck(op) : null;
  });
  protected readonly extension = computed(() => {
    const op = this.result();
    return op?.ok ? extensionNote(op) : null;
  });
  protected readonly dissipation = computed(() => {
    const op = this.result();
    if (!op?.ok) return null;
    const watts = (op.vaVolts * op.iaMilliamps.value) / 1000;
    const rating = this.paMaxWatts();
    const share = rating ? (100 * watts) / rating : null;
    return {
      text: formatFixed(watts, 3),
      share: share === null ? null : `${formatFixed(share, 0)} % of the ${rating} W rating`,
      over: share !== null && share > 100,
    };
  });
  protected readonly refusal = computed(() => {
    const op = this.result();
    return op && !op.ok ? reasonSentence(op.reason) : null;
  });

  constructor() {
    // A click on the chart sets the request from outside: show it in the fields.
    effect(() => {
      const request = this.request();
      if (!request || request === this.typed) return;
      this.mode.set(request.by);
      this.vaText.set(formatFixed(request.vaVolts, 1));
      this.secondText.set(
        request.by === 'grid'
          ? formatFixed(request.vg1Volts, 2)
          : formatFixed(request.iaMilliamps, 3),
      );
    });
  }

  protected setMode(mode: MarkerRequest['by']): void {
    if (mode === this.mode()) return;
    // Carry the point over: the current figures become the other way of asking for it.
    const op = this.result();
    this.mode.set(mode);
    if (op?.ok) {
      this.secondText.set(
        mode === 'grid' ? formatFixed(op.vg1Volts.value, 2) : formatFixed(op.iaMilliamps.value, 3),
      );
    } else {
      this.secondText.set('');
    }
    this.apply();
  }

  protected typeVa(event: Event): void {
    this.vaText.set((event.target as HTMLInputElement).value);
    this.apply();
  }

  protected typeSecond(event: Event): void {
    this.secondText.set((event.target as HTMLInputElement).value);
    this.apply();
  }

  protected clear(): void {
    this.vaText.set('');
    this.secondText.set('');
    this.typed = null;
    this.request.set(null);
  }

  private apply(): void {
    const va = parseTypedNumber(this.vaText());
    const second = parseTypedNumber(this.secondText());
    if (va === null || second === null) {
      this.typed = null;
      this.request.set(null);
      return;
    }
    this.typed =
      this.mode() === 'grid'
        ? { by: 'grid', vaVolts: va, vg1Volts: second }
        : { by: 'current', vaVolts: va, iaMilliamps: second };
    this.request.set(this.typed);
  }
}
