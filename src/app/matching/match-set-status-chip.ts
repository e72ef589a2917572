import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { SET_STATUS_LABELS } from './match-labels';
import type { MatchSetStatus } from './match-sets-api';

/** A match set's status as a small outlined label. */
@Component({
  selector: 'app-match-set-status-chip',
  template: `{{ label() }}`,
  host: { '[class]': '"status-" + status()' },
  styles: `
    :host {
      display: inline-flex;
      align-items: center;
      padding: 2px 10px;
      border-radius: 999px;
      font: var(--mat-sys-label-medium);
      white-space: nowrap;
      border: 1px solid currentColor;
    }
    :host(.status-reserved) {
      color: var(--mat-sys-primary);
    }
    :host(.status-sold) {
      color: var(--ember-ok);
    }
    :host(.status-released) {
      color: var(--mat-sys-on-surface-variant);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class MatchSetStatusChip {
  readonly status = input.required<MatchSetStatus>();
  protected readonly label = computed(() => SET_STATUS_LABELS[this.status()]);
}
