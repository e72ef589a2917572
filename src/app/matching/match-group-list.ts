import { ChangeDetectionStrategy, Component, computed, input, output } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import type { ValveTypeView } from '../core/valve-types-api';
import { groupTitle, LEFT_OVER_LABELS, percentText } from './match-labels';
import type { MatchRun, RunGroup } from './matching-api';
import { pointConditions } from './point-conditions';
import { PointSpreadTable } from './point-spread-table';

/** A group as the list shows it. */
interface GroupRow {
  index: number;
  title: string;
  group: RunGroup;
}

/** The groups of a run with their spreads and verdicts, and the valves left over. */
@Component({
  selector: 'app-match-group-list',
  imports: [MatIconModule, PointSpreadTable, RouterLink],
  templateUrl: './match-group-list.html',
  styleUrl: './match-group-list.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class MatchGroupList {
  readonly run = input.required<MatchRun>();
  /** Index of the chosen group, or null. */
  readonly selected = input<number | null>(null);
  /** The run's type from the library, for where its default point lies. */
  readonly type = input<ValveTypeView | null>(null);
  /** A group was chosen (its 0-based index). */
  readonly selectGroup = output<number>();

  protected readonly percent = percentText;

  protected readonly tolerance = computed(() => {
    const t = this.run().criteria.tolerancePercent;
    return typeof t === 'number' ? t : this.run().tolerances.usualPercent;
  });
  protected readonly conditions = computed(() => pointConditions(this.run().criteria, this.type()));
  protected readonly rows = computed<GroupRow[]>(() =>
    this.run().groups.map((group, index) => ({
      index,
      title: groupTitle(group.members.length, index),
      group,
    })),
  );
  protected readonly acceptableCount = computed(
    () => this.run().groups.filter((g) => g.acceptable).length,
  );

  protected reasonLabel(reason: string): string {
    return LEFT_OVER_LABELS[reason] ?? reason;
  }

  protected choose(index: number): void {
    this.selectGroup.emit(index);
  }
}
