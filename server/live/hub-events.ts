import type { SweepPoint } from '../../shared/domain/sweep';
import type { QuickTestView, SweepView } from '../../shared/hub/messages';

/** What the services tell the live module, so browsers hear of changes as they happen. */
export interface HubEvents {
  /** Something browsers see of a bench changed (online state, status, limits, name). */
  benchesChanged(): void;
  /** A sweep's record changed (status, times, message). */
  sweepChanged(sweep: SweepView): void;
  /** Points were stored for the first time, in seq order. */
  pointsStored(sweepId: number, points: SweepPoint[]): void;
  /** A quick test changed (optional: event sinks that predate quick tests ignore them). */
  quickTestChanged?(quickTest: QuickTestView): void;
}
