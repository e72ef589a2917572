/**
 * Where a valve stands in the workshop: in stock, on a bench, held for a buyer, sold, a
 * customer's own valve in for testing, or rejected.
 */
export const VALVE_STATUSES = [
  'in-stock',
  'on-test',
  'reserved',
  'sold',
  'customer',
  'rejected',
] as const;

/** A valve record's status. */
export type ValveStatus = (typeof VALVE_STATUSES)[number];

/** Where a valve came from: a lot bought in, a supplier, or a customer's amplifier. */
export const ORIGIN_KINDS = ['lot', 'supplier', 'customer'] as const;

/** Kind of a valve's origin. */
export type OriginKind = (typeof ORIGIN_KINDS)[number];
