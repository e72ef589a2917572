import type { QuickTestLimits } from './settings-api';

/** One quick-test limit as the settings page shows it. */
export interface LimitField {
  key: keyof QuickTestLimits;
  label: string;
  unit: string;
  min: number;
  max: number;
  /** What the limit does, and where its default comes from. */
  hint: string;
}

/** The quick-test limits in the order a technician meets them, with their defaults' basis. */
export const LIMIT_FIELDS: readonly LimitField[] = [
  {
    key: 'shortMinMicroamps',
    label: 'Short from',
    unit: 'µA',
    min: 1,
    max: 10000,
    hint: 'A pair drawing this much at the test voltage is shorted, not leaky. Default 100 µA (our choice: under 1 MΩ at 100 V).',
  },
  {
    key: 'leakageMaxMicroamps',
    label: 'Heater-cathode leakage up to',
    unit: 'µA',
    min: 0.1,
    max: 1000,
    hint: 'Default 10 µA (our choice: 10 MΩ at 100 V; a sound valve reads tens of nA).',
  },
  {
    key: 'electrodeLeakageMaxMicroamps',
    label: 'Other electrode leakage up to',
    unit: 'µA',
    min: 0.01,
    max: 1000,
    hint: 'Between any other two electrodes. Default 2 µA (our choice: 50 MΩ at 100 V).',
  },
  {
    key: 'gasMaxMicroamps',
    label: 'Reverse grid current up to',
    unit: 'µA',
    min: 0.01,
    max: 100,
    hint: 'More means gas. Default 0.2 µA, in line with common practice for small-signal valves; power valves may warrant more.',
  },
  {
    key: 'reducedHeaterMaxDropPercent',
    label: 'gm fall at 10 % less heater up to',
    unit: '%',
    min: 1,
    max: 50,
    hint: "More means a worn cathode. Default 10 % (common practice: a sound cathode's gm hardly moves).",
  },
];
