import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { plannedPointCount, type SweepPoint } from '../../../shared/domain/sweep';
import type { BenchView, SweepView } from '../../../shared/hub/messages';
import { FamilyAnalysis } from '../analysis/family-analysis';
import { sweepStatusLabel } from '../sweeps/sweep-status-label';
import { SweepStatusChip } from '../sweeps/sweep-status-chip';

/**
 * The sweep on a bench as it happens: progress, latest readings, the curves with their analysis
 * (recomputed as points arrive), how it ended.
 */
@Component({
  selector: 'app-live-sweep',
  imports: [DatePipe, FamilyAnalysis, MatIconModule, MatProgressBarModule, SweepStatusChip],
  templateUrl: './live-sweep.html',
  styleUrl: './live-sweep.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class LiveSweep {
  readonly sweep = input.required<SweepView>();
  readonly points = input<readonly SweepPoint[]>([]);
  readonly bench = input<BenchView | null>(null);

  protected readonly active = computed(() => {
    const status = this.sweep().status;
    return status === 'pending' || status === 'running';
  });
  protected readonly planned = computed(() => plannedPointCount(this.sweep().plan));
  protected readonly progressPercent = computed(() => {
    if (this.sweep().status === 'complete') return 100;
    const planned = this.planned();
    return planned ? Math.min(100, (this.points().length / planned) * 100) : 0;
  });
  protected readonly latest = computed(() => this.points().at(-1) ?? null);
  protected readonly latestPaWatts = computed(() => {
    const p = this.latest();
    return p ? (p.vaVolts * p.iaMilliamps) / 1000 : null;
  });
  protected readonly hasScreen = computed(() => this.sweep().plan.vg2Volts > 0);
  protected readonly warmupLeftSeconds = computed(() => {
    const status = this.bench()?.status;
    return this.active() && status?.state === 'warming' ? status.warmupLeftSeconds : 0;
  });
  protected readonly warmupPercent = computed(() => {
    const total = this.sweep().plan.warmupSeconds;
    return total > 0 ? 100 * (1 - this.warmupLeftSeconds() / total) : 100;
  });
  protected readonly ending = computed(() => {
    const status = this.sweep().status;
    return status === 'pending' || status === 'running' ? null : sweepStatusLabel(status);
  });
}
