import type { QuickTestGradeName } from '../../../shared/grading/grade-quick-test';
import type { QuickTestStatus } from '../../../shared/hub/messages';

/** Colour family of a box-check grade chip. */
export type GradeTone = 'good' | 'middling' | 'low' | 'fail' | 'none';

/** How the box check shows a grade: word and colour family. */
export interface GradeLook {
  text: string;
  tone: GradeTone;
}

const LOOKS: Record<QuickTestGradeName, GradeLook> = {
  strong: { text: 'Strong', tone: 'good' },
  fair: { text: 'Fair', tone: 'middling' },
  weak: { text: 'Weak', tone: 'low' },
  short: { text: 'Short', tone: 'fail' },
  leaky: { text: 'Leaky', tone: 'fail' },
  gassy: { text: 'Gassy', tone: 'fail' },
  'worn-cathode': { text: 'Worn cathode', tone: 'fail' },
  'open-heater': { text: 'Open heater', tone: 'fail' },
  incomplete: { text: 'Incomplete', tone: 'none' },
};

const ENDED_UNGRADED: Partial<Record<QuickTestStatus, string>> = {
  aborted: 'Aborted',
  'link-lost': 'Link lost',
  failed: 'Not graded',
};

/** The look of a grade, or of a test that ended without one (grade null) by how it ended. */
export function gradeLook(grade: QuickTestGradeName | null, status?: QuickTestStatus): GradeLook {
  if (grade) return LOOKS[grade];
  return { text: (status && ENDED_UNGRADED[status]) ?? 'No grade', tone: 'none' };
}
