import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import type { BenchView } from '../../../shared/hub/messages';

/**
 * The high-voltage warning: shown whenever any bench reports live anode or screen supply. It
 * sits outside the page content, so it is visible from every page.
 */
@Component({
  selector: 'app-high-voltage-banner',
  imports: [MatIconModule],
  template: `
    @if (liveBenches().length) {
      <div class="banner" role="alert" aria-live="assertive">
        <span class="badge"><mat-icon svgIcon="bolt" aria-hidden="true" /></span>
        <span class="text"> <strong>HIGH VOLTAGE LIVE</strong> — {{ liveNames() }} </span>
        <span class="note">Keep hands off the socket and leads</span>
      </div>
    }
  `,
  styleUrl: './high-voltage-banner.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class HighVoltageBanner {
  readonly benches = input<readonly BenchView[]>([]);

  // A stale report from a disconnected bridge still warns: the supply state is unknown.
  protected readonly liveBenches = computed(() =>
    this.benches().filter((b) => b.status?.highVoltage === true),
  );
  protected readonly liveNames = computed(() =>
    this.liveBenches()
      .map((b) => (b.bridgeOnline ? b.name : `${b.name} (last report)`))
      .join(', '),
  );
}
