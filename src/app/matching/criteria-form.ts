import {
  ChangeDetectionStrategy,
  Component,
  computed,
  effect,
  input,
  output,
  signal,
} from '@angular/core';
import { ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import type { ValveTypeView } from '../core/valve-types-api';
import { STATUS_LABELS } from '../valves/valve-labels';
import { VALVE_STATUSES } from '../valves/valves-api';
import {
  GROUP_SIZES,
  TOLERANCE_PRESETS,
  typeHasScreen,
  typeHasSections,
} from './criteria-defaults';
import type { CriteriaForm } from './criteria-form-model';

/** The criteria of a matching run: type, set size, pool, where to compare, weights, tolerance. */
@Component({
  selector: 'app-match-criteria-form',
  imports: [
    MatButtonModule,
    MatButtonToggleModule,
    MatCheckboxModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatSelectModule,
    ReactiveFormsModule,
  ],
  templateUrl: './criteria-form.html',
  styleUrl: './criteria-form.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CriteriaFormView {
  readonly form = input.required<CriteriaForm>();
  /** The type library. */
  readonly types = input.required<readonly ValveTypeView[]>();
  /** The chosen type, or null before one is chosen. */
  readonly type = input<ValveTypeView | null>(null);
  /** Whether the user may start runs (technicians and admins). */
  readonly canRun = input(false);
  readonly running = input(false);
  /** Run pressed on a valid form. */
  readonly runMatching = output<void>();
  /** Reset to the type's defaults pressed. */
  readonly resetDefaults = output<void>();

  protected readonly groupSizes = GROUP_SIZES;
  protected readonly presets = TOLERANCE_PRESETS;
  protected readonly statuses = VALVE_STATUSES.map((s) => ({ value: s, label: STATUS_LABELS[s] }));
  /** Counts the form's events, so derived state follows values and validity. */
  private readonly changes = signal(0);

  protected readonly screen = computed(() => {
    const t = this.type();
    return !!t && typeHasScreen(t);
  });
  protected readonly sections = computed(() => {
    const t = this.type();
    return !!t && typeHasSections(t);
  });
  /** The published point the defaults come from, in words. */
  protected readonly sourceText = computed(() => {
    const op = this.type()?.operatingPoints[0];
    if (!op) return '';
    const vg2 = op.vg2Volts !== null ? `, Vg2 ${op.vg2Volts} V` : '';
    return `Va ${op.vaVolts} V, Vg1 ${op.vg1Volts} V${vg2}, Ia ${op.iaMilliamps} mA (${op.source})`;
  });
  protected readonly compareAt = computed(() => {
    this.changes();
    return this.form().controls.compareAt.value;
  });
  protected readonly groupErrors = computed(() => {
    this.changes();
    const e = this.form().errors ?? {};
    const out: string[] = [];
    if (e['windowVa']) out.push('The window’s highest Va must be above its lowest.');
    if (e['windowIa']) out.push('The window’s highest Ia must be above its lowest.');
    if (e['noWeight']) out.push('At least one of the weights in use must be above 0.');
    return out;
  });
  protected readonly invalid = computed(() => {
    this.changes();
    return this.form().invalid;
  });
  protected readonly toleranceValue = computed(() => {
    this.changes();
    return this.form().controls.tolerancePercent.value;
  });

  constructor() {
    effect((onCleanup) => {
      const sub = this.form().events.subscribe(() => this.changes.update((n) => n + 1));
      onCleanup(() => sub.unsubscribe());
    });
  }

  protected sizeLabel(n: number): string {
    if (n === 2) return 'Pair (2)';
    if (n === 4) return 'Quad (4)';
    return `Set of ${n}`;
  }

  protected pickTolerance(percent: number): void {
    const c = this.form().controls.tolerancePercent;
    c.setValue(percent);
    c.markAsDirty();
  }

  protected submit(): void {
    if (this.form().valid && this.canRun() && !this.running()) this.runMatching.emit();
  }
}
