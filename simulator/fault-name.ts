/** Faults the simulated tracer can put into the socket; 'none' clears. See README.md. */
export const FAULT_NAMES = [
  'none',
  'short',
  'gas',
  'low-emission',
  'worn-cathode',
  'open-heater',
  'leaky-heater',
  'intermittent',
  'unplug',
  'corrupt',
] as const;

/** One injectable fault. */
export type FaultName = (typeof FAULT_NAMES)[number];

/** Whether a string names a fault. */
export function isFaultName(name: string): name is FaultName {
  return (FAULT_NAMES as readonly string[]).includes(name);
}
