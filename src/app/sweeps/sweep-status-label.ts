import type { SweepStatus } from '../../../shared/domain/sweep';

/** How a sweep state is shown: a short label, a sentence, and its tone for colouring. */
export interface SweepStatusLabel {
  label: string;
  sentence: string;
  tone: 'active' | 'ok' | 'neutral' | 'warn' | 'danger';
  icon: string;
}

const LABELS: Record<SweepStatus, SweepStatusLabel> = {
  pending: {
    label: 'Queued',
    sentence: 'Sent to the bench, waiting for the tracer to accept the plan.',
    tone: 'active',
    icon: 'timer',
  },
  running: { label: 'Running', sentence: 'Measuring.', tone: 'active', icon: 'monitoring' },
  complete: {
    label: 'Complete',
    sentence: 'Every curve was measured.',
    tone: 'ok',
    icon: 'check_circle',
  },
  aborted: {
    label: 'Aborted',
    sentence: 'Aborted by a user; outputs were switched off.',
    tone: 'neutral',
    icon: 'stop_circle',
  },
  limit: {
    label: 'Tripped',
    sentence: 'A reading went past the trip limit; the sweep stopped and outputs went off.',
    tone: 'warn',
    icon: 'warning',
  },
  fault: {
    label: 'Fault',
    sentence: 'The tracer reported a fault and switched its outputs off.',
    tone: 'danger',
    icon: 'error',
  },
  'link-lost': {
    label: 'Link lost',
    sentence: 'The link to the tracer was lost; the tracer switches its outputs off by itself.',
    tone: 'danger',
    icon: 'link_off',
  },
};

/** Label, sentence and tone of a sweep state. */
export function sweepStatusLabel(status: SweepStatus): SweepStatusLabel {
  return LABELS[status];
}

/** Every sweep state, in the order filters list them. */
export const SWEEP_STATUSES: readonly SweepStatus[] = [
  'pending',
  'running',
  'complete',
  'aborted',
  'limit',
  'fault',
  'link-lost',
];
