import type { Generated, Insertable, Selectable } from 'kysely';
import type { QuickTestStatus } from '../../shared/hub/messages';

/** Row of `quick_tests`; the *_json columns hold JSON text (see quick-test-view.ts). */
export interface QuickTestTable {
  id: Generated<number>;
  bench_id: number;
  valve_type: string;
  /** Valve record, or null; not a foreign key (see the migration). */
  valve_id: number | null;
  valve_label: string | null;
  /** QuickTestPart[] asked for. */
  parts_json: string;
  /** QuickTestPlan: the checks and the reference figures. */
  plan_json: string;
  /** StepOutcome[]: what each check read, in step order. */
  steps_json: Generated<string>;
  /** PartOutcome[]: each part's status and figures. */
  results_json: Generated<string>;
  /** Grade name once complete, for filtering; null before. */
  grade: string | null;
  /** The graded figure (lowest of gm and emission) as % of nominal once complete, or null. */
  grade_percent: number | null;
  /** QuickTestGrade once complete. */
  grade_json: string | null;
  /** QuickTestThresholds the test is graded by (the workshop's at the start). */
  thresholds_json: string;
  operator_id: number;
  status: QuickTestStatus;
  end_message: string | null;
  created_at: string;
  started_at: string | null;
  ended_at: string | null;
}

export type QuickTestRow = Selectable<QuickTestTable>;
export type NewQuickTestRow = Insertable<QuickTestTable>;
