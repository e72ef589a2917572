import type { ValveView } from './valves-api';

/** A valve record for specs. */
export function valveView(over: Partial<ValveView> = {}): ValveView {
  return {
    id: 7,
    label: 'WK-0007',
    type: '12AX7',
    maker: 'Aldermoor',
    dateCode: 'B3K',
    originKind: 'lot',
    originText: 'Box from the Tarrant estate',
    location: 'Drawer C3',
    status: 'in-stock',
    notes: null,
    grade: 'fair',
    percentOfNominal: 71.6,
    sweepCount: 2,
    lastSweepAt: '2026-11-30T10:00:00Z',
    createdBy: 'tech',
    updatedBy: 'tech',
    createdAt: '2026-11-01T10:00:00Z',
    updatedAt: '2026-11-30T10:00:00Z',
    ...over,
  };
}
