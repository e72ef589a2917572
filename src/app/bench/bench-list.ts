import { ChangeDetectionStrategy, Component, input, output } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { droppedCount } from '../../../shared/protocol/line-reader';
import type { BenchView } from '../../../shared/hub/messages';

/** The benches as selectable cards: link, tracer state, heater and warm-up, line drops. */
@Component({
  selector: 'app-bench-list',
  imports: [MatIconModule],
  templateUrl: './bench-list.html',
  styleUrl: './bench-list.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class BenchList {
  readonly benches = input<readonly BenchView[]>([]);
  readonly selectedId = input<number | null>(null);
  readonly selectBench = output<number>();

  protected stateLabel(bench: BenchView): string {
    if (!bench.bridgeOnline) return 'Offline';
    const status = bench.status;
    if (!status || !status.deviceOnline || !status.state) return 'No tracer';
    return { idle: 'Idle', warming: 'Warming up', sweeping: 'Sweeping', fault: 'Fault' }[
      status.state
    ];
  }

  protected stateTone(bench: BenchView): string {
    if (!bench.bridgeOnline || !bench.status?.deviceOnline) return 'off';
    return bench.status.state ?? 'off';
  }

  protected drops(bench: BenchView): number {
    return bench.status ? droppedCount(bench.status.lineStats) : 0;
  }
}
