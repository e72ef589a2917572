import type { HardFail } from '../../../shared/grading/grade-quick-test';
import type { ValveGrade } from '../../../shared/grading/grade-thresholds';
import type { OriginKind, ValveStatus } from './valves-api';

/** Words for a valve's status. */
export const STATUS_LABELS: Record<ValveStatus, string> = {
  'in-stock': 'In stock',
  'on-test': 'On test',
  reserved: 'Reserved',
  sold: 'Sold',
  customer: "Customer's",
  rejected: 'Rejected',
};

/** Words for where a valve came from. */
export const ORIGIN_LABELS: Record<OriginKind, string> = {
  lot: 'Bought-in lot',
  supplier: 'Supplier',
  customer: 'Customer amplifier',
};

/** Words for a grade. */
export const GRADE_LABELS: Record<ValveGrade, string> = {
  strong: 'Strong',
  fair: 'Fair',
  weak: 'Weak',
};

/** Words for a fault a quick test found. */
export const HARD_FAIL_LABELS: Record<HardFail, string> = {
  'open-heater': 'Open heater',
  short: 'Short',
  leaky: 'Leaky',
  gassy: 'Gassy',
  'worn-cathode': 'Worn cathode',
};
