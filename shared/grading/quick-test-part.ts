/**
 * The parts of a quick test, in the order they run: leakage and shorts first, so a shorted
 * valve never gets high voltage; the reduced-heater test last, so the heater change disturbs
 * no other reading.
 */
export const QUICK_TEST_PARTS = [
  'leakage',
  'gm',
  'grid-current',
  'emission',
  'reduced-heater',
] as const;

/** One part of a quick test. */
export type QuickTestPart = (typeof QUICK_TEST_PARTS)[number];

/** Words for a part, for messages. */
export const PART_TITLES: Record<QuickTestPart, string> = {
  leakage: 'leakage and shorts',
  gm: 'gm at the operating point',
  'grid-current': 'grid current (gas)',
  emission: 'emission',
  'reduced-heater': 'reduced-heater test',
};
