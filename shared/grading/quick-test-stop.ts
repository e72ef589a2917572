import type { StepOutcome } from './quick-test-results';
import type { QuickTestThresholds } from './quick-test-thresholds';

/**
 * Whether a quick test must stop after this step, and why; null to go on. It stops on a trip,
 * a fault, an abort or a lost link (a refusal means nothing was switched on, so it goes on),
 * and after a leakage check that found a short: a shorted valve never gets high voltage.
 */
export function stopReason(step: StepOutcome, thresholds: QuickTestThresholds): string | null {
  if (step.status === 'refused' || step.status === 'complete') {
    const shorted = step.readings.some(
      (r) => r.kind === 'leakage' && (r.overRange || r.microamps >= thresholds.shortMinMicroamps),
    );
    return shorted ? 'not run: a short was found, and a shorted valve gets no high voltage' : null;
  }
  const why: Record<Exclude<StepOutcome['status'], 'refused' | 'complete'>, string> = {
    aborted: 'the quick test was aborted',
    limit: 'a reading tripped the limits',
    fault: 'the tracer reported a fault',
    'link-lost': 'the link to the bench was lost',
  };
  return `not run: ${why[step.status]}`;
}
