import {
  plannedPointCount,
  type SweepEndReason,
  type SweepPlan,
  type SweepPoint,
} from '../../shared/domain/sweep';
import type { BenchDeviceStatus } from '../../shared/hub/messages';
import type { HubDb } from '../db/database';
import type { Logger } from '../http/error-middleware';
import type { BenchPresence } from '../live/bench-presence';
import type { HubEvents } from '../live/hub-events';
import { refreshSweepFigures } from '../valves/refresh-sweep-figures';
import { KeyedTimers } from './keyed-timers';
import { SeqWatermark } from './seq-watermark';
import { toSweepView } from './sweep-view';
import {
  ACTIVE_STATUSES,
  findActiveSweepOfBench,
  findSweep,
  insertNewPoints,
  listActiveSweeps,
  listPointSeqs,
  updateSweepFrom,
  type SweepRecord,
} from './sweep.repository';

/** Props of the sweep recorder. */
export interface SweepRecorderProps {
  db: HubDb;
  presence: BenchPresence;
  events: HubEvents;
  logger: Logger;
  /** How long an unfinished sweep waits for its bridge to come back, ms. */
  linkGraceMs: number;
  /** How long a new sweep waits for `sweep-started`, ms. */
  startTimeoutMs: number;
  /** How long after an abort request the hub follows up with `outputs-off`, ms. */
  abortFollowUpMs?: number;
}

/** Answer to a bridge's `points`: what to acknowledge. */
export interface PointsReceipt {
  /** Every seq up to this one is stored (-1: not even seq 0). */
  throughSeq: number;
  /** The sweep has ended and every point the device reported is stored. */
  complete: boolean;
}

/** How many sweeps keep their watermark in memory; others are reloaded from the database. */
const WATERMARK_CACHE = 64;

/** Records what bridges report about sweeps, and gives up on sweeps whose bridge is gone. */
export type SweepRecorder = ReturnType<typeof createSweepRecorder>;

/** Builds the recorder. */
export function createSweepRecorder(props: SweepRecorderProps) {
  const { db, presence, events, logger, linkGraceMs, startTimeoutMs } = props;
  const abortFollowUpMs = props.abortFollowUpMs ?? 5000;
  const timers = new KeyedTimers();
  // Promises, so that concurrent first uses share one load from the database.
  const watermarks = new Map<number, Promise<SeqWatermark>>();
  // Ended sweeps a bridge still reported as running, already told to abort (per bench).
  const staleAborts = new Map<number, Set<number>>();

  function watermark(sweepId: number): Promise<SeqWatermark> {
    let w = watermarks.get(sweepId);
    if (w) {
      watermarks.delete(sweepId);
    } else {
      w = listPointSeqs(db, sweepId).then((seqs) => new SeqWatermark(seqs));
      w.catch(() => watermarks.delete(sweepId));
    }
    watermarks.set(sweepId, w); // re-insert: Map order is least recently used first
    if (watermarks.size > WATERMARK_CACHE) watermarks.delete(watermarks.keys().next().value!);
    return w;
  }

  /**
   * Once every reported point is stored, the figures of a sweep on a valve record are computed
   * and kept, so that lists can grade valves without analysing sweeps. Off the path of the
   * acknowledgement: a failure is logged and the valve's page computes them again.
   */
  function computeFigures(sweepId: number): void {
    refreshSweepFigures(db, sweepId).catch((e) =>
      logger.error(`sweep ${sweepId}: could not compute its figures`, e),
    );
  }

  async function publish(sweepId: number): Promise<void> {
    const row = await findSweep(db, sweepId);
    if (row) events.sweepChanged(toSweepView(row));
  }

  /** Loads a sweep a bridge reported on, if it is that bench's. */
  async function sweepOfBench(
    benchId: number,
    sweepId: number,
  ): Promise<SweepRecord | 'unknown' | 'foreign'> {
    const row = await findSweep(db, sweepId);
    if (!row) return 'unknown';
    if (row.bench_id !== benchId) {
      logger.warn(
        `bench ${benchId} reported on sweep ${sweepId} of bench ${row.bench_id}; ignored`,
      );
      return 'foreign';
    }
    return row;
  }

  function disarm(sweepId: number): void {
    timers.clear(`grace:${sweepId}`);
  }

  async function giveUp(sweepId: number, status: SweepEndReason, reason: string, message: string) {
    const ended = await updateSweepFrom(db, sweepId, ACTIVE_STATUSES, {
      status,
      end_reason: reason,
      end_message: message,
      ended_at: new Date().toISOString(),
    });
    if (!ended) return;
    const row = await findSweep(db, sweepId);
    // The hub no longer counts this sweep as running: make sure the bench does not either.
    if (row) presence.send(row.bench_id, { type: 'abort-sweep', sweepId });
    logger.warn(`sweep ${sweepId}: ${message}`);
    await publish(sweepId);
  }

  function armGrace(sweepId: number): void {
    timers.set(`grace:${sweepId}`, linkGraceMs, () => {
      const seconds = Math.round(linkGraceMs / 1000);
      giveUp(
        sweepId,
        'link-lost',
        'link-lost',
        `the bench's bridge was gone for more than ${seconds} s`,
      ).catch((e) => logger.error(`sweep ${sweepId}: could not mark link-lost`, e));
    });
  }

  return {
    /**
     * Stores points idempotently in one transaction and fans the new ones out. Returns what to
     * acknowledge, or null when nothing should be (a sweep of another bench).
     */
    async storePoints(
      benchId: number,
      sweepId: number,
      points: readonly SweepPoint[],
    ): Promise<PointsReceipt | null> {
      const row = await sweepOfBench(benchId, sweepId);
      if (row === 'foreign') return null;
      // Unknown to the hub: nothing can ever be stored for it, so let the bridge forget it.
      if (row === 'unknown') return { throughSeq: -1, complete: true };
      disarm(sweepId);
      const bound = plannedPointCount(JSON.parse(row.plan_json) as SweepPlan);
      const valid = points.filter((p) => p.seq < bound);
      if (valid.length < points.length) {
        logger.warn(
          `sweep ${sweepId}: dropped ${points.length - valid.length} points past seq ${bound - 1}`,
        );
      }
      const inserted = await db
        .transaction()
        .execute((trx) => insertNewPoints(trx, sweepId, valid));
      const w = await watermark(sweepId);
      for (const p of valid) w.add(p.seq);
      if (inserted.length > 0) events.pointsStored(sweepId, inserted);
      const complete = row.reported_count !== null && w.throughSeq + 1 >= row.reported_count;
      if (complete && inserted.length > 0) computeFigures(sweepId);
      return { throughSeq: w.throughSeq, complete };
    },

    /** The device accepted the plan. Returns false if the hub had given the sweep up. */
    async started(benchId: number, sweepId: number): Promise<boolean> {
      const row = await sweepOfBench(benchId, sweepId);
      if (row === 'foreign') return true; // not this bench's to stop
      if (row === 'unknown') return false; // the hub never asked for it: stop it
      timers.clear(`start:${sweepId}`);
      disarm(sweepId);
      if (row.status === 'running') return true;
      const ok = await updateSweepFrom(db, sweepId, ['pending'], {
        status: 'running',
        started_at: new Date().toISOString(),
      });
      if (ok) await publish(sweepId);
      return ok;
    },

    /** The sweep ended. Returns whether to send `ack-end` (every reported point stored). */
    async ended(
      benchId: number,
      sweepId: number,
      reason: SweepEndReason,
      count: number,
      message: string,
    ) {
      const row = await sweepOfBench(benchId, sweepId);
      if (row === 'foreign') return false;
      if (row === 'unknown') return true;
      timers.clear(`start:${sweepId}`);
      timers.clear(`abort:${sweepId}`);
      disarm(sweepId);
      // The bridge's word replaces the hub's guess of link-lost; other endings stay as first told.
      const changed = await updateSweepFrom(db, sweepId, [...ACTIVE_STATUSES, 'link-lost'], {
        status: reason,
        end_reason: reason,
        end_message: message || null,
        ended_at: new Date().toISOString(),
        reported_count: count,
      });
      if (!changed && row.reported_count === null) {
        await updateSweepFrom(db, sweepId, [row.status], { reported_count: count });
      }
      await publish(sweepId);
      const complete = (await watermark(sweepId)).throughSeq + 1 >= count;
      if (complete) computeFigures(sweepId);
      return complete;
    },

    /** The bridge or device refused the plan. */
    async refused(benchId: number, sweepId: number, message: string): Promise<void> {
      const row = await sweepOfBench(benchId, sweepId);
      if (typeof row === 'string') return;
      timers.clear(`start:${sweepId}`);
      const ok = await updateSweepFrom(db, sweepId, ACTIVE_STATUSES, {
        status: 'fault',
        end_reason: 'refused',
        end_message: `refused by the bench: ${message}`,
        ended_at: new Date().toISOString(),
        reported_count: 0,
      });
      if (ok) await publish(sweepId);
    },

    /**
     * A status report. It proves the bridge still knows its running sweep (ends the grace), and
     * catches a bench still running a sweep the hub has ended: that one is told to abort, once.
     */
    async statusReported(benchId: number, status: BenchDeviceStatus): Promise<void> {
      const sweepId = status.sweepId;
      if (sweepId === null) {
        // Not (or no longer) running what the hub counts as running: the end should follow
        // shortly; if it does not, the grace period gives the sweep up.
        const active = await findActiveSweepOfBench(db, benchId);
        if (active?.status === 'running' && !timers.has(`grace:${active.id}`)) armGrace(active.id);
        return;
      }
      const row = await findSweep(db, sweepId);
      if (row && row.bench_id === benchId && ACTIVE_STATUSES.includes(row.status)) {
        disarm(sweepId);
        return;
      }
      const told = staleAborts.get(benchId) ?? new Set<number>();
      if (told.has(sweepId)) return;
      told.add(sweepId);
      staleAborts.set(benchId, told);
      logger.warn(`bench ${benchId} runs sweep ${sweepId}, which the hub has ended; aborting it`);
      presence.send(benchId, { type: 'abort-sweep', sweepId });
    },

    /** A bridge connected: start afresh on which stale sweeps it was told about. */
    bridgeConnected(benchId: number): void {
      staleAborts.delete(benchId);
    },

    /** A bridge went away: its unfinished sweep waits `linkGraceMs` for it to come back. */
    async bridgeDisconnected(benchId: number): Promise<void> {
      const row = await findActiveSweepOfBench(db, benchId);
      // Back already: its status reports decide whether the sweep is still known there.
      if (row && !presence.isOnline(benchId)) armGrace(row.id);
    },

    /** After a hub restart, unfinished sweeps wait for their bridges like after a disconnect. */
    async resume(): Promise<void> {
      for (const row of await listActiveSweeps(db)) {
        if (!presence.isOnline(row.bench_id)) armGrace(row.id);
      }
    },

    /** Called once `start-sweep` is sent: the bench has `startTimeoutMs` to start it. */
    awaitStart(sweepId: number): void {
      timers.set(`start:${sweepId}`, startTimeoutMs, () => {
        const seconds = Math.round(startTimeoutMs / 1000);
        giveUp(
          sweepId,
          'fault',
          'no-start',
          `the bench did not start the sweep within ${seconds} s`,
        ).catch((e) => logger.error(`sweep ${sweepId}: could not end it`, e));
      });
    },

    /** After an abort request, switch the bench's outputs off if the sweep has not ended. */
    followUpAbort(benchId: number, sweepId: number): void {
      timers.set(`abort:${sweepId}`, abortFollowUpMs, () => {
        findSweep(db, sweepId)
          .then((row) => {
            if (row && ACTIVE_STATUSES.includes(row.status)) {
              logger.warn(`sweep ${sweepId} did not end after abort; switching outputs off`);
              presence.send(benchId, { type: 'outputs-off' });
            }
          })
          .catch((e) => logger.error(`sweep ${sweepId}: abort follow-up failed`, e));
      });
    },

    /** Ends a sweep the hub gives up on (e.g. aborted while its bench is offline). */
    giveUp,

    /** Stops every timer (hub shutdown). */
    close(): void {
      timers.clearAll();
    },
  };
}
