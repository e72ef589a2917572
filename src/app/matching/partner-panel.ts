import { HttpErrorResponse } from '@angular/common/http';
import {
  ChangeDetectionStrategy,
  Component,
  effect,
  inject,
  input,
  signal,
  untracked,
} from '@angular/core';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import type { Subscription } from 'rxjs';
import { apiErrorMessage } from '../core/api-error-message';
import { STATUS_LABELS } from '../valves/valve-labels';
import { TOLERANCE_PRESETS, DEFAULT_TOLERANCE_PERCENT } from './criteria-defaults';
import { percentText } from './match-labels';
import { MatchingApi, type PartnerList } from './matching-api';

/** How many partners are listed. */
const PARTNER_LIMIT = 10;

/**
 * Partners for one valve: in-stock valves of its type ranked by distance, nearest first, at
 * the type's reference point, each against the chosen tolerance.
 */
@Component({
  selector: 'app-partner-panel',
  imports: [MatButtonToggleModule, MatIconModule, MatProgressBarModule, RouterLink],
  template: `
    <div class="head">
      <span class="label" id="partner-tolerance">Tolerance (common practice)</span>
      <mat-button-toggle-group
        aria-labelledby="partner-tolerance"
        [value]="tolerance()"
        (change)="tolerance.set($event.value)"
        hideSingleSelectionIndicator
      >
        @for (p of presets; track p.label) {
          <mat-button-toggle [value]="p.percent">{{ p.label }} {{ p.percent }} %</mat-button-toggle>
        }
      </mat-button-toggle-group>
    </div>
    @if (loading()) {
      <mat-progress-bar mode="indeterminate" aria-label="Finding partners" />
    }
    @if (error(); as message) {
      <p class="muted" role="status">{{ message }}</p>
    } @else if (list(); as l) {
      @if (l.partners.length) {
        <ol class="partners" aria-label="Partners, nearest first">
          @for (p of l.partners; track p.valveId) {
            <li>
              <a class="readout" [routerLink]="['/valves', p.valveId]">{{ p.label }}</a>
              <span class="distance readout">{{ percent(p.distancePercent) }} apart</span>
              @if (p.withinTolerance) {
                <span class="ok">within {{ tolerance() }} %</span>
              } @else {
                <span class="over">over: {{ p.exceeds.join('; ') }}</span>
              }
              <span class="muted">{{ statusText(p.status) }}</span>
              <a class="sweep" [routerLink]="['/sweeps', p.sweepId]">sweep #{{ p.sweepId }}</a>
            </li>
          }
        </ol>
        <p class="muted">
          Distance: the weighted mean of the Ia and gm differences at the type’s reference point, in
          % of the two valves’ mean.
        </p>
      } @else {
        <p class="muted">No other in-stock valve of this type has a complete anode-family sweep.</p>
      }
    }
  `,
  styles: `
    :host {
      display: block;
    }
    .head {
      display: flex;
      flex-wrap: wrap;
      align-items: center;
      gap: 8px 12px;
      margin-bottom: 8px;
    }
    .label,
    .muted {
      color: var(--mat-sys-on-surface-variant);
      font: var(--mat-sys-body-small);
    }
    .partners {
      margin: 0;
      padding-left: 24px;
    }
    .partners li {
      padding: 4px 0;
    }
    .partners li > * {
      margin-right: 12px;
    }
    a {
      color: var(--mat-sys-primary);
    }
    .ok {
      color: var(--ember-ok);
    }
    .over {
      color: var(--ember-warn);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PartnerPanel {
  /** The valve a partner is sought for. */
  readonly valveId = input.required<number>();

  private readonly api = inject(MatchingApi);
  protected readonly presets = TOLERANCE_PRESETS;
  protected readonly percent = percentText;
  protected readonly tolerance = signal<number>(DEFAULT_TOLERANCE_PERCENT);
  protected readonly list = signal<PartnerList | null>(null);
  protected readonly loading = signal(false);
  protected readonly error = signal<string | null>(null);
  private sub: Subscription | null = null;

  constructor() {
    effect(() => {
      const id = this.valveId();
      const tolerance = this.tolerance();
      untracked(() => this.load(id, tolerance));
    });
  }

  protected statusText(status: string): string {
    return STATUS_LABELS[status as keyof typeof STATUS_LABELS] ?? status;
  }

  private load(id: number, tolerance: number): void {
    this.sub?.unsubscribe();
    this.loading.set(true);
    this.sub = this.api.partners(id, tolerance, PARTNER_LIMIT).subscribe({
      next: (list) => {
        this.loading.set(false);
        this.error.set(null);
        this.list.set(list);
      },
      error: (err: unknown) => {
        this.loading.set(false);
        this.list.set(null);
        const refused =
          err instanceof HttpErrorResponse && (err.status === 409 || err.status === 422);
        this.error.set(
          refused
            ? `No partners can be sought: ${apiErrorMessage(err)}`
            : apiErrorMessage(err, 'The partner search failed.'),
        );
      },
    });
  }
}
