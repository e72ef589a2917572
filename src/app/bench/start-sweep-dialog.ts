import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import type { SweepPlan } from '../../../shared/domain/sweep';

/** What the confirmation shows. */
export interface StartSweepDialogData {
  benchName: string;
  plan: SweepPlan;
  valveType: string | null;
  valveLabel: string | null;
  /** The admin override of the type's ratings is on. */
  override: boolean;
}

/**
 * Last step before high voltage: states the voltages and limits about to be applied and the
 * cautions. Closes with true to start.
 */
@Component({
  selector: 'app-start-sweep-dialog',
  imports: [MatButtonModule, MatDialogModule, MatIconModule],
  templateUrl: './start-sweep-dialog.html',
  styleUrl: './start-sweep-dialog.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StartSweepDialog {
  protected readonly data = inject<StartSweepDialogData>(MAT_DIALOG_DATA);

  protected readonly vaHighVolts = computed(() => {
    const p = this.data.plan;
    return p.kind === 'transfer' ? p.vaStartVolts : Math.max(p.vaStartVolts, p.vaStopVolts);
  });
  protected readonly vg1LowVolts = computed(() => Math.min(...this.data.plan.vg1Volts));
  protected readonly vg1HighVolts = computed(() => Math.max(...this.data.plan.vg1Volts));
  protected readonly valve = computed(() =>
    [this.data.valveType, this.data.valveLabel].filter(Boolean).join(' · '),
  );
}
