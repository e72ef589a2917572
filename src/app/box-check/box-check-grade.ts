import type { QuickTestGradeName } from '../../../shared/grading/grade-quick-test';

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

/** The look of a grade, or of a test that ended without one (null). */
export function gradeLook(grade: QuickTestGradeName | null): GradeLook {
  return grade ? LOOKS[grade] : { text: 'No grade', tone: 'none' };
}
