import type { QuickTestGrade } from '../../shared/grading/grade-quick-test';
import type { QuickTestPart } from '../../shared/grading/quick-test-part';
import type { QuickTestPlan } from '../../shared/grading/quick-test-plan';
import {
  partOutcomes,
  type PartOutcome,
  type StepOutcome,
} from '../../shared/grading/quick-test-results';
import type { QuickTestView } from '../../shared/hub/messages';
import type { z } from 'zod';
import type { QuickTestRecord } from './quick-test.repository';
import type { quickTestSummarySchema } from './quick-test.schemas';

/** What only the running quick test knows: where it is and the bench's warm-up countdown. */
export interface QuickTestLive {
  /** Index of the step on the bench now, or null between steps. */
  runningIndex: number | null;
  /** Seconds of warm-up the bench reported left, 0 when none. */
  warmupLeftSeconds: number;
}

/**
 * Maps a quick-test row (snake_case, JSON text) to the API shape. A running test's part
 * results are worked out from its steps as they stand; an ended one's are as stored.
 */
export function toQuickTestView(row: QuickTestRecord, live?: QuickTestLive): QuickTestView {
  const plan = JSON.parse(row.plan_json) as QuickTestPlan;
  const parts = JSON.parse(row.parts_json) as QuickTestPart[];
  const steps = JSON.parse(row.steps_json) as StepOutcome[];
  const active = row.status === 'pending' || row.status === 'running';
  const results: PartOutcome[] = active
    ? partOutcomes(plan, parts, steps, null, live?.runningIndex ?? null)
    : (JSON.parse(row.results_json) as PartOutcome[]);
  const runningIndex = active ? (live?.runningIndex ?? null) : null;
  return {
    id: row.id,
    benchId: row.bench_id,
    valveType: row.valve_type,
    valveId: row.valve_id,
    valveLabel: row.valve_label,
    parts,
    status: row.status,
    currentPart: runningIndex === null ? null : (plan.steps[runningIndex]?.part ?? null),
    warmupLeftSeconds: active ? (live?.warmupLeftSeconds ?? 0) : 0,
    stepsDone: steps.length,
    stepCount: plan.steps.length,
    results,
    reference: plan.reference,
    grade: row.grade_json ? (JSON.parse(row.grade_json) as QuickTestGrade) : null,
    endMessage: row.end_message,
    operator: row.operator,
    createdAt: row.created_at,
    startedAt: row.started_at,
    endedAt: row.ended_at,
  };
}

/** A quick test as a valve's record lists it (the gm part's figures, when it was read). */
export function toQuickTestSummary(row: QuickTestRecord): z.output<typeof quickTestSummarySchema> {
  const results = JSON.parse(row.results_json) as PartOutcome[];
  const grade = row.grade_json ? (JSON.parse(row.grade_json) as QuickTestGrade) : null;
  const gm = results.find((r) => r.part === 'gm' && r.status === 'done')?.result;
  const g = gm?.part === 'gm' ? gm : null;
  return {
    id: row.id,
    at: row.ended_at ?? row.created_at,
    status: row.status,
    grade: row.grade,
    reason: grade?.reason ?? null,
    percent: row.grade_percent,
    vaVolts: g?.measurement.vaVolts ?? null,
    vg1Volts: g?.measurement.vg1Volts ?? null,
    iaMilliamps: g?.measurement.iaMilliamps ?? null,
    gmMicrosiemens: g?.measurement.gmMicrosiemens ?? null,
    iaPercent: g?.iaPercent ?? null,
    gmPercent: g?.gmPercent ?? null,
    operator: row.operator,
  };
}
