import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import type { AnodeFamily } from '../../../shared/analysis/anode-family';
import type { ChartPoint } from '../sweeps/sweep-chart';
import { formatEstimate, formatFixed, reasonSentence, type ReadoutText } from './format-readout';

/** One figure of the readout strip. */
interface CursorFigure extends ReadoutText {
  label: string;
}

/** What the strip shows for the pointer's place. */
export type CursorReading =
  | { kind: 'idle' }
  | { kind: 'figures'; place: CursorFigure[]; figures: CursorFigure[] }
  | { kind: 'refused'; place: CursorFigure[]; reason: string };

/**
 * The readout at the pointer: Va and Ia under it, and the small-signal figures there, with the
 * grid voltage found by inverting the family at (Va, Ia). Outside the measured region it shows
 * the family's reason instead of numbers.
 */
export function cursorReading(family: AnodeFamily | null, at: ChartPoint | null): CursorReading {
  if (!at) return { kind: 'idle' };
  const place: CursorFigure[] = [
    { label: 'Va', text: formatFixed(at.vaVolts, 1), unit: 'V' },
    { label: 'Ia', text: formatFixed(at.iaMilliamps, 3), unit: 'mA' },
  ];
  if (!family) return { kind: 'refused', place, reason: 'No anode family to read yet.' };
  if (!(at.iaMilliamps > 0)) {
    return { kind: 'refused', place, reason: 'Below zero current: nothing flows there.' };
  }
  const op = family.operatingPointAtCurrent(at.vaVolts, at.iaMilliamps);
  if (!op.ok) return { kind: 'refused', place, reason: reasonSentence(op.reason) };
  return {
    kind: 'figures',
    place,
    figures: [
      { label: 'Vg1', text: formatEstimate(op.vg1Volts, 1, 2), unit: 'V' },
      { label: 'gm', text: formatEstimate(op.gmMicrosiemens, 1e-3), unit: 'mA/V' },
      { label: 'ra', text: formatEstimate(op.raKiloohms, 1, 1), unit: 'kΩ' },
      { label: 'mu', text: formatEstimate(op.mu, 1, 1), unit: '' },
    ],
  };
}

/** A strip above the chart with the figures at the pointer. */
@Component({
  selector: 'app-cursor-readout',
  imports: [MatIconModule],
  template: `
    @switch (reading().kind) {
      @case ('idle') {
        <p class="hint">{{ hint() }}</p>
      }
      @default {
        <dl class="figures">
          @for (f of place(); track f.label) {
            <div class="figure place">
              <dt>{{ f.label }}</dt>
              <dd class="readout">
                {{ f.text }}<span class="unit">{{ f.unit }}</span>
              </dd>
            </div>
          }
          @for (f of figures(); track f.label) {
            <div class="figure">
              <dt>{{ f.label }}</dt>
              <dd class="readout">
                {{ f.text }}
                @if (f.unit) {
                  <span class="unit">{{ f.unit }}</span>
                }
              </dd>
            </div>
          }
        </dl>
        @if (reason(); as why) {
          <p class="reason"><mat-icon svgIcon="warning" aria-hidden="true" />{{ why }}</p>
        }
      }
    }
  `,
  styleUrl: './cursor-readout.scss',
  host: { role: 'status', 'aria-live': 'off', 'aria-label': 'Readout at the pointer' },
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CursorReadout {
  readonly family = input<AnodeFamily | null>(null);
  readonly cursor = input<ChartPoint | null>(null);
  /** Shown while the pointer is off the chart. */
  readonly hint = input('Point at the curves to read gm, ra and mu; click to place the marker.');

  protected readonly reading = computed(() => cursorReading(this.family(), this.cursor()));
  protected readonly place = computed(() => {
    const r = this.reading();
    return r.kind === 'idle' ? [] : r.place;
  });
  protected readonly figures = computed(() => {
    const r = this.reading();
    return r.kind === 'figures' ? r.figures : [];
  });
  protected readonly reason = computed(() => {
    const r = this.reading();
    return r.kind === 'refused' ? r.reason : null;
  });
}
