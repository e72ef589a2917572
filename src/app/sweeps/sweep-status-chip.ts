import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import type { SweepStatus } from '../../../shared/domain/sweep';
import { sweepStatusLabel } from './sweep-status-label';

/** A sweep's state as a small coloured label with an icon. */
@Component({
  selector: 'app-sweep-status-chip',
  imports: [MatIconModule],
  template: `<mat-icon [svgIcon]="info().icon" aria-hidden="true" />{{ info().label }}`,
  host: { '[class]': '"tone-" + info().tone' },
  styles: `
    :host {
      display: inline-flex;
      align-items: center;
      gap: 4px;
      padding: 2px 10px 2px 6px;
      border-radius: 999px;
      font: var(--mat-sys-label-medium);
      white-space: nowrap;
      border: 1px solid currentColor;
    }
    mat-icon {
      width: 16px;
      height: 16px;
    }
    :host(.tone-active) {
      color: var(--mat-sys-primary);
    }
    :host(.tone-ok) {
      color: var(--ember-ok);
    }
    :host(.tone-neutral) {
      color: var(--mat-sys-on-surface-variant);
    }
    :host(.tone-warn) {
      color: var(--ember-warn);
    }
    :host(.tone-danger) {
      color: var(--mat-sys-error);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SweepStatusChip {
  readonly status = input.required<SweepStatus>();
  protected readonly info = computed(() => sweepStatusLabel(this.status()));
}
