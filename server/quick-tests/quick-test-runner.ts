import type { SweepEndReason } from '../../shared/domain/sweep';
import { gradeQuickTest } from '../../shared/grading/grade-quick-test';
import type { QuickTestPart } from '../../shared/grading/quick-test-part';
import type { QuickTestPlan } from '../../shared/grading/quick-test-plan';
import { partOutcomes, type StepOutcome } from '../../shared/grading/quick-test-results';
import { stopReason } from '../../shared/grading/quick-test-stop';
import type { QuickTestThresholds } from '../../shared/grading/quick-test-thresholds';
import type { BenchDeviceStatus, QuickTestStatus, QuickTestView } from '../../shared/hub/messages';
import type { CheckPlan, CheckReading } from '../../shared/protocol/check-plan';
import type { DeviceErrorCode } from '../../shared/protocol/messages';
import type { HubDb } from '../db/database';
import type { Logger } from '../http/error-middleware';
import type { BenchPresence } from '../live/bench-presence';
import { KeyedTimers } from '../sweeps/keyed-timers';
import { toQuickTestView } from './quick-test-view';
import {
  ACTIVE_QUICK_TEST_STATUSES,
  findQuickTest,
  listActiveQuickTests,
  updateQuickTestFrom,
} from './quick-test.repository';

/** Where quick-test changes go (the browser fan-out). */
export interface QuickTestEvents {
  quickTestChanged(view: QuickTestView): void;
}

/** Props of the runner. */
export interface QuickTestRunnerProps {
  db: HubDb;
  presence: BenchPresence;
  events: QuickTestEvents;
  logger: Logger;
  /** How long a step waits for `check-started`, ms. */
  startTimeoutMs: number;
  /** How long after an abort request the hub follows up with `outputs-off`, ms; default 5000. */
  abortFollowUpMs?: number;
}

/**
 * Check ids are offset far above sweep ids, which share the tracer's id space: check
 * 1000000173 is step 3 of quick test 17.
 */
export const CHECK_ID_BASE = 1_000_000_000;

/** The check id of a step. */
export function checkIdOf(quickTestId: number, stepIndex: number): number {
  return CHECK_ID_BASE + quickTestId * 10 + stepIndex;
}

/** Slack on top of a step's own time (warm-up, settling) before the hub gives up on it, ms. */
const STEP_SLACK_MS = 60_000;

interface Run {
  id: number;
  benchId: number;
  plan: QuickTestPlan;
  parts: QuickTestPart[];
  thresholds: QuickTestThresholds;
  steps: StepOutcome[];
  /** Step on the bench (or being started). */
  index: number;
  checkId: number;
  started: boolean;
  warmupLeftSeconds: number;
  abortRequested: boolean;
  /** Operations on a run happen one at a time, in order. */
  chain: Promise<void>;
}

/** Runs quick tests step by step on their benches; the bridge session feeds it. */
export type QuickTestRunner = ReturnType<typeof createQuickTestRunner>;

/** Builds the runner. */
export function createQuickTestRunner(props: QuickTestRunnerProps) {
  const { db, presence, events, logger, startTimeoutMs } = props;
  const abortFollowUpMs = props.abortFollowUpMs ?? 5000;
  const runs = new Map<number, Run>();
  const timers = new KeyedTimers();
  // Checks a bench still reported as running after the hub had finished with them (told once).
  const staleChecks = new Set<number>();

  const runOfBench = (benchId: number) => [...runs.values()].find((r) => r.benchId === benchId);

  /** Queues work on a run, so bridge reports and timers never interleave. */
  function serial(run: Run, work: () => Promise<void>): void {
    run.chain = run.chain
      .then(work)
      .catch((e) => logger.error(`quick test ${run.id}: ${(e as Error).message}`, e));
  }

  async function publish(run: Run | null, id: number): Promise<void> {
    const row = await findQuickTest(db, id);
    if (!row) return;
    const live = run && { runningIndex: run.index, warmupLeftSeconds: run.warmupLeftSeconds };
    events.quickTestChanged(toQuickTestView(row, live ?? undefined));
  }

  async function sendStep(run: Run): Promise<void> {
    const step = run.plan.steps[run.index];
    run.checkId = checkIdOf(run.id, run.index);
    run.started = false;
    run.warmupLeftSeconds = 0;
    const sent = presence.send(run.benchId, {
      type: 'start-check',
      checkId: run.checkId,
      check: step.check,
    });
    if (!sent) {
      await finish(run, 'link-lost', 'the bench went away before the next step');
      return;
    }
    timers.set(`start:${run.id}`, startTimeoutMs, () =>
      serial(run, async () => {
        if (run.started || runs.get(run.id) !== run) return;
        presence.send(run.benchId, { type: 'abort-check', checkId: run.checkId });
        const seconds = Math.round(startTimeoutMs / 1000);
        await finish(
          run,
          'failed',
          `the bench did not start step ${run.index + 1} within ${seconds} s`,
        );
      }),
    );
    await publish(run, run.id);
  }

  /** Records how the current step ended and goes on to the next, or finishes. */
  async function stepEnded(run: Run, outcome: Omit<StepOutcome, 'index' | 'role'>): Promise<void> {
    timers.clear(`start:${run.id}`);
    timers.clear(`step:${run.id}`);
    const step: StepOutcome = {
      index: run.index,
      role: run.plan.steps[run.index].role,
      ...outcome,
    };
    run.steps.push(step);
    await updateQuickTestFrom(db, run.id, ACTIVE_QUICK_TEST_STATUSES, {
      steps_json: JSON.stringify(run.steps),
    });
    if (run.abortRequested || step.status === 'aborted') {
      await finish(run, 'aborted', 'aborted on request; outputs off');
      return;
    }
    if (step.status === 'link-lost') {
      await finish(run, 'link-lost', `step ${run.index + 1}: ${step.message}`);
      return;
    }
    const stop = stopReason(step, run.thresholds);
    if (stop) {
      await finish(run, 'complete', stop, stop);
      return;
    }
    if (run.index + 1 >= run.plan.steps.length) {
      await finish(run, 'complete', `complete: ${run.steps.length} checks run`);
      return;
    }
    run.index++;
    await sendStep(run);
  }

  /**
   * Ends a quick test: its parts as they stand (those not reached carry `notRun`), and the
   * grade when it completed. Aborted, lost and failed tests are not graded.
   */
  async function finish(
    run: Run,
    status: Exclude<QuickTestStatus, 'pending' | 'running'>,
    message: string,
    notRun = `not run: the quick test ended (${status})`,
  ): Promise<void> {
    if (runs.get(run.id) !== run) return;
    runs.delete(run.id);
    timers.clear(`start:${run.id}`);
    timers.clear(`step:${run.id}`);
    timers.clear(`abort:${run.id}`);
    const results = partOutcomes(run.plan, run.parts, run.steps, notRun);
    const grade =
      status === 'complete' ? gradeQuickTest(run.plan.reference, results, run.thresholds) : null;
    await updateQuickTestFrom(db, run.id, ACTIVE_QUICK_TEST_STATUSES, {
      status,
      end_message: message,
      ended_at: new Date().toISOString(),
      steps_json: JSON.stringify(run.steps),
      results_json: JSON.stringify(results),
      grade: grade?.grade ?? null,
      grade_percent: grade?.percent ?? null,
      grade_json: grade ? JSON.stringify(grade) : null,
    });
    logger.info(
      `quick test ${run.id}: ${status}${grade ? `, graded ${grade.grade}: ${grade.reason}` : ''}`,
    );
    await publish(null, run.id);
  }

  /** The run a bridge report is about, if it is the current step's. */
  function current(benchId: number, checkId: number): Run | undefined {
    const run = runOfBench(benchId);
    return run && run.checkId === checkId ? run : undefined;
  }

  return {
    /** Starts a stored, pending quick test on its bench; false if the bench is not reachable. */
    async begin(
      id: number,
      plan: QuickTestPlan,
      parts: QuickTestPart[],
      thresholds: QuickTestThresholds,
    ): Promise<boolean> {
      const row = await findQuickTest(db, id);
      if (!row) throw new Error(`quick test ${id} is missing`);
      const run: Run = {
        id,
        benchId: row.bench_id,
        plan,
        parts,
        thresholds,
        steps: [],
        index: 0,
        checkId: checkIdOf(id, 0),
        started: false,
        warmupLeftSeconds: 0,
        abortRequested: false,
        chain: Promise.resolve(),
      };
      runs.set(id, run);
      await updateQuickTestFrom(db, id, ['pending'], {
        status: 'running',
        started_at: new Date().toISOString(),
      });
      await sendStep(run);
      return runs.has(id);
    },

    /** Whether a quick test runs on the bench. */
    activeOnBench(benchId: number): boolean {
      return runOfBench(benchId) !== undefined;
    },

    /** What only the running test knows, for its view; undefined when it is not running. */
    live(id: number) {
      const run = runs.get(id);
      return run && { runningIndex: run.index, warmupLeftSeconds: run.warmupLeftSeconds };
    },

    /** The bench accepted the current step. */
    checkStarted(benchId: number, checkId: number): void {
      const run = current(benchId, checkId);
      if (!run) return;
      serial(run, async () => {
        run.started = true;
        timers.clear(`start:${run.id}`);
        const budgetMs = stepBudgetMs(run.plan.steps[run.index].check);
        timers.set(`step:${run.id}`, budgetMs, () =>
          serial(run, async () => {
            presence.send(run.benchId, { type: 'abort-check', checkId: run.checkId });
            const seconds = Math.round(budgetMs / 1000);
            await finish(run, 'failed', `step ${run.index + 1} did not end within ${seconds} s`);
          }),
        );
        await publish(run, run.id);
      });
    },

    /** A reading of the current step (progress only: the end repeats every reading). */
    checkReading(benchId: number, checkId: number, _reading: CheckReading): void {
      const run = current(benchId, checkId);
      if (run) serial(run, () => publish(run, run.id));
    },

    /** The current step ended on the bench. */
    checkEnded(
      benchId: number,
      checkId: number,
      reason: SweepEndReason,
      message: string,
      errorCode: DeviceErrorCode | null,
      readings: CheckReading[],
    ): void {
      const run = current(benchId, checkId);
      if (!run) return;
      serial(run, () =>
        stepEnded(run, { status: reason, message, errorCode, readings: [...readings] }),
      );
    },

    /** The bench refused the current step: nothing was switched on; the test goes on. */
    checkRefused(benchId: number, checkId: number, message: string): void {
      const run = current(benchId, checkId);
      if (!run) return;
      serial(run, () =>
        stepEnded(run, {
          status: 'refused',
          message: `refused by the bench: ${message}`,
          errorCode: null,
          readings: [],
        }),
      );
    },

    /**
     * A bench status: the warm-up countdown of the current step goes to browsers; a check the
     * bench runs that no quick test owns is told to abort, once.
     */
    statusReported(benchId: number, status: BenchDeviceStatus): void {
      const checkId = status.checkId ?? null;
      const run = runOfBench(benchId);
      if (checkId !== null && run?.checkId !== checkId && !staleChecks.has(checkId)) {
        staleChecks.add(checkId);
        logger.warn(
          `bench ${benchId} runs check ${checkId}, which no quick test owns; aborting it`,
        );
        presence.send(benchId, { type: 'abort-check', checkId });
        return;
      }
      if (!run || checkId !== run.checkId) return;
      const left = status.warmupLeftSeconds;
      if (left === run.warmupLeftSeconds) return;
      run.warmupLeftSeconds = left;
      serial(run, () => publish(run, run.id));
    },

    /** The bench's bridge went away: its quick test cannot go on (checks are not journaled). */
    bridgeDisconnected(benchId: number): void {
      const run = runOfBench(benchId);
      if (!run) return;
      serial(run, () =>
        finish(
          run,
          'link-lost',
          `the bench's bridge went away during step ${run.index + 1}; its tracer switched the ` +
            'outputs off',
        ),
      );
    },

    /** Asks the bench to abort; ends the test at once if the bench is unreachable. */
    async abort(id: number): Promise<void> {
      const run = runs.get(id);
      if (!run) {
        // Not running here (a hub restart): the record ends now.
        const row = await findQuickTest(db, id);
        if (!row) return;
        await updateQuickTestFrom(db, id, ACTIVE_QUICK_TEST_STATUSES, {
          status: 'aborted',
          end_message: 'aborted on request',
          ended_at: new Date().toISOString(),
        });
        await publish(null, id);
        return;
      }
      await new Promise<void>((done) =>
        serial(run, async () => {
          run.abortRequested = true;
          const sent = presence.send(run.benchId, { type: 'abort-check', checkId: run.checkId });
          if (!sent) {
            await finish(run, 'aborted', 'aborted on request while the bench was offline');
          } else {
            timers.set(`abort:${run.id}`, abortFollowUpMs, () =>
              serial(run, async () => {
                presence.send(run.benchId, { type: 'outputs-off' });
                await finish(
                  run,
                  'aborted',
                  'aborted on request; the hub switched the outputs off',
                );
              }),
            );
          }
          done();
        }),
      );
    },

    /** After a hub restart, unfinished quick tests cannot go on: they end 'link-lost'. */
    async resume(): Promise<void> {
      for (const row of await listActiveQuickTests(db)) {
        await updateQuickTestFrom(db, row.id, ACTIVE_QUICK_TEST_STATUSES, {
          status: 'link-lost',
          end_message: 'the hub restarted during the quick test',
          ended_at: new Date().toISOString(),
        });
      }
    },

    /** Stops every timer (hub shutdown). */
    close(): void {
      timers.clearAll();
      runs.clear();
    },
  };
}

/** Longest a step may take on the bench: its warm-up and readings, plus slack, ms. */
function stepBudgetMs(check: CheckPlan): number {
  const readings =
    check.kind === 'transfer'
      ? check.plan.vg1Volts.length
      : check.kind === 'leakage'
        ? check.pairs.length
        : 1;
  const p = check.kind === 'transfer' ? check.plan : check;
  return p.warmupSeconds * 1000 + readings * (p.settleMs + 100) + STEP_SLACK_MS;
}
