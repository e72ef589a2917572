import type { MatchSetStatus } from './match-sets-api';

/** What a group of `size` valves is called: pair, quad, or set of n. */
export function groupNoun(size: number): string {
  if (size === 2) return 'pair';
  if (size === 4) return 'quad';
  return `set of ${size}`;
}

/** Heading of group `index` (0-based) of a run, e.g. "Quad 2". */
export function groupTitle(size: number, index: number): string {
  const noun = groupNoun(size);
  return `${noun[0].toUpperCase()}${noun.slice(1)} ${index + 1}`;
}

/** Words for why a valve is in no group (the hub's detail follows them). */
export const LEFT_OVER_LABELS: Readonly<Record<string, string>> = {
  'pool-size': 'Fills no further group',
  'no-data': 'Cannot be read at these criteria',
  'wrong-type': 'Another type',
  'no-second-section': 'Section 2 not measured',
  'section-imbalance': 'Sections too far apart',
};

/** Words for a match set's status. */
export const SET_STATUS_LABELS: Readonly<Record<MatchSetStatus, string>> = {
  reserved: 'Reserved',
  sold: 'Sold',
  released: 'Released',
};

/** A percentage for the tables: one decimal, "—" when absent. */
export function percentText(value: number | null | undefined): string {
  return value === null || value === undefined ? '—' : `${value.toFixed(1)} %`;
}

/** A figure to three significant digits (whole numbers from 100 up), "—" when absent. */
export function figureText(value: number | null | undefined): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  return Math.abs(value) >= 100 ? String(Math.round(value)) : String(Number(value.toPrecision(3)));
}
