import { describe, expect, it } from 'vitest';
import { findValveType } from '../../shared/catalog/valve-types';
import { limitsFromDevice } from '../../shared/domain/plan-check';
import { gradeQuickTest } from '../../shared/grading/grade-quick-test';
import { QUICK_TEST_PARTS } from '../../shared/grading/quick-test-part';
import { planQuickTest, type QuickTestPlan } from '../../shared/grading/quick-test-plan';
import { partOutcomes, type StepOutcome } from '../../shared/grading/quick-test-results';
import { stopReason } from '../../shared/grading/quick-test-stop';
import { DEFAULT_QUICK_TEST_THRESHOLDS } from '../../shared/grading/quick-test-thresholds';
import { checkCommand, checkReadingOf } from '../../shared/protocol';
import type { FaultName } from '../../simulator/fault-name';
import { SIMULATED_DEVICE, SIMULATED_EXTENSIONS } from '../../simulator/simulated-device';
import { manualBench, type ManualBench } from './bench';
import { line } from './test-host';

/*
 * The quick-test plan, run step by step on the simulated tracer's core (manual clock, no
 * transport), then graded: the physics of every fault against the grading rules, without the
 * bridge and the hub (test/pipeline/quick-test-pipeline.test.ts runs the whole chain).
 */

function runSteps(
  b: ManualBench,
  plan: QuickTestPlan,
): { outcomes: StepOutcome[]; stop: string | null } {
  const outcomes: StepOutcome[] = [];
  for (const [index, step] of plan.steps.entries()) {
    const id = 100 + index;
    const from = b.host.messages.length;
    b.send(line(checkCommand(id, step.check)));
    for (let t = 0; t < 600 && !b.host.messages.slice(from).some((m) => m.type === 'end'); t++) {
      b.run(500);
    }
    const seen = b.host.messages.slice(from);
    const end = seen.find((m) => m.type === 'end');
    const error = seen.find((m) => m.type === 'error');
    outcomes.push({
      index,
      role: step.role,
      status: end?.type === 'end' ? end.reason : 'refused',
      message: error?.type === 'error' ? error.text : 'done',
      errorCode: error?.type === 'error' ? error.code : null,
      readings: seen.flatMap((m) => {
        const r = checkReadingOf(m);
        return r && r.checkId === id ? [r.reading] : [];
      }),
    });
    const stop = stopReason(outcomes[outcomes.length - 1], DEFAULT_QUICK_TEST_THRESHOLDS);
    if (stop) return { outcomes, stop };
  }
  return { outcomes, stop: null };
}

function quickTest(valve: string, fault: FaultName) {
  const type = findValveType(valve.split('#')[0])!;
  const plan = planQuickTest({
    type,
    parts: QUICK_TEST_PARTS,
    limits: limitsFromDevice({ ...SIMULATED_DEVICE, watchdogMs: 3000 }),
    features: SIMULATED_EXTENSIONS.features,
    leakageMaxVolts: SIMULATED_EXTENSIONS.leakageMaxVolts,
  });
  const b = manualBench({ valve, fault });
  const { outcomes, stop } = runSteps(b, plan);
  const parts = partOutcomes(plan, QUICK_TEST_PARTS, outcomes, stop);
  const grade = gradeQuickTest(plan.reference, parts, DEFAULT_QUICK_TEST_THRESHOLDS);
  if (process.env['QUICK_TEST_LOG']) console.log(valve, fault, JSON.stringify(grade, null, 1));
  return { plan, parts, grade };
}

describe('quick test on the simulated tracer', () => {
  it('grades a sound 12AX7 strong, every part done', () => {
    const { parts, grade } = quickTest('12AX7#1', 'none');
    expect(parts.map((p) => p.status)).toEqual(['done', 'done', 'done', 'done', 'done']);
    expect(grade.grade).toBe('strong');
    expect(grade.reason).toMatch(/of nominal|of a sound valve's/);
  });

  it('grades a low-emission 12AX7 weak, on gm and emission near half', () => {
    const { grade } = quickTest('12AX7#1', 'low-emission');
    expect(grade.grade).toBe('weak');
    expect(grade.findings.map((f) => f.criterion)).toEqual(
      expect.arrayContaining(['gm', 'emission']),
    );
  });

  it('fails a gassy 12AX7 as gassy, on its reverse grid current', () => {
    const { grade } = quickTest('12AX7#1', 'gas');
    expect(grade.grade).toBe('gassy');
    expect(grade.reason).toMatch(/reverse grid current .* uA at 250 V \/ -2 V/);
  });

  it('fails a shorted 12AX7 as short, found between anode and cathode, with no high voltage after', () => {
    const { grade, parts } = quickTest('12AX7#1', 'short');
    expect(grade.grade).toBe('short');
    expect(grade.reason).toMatch(/^anode-cathode short/);
    expect(parts.map((p) => p.status)).toEqual([
      'done',
      'skipped',
      'skipped',
      'skipped',
      'skipped',
    ]);
    expect(parts[1].message).toMatch(/a shorted valve gets no high voltage/);
  });

  it('fails a 12AX7 with a worn cathode on the reduced-heater test', () => {
    const { grade } = quickTest('12AX7#1', 'worn-cathode');
    expect(grade.grade).toBe('worn-cathode');
    expect(grade.reason).toMatch(/gm falls .* at 11\.34 V heater/);
  });

  it('fails a leaky heater as leaky and an open one as open-heater', () => {
    expect(quickTest('12AX7#1', 'leaky-heater').grade.grade).toBe('leaky');
    expect(quickTest('12AX7#1', 'open-heater').grade.grade).toBe('open-heater');
  });

  it('grades a sound EL34 strong', () => {
    const { parts, grade } = quickTest('EL34#4', 'none');
    expect(parts.every((p) => p.status === 'done')).toBe(true);
    expect(grade.grade).toBe('strong');
  });
});
