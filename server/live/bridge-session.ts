import type { WebSocket } from 'ws';
import type { HubToBridge } from '../../shared/hub/messages';
import type { BenchService } from '../benches/bench.service';
import type { BenchRow } from '../db/database';
import type { Logger } from '../http/error-middleware';
import type { QuickTestRunner } from '../quick-tests/quick-test-runner';
import type { SweepRecorder } from '../sweeps/sweep-recorder';
import type { BenchPresence, BridgeLink } from './bench-presence';
import type { HubEvents } from './hub-events';
import { bridgeMessageSchema } from './live-message-schemas';
import type { z } from 'zod';

/** What a bridge connection needs from the rest of the hub. */
export interface BridgeSessionProps {
  presence: BenchPresence;
  benches: BenchService;
  recorder: SweepRecorder;
  events: HubEvents;
  logger: Logger;
  /** Runs quick tests; their checks' reports go to it (optional for hubs without them). */
  quickTestRunner?: QuickTestRunner;
}

/** Close code sent to a bridge connection that a newer one of the same bench replaces. */
export const REPLACED_CLOSE_CODE = 4000;

/** Messages waiting to be handled above which the socket stops reading (TCP backpressure). */
const PAUSE_ABOVE = 64;
const RESUME_BELOW = 16;

/**
 * Serves one authenticated bridge connection. Messages are handled one at a time, in order,
 * so points are stored before the end of their sweep is recorded, and acks go out in order.
 */
export function serveBridge(ws: WebSocket, bench: BenchRow, props: BridgeSessionProps): void {
  const { presence, benches, recorder, events, logger, quickTestRunner: quick } = props;
  const link: BridgeLink = {
    send(message: HubToBridge) {
      if (ws.readyState !== ws.OPEN) return false;
      ws.send(JSON.stringify(message));
      return true;
    },
    close: (code, reason) => ws.close(code, reason),
  };
  const previous = presence.connect(bench.id, link);
  previous?.close(REPLACED_CLOSE_CODE, 'replaced by a newer connection of this bench');
  recorder.bridgeConnected(bench.id);
  link.send({ type: 'welcome', benchId: bench.id, benchName: bench.name });
  events.benchesChanged();
  logger.info(`bridge of ${bench.name} connected`);

  let chain = Promise.resolve();
  let waiting = 0;
  let rejected = 0;

  ws.on('message', (data, isBinary) => {
    const message = parse(isBinary ? null : data.toString());
    if (!message) {
      if (rejected++ % 100 === 0)
        logger.warn(`bridge of ${bench.name} sent a malformed message (${rejected} so far)`);
      return;
    }
    waiting++;
    if (waiting > PAUSE_ABOVE && !ws.isPaused) ws.pause();
    chain = chain
      .then(() => handle(message))
      .catch((error) => logger.error(`bridge of ${bench.name}: ${message.type} failed`, error))
      .finally(() => {
        waiting--;
        if (waiting < RESUME_BELOW && ws.isPaused) ws.resume();
      });
  });

  ws.on('close', () => {
    if (!presence.disconnect(bench.id, link)) return; // a newer connection took over
    logger.info(`bridge of ${bench.name} disconnected`);
    events.benchesChanged();
    quick?.bridgeDisconnected(bench.id);
    void chain
      .then(() =>
        Promise.all([benches.recordSeen(bench.id), recorder.bridgeDisconnected(bench.id)]),
      )
      .catch((error) => logger.error(`bridge of ${bench.name}: disconnect handling failed`, error));
  });

  async function handle(message: z.output<typeof bridgeMessageSchema>): Promise<void> {
    const current = presence.isCurrent(bench.id, link);
    switch (message.type) {
      case 'hello':
        if (!current) return;
        presence.setCapabilities(bench.id, message.capabilities);
        presence.setExtensions(bench.id, message.extensions ?? null);
        presence.setStatus(bench.id, message.status);
        await benches.recordCapabilities(bench.id, message.capabilities);
        events.benchesChanged();
        await recorder.statusReported(bench.id, message.status);
        return;
      case 'status':
        if (!current) return;
        presence.setStatus(bench.id, message.status);
        events.benchesChanged();
        await recorder.statusReported(bench.id, message.status);
        quick?.statusReported(bench.id, message.status);
        return;
      case 'points': {
        const receipt = await recorder.storePoints(bench.id, message.sweepId, message.points);
        if (!receipt) return;
        link.send({ type: 'ack-points', sweepId: message.sweepId, throughSeq: receipt.throughSeq });
        if (receipt.complete) link.send({ type: 'ack-end', sweepId: message.sweepId });
        return;
      }
      case 'sweep-started':
        if (!(await recorder.started(bench.id, message.sweepId))) {
          link.send({ type: 'abort-sweep', sweepId: message.sweepId });
        }
        return;
      case 'sweep-ended': {
        const { sweepId, reason, count, message: text } = message;
        if (await recorder.ended(bench.id, sweepId, reason, count, text)) {
          link.send({ type: 'ack-end', sweepId });
        }
        return;
      }
      case 'sweep-refused':
        await recorder.refused(bench.id, message.sweepId, message.message);
        link.send({ type: 'ack-end', sweepId: message.sweepId });
        return;
      case 'check-started':
        quick?.checkStarted(bench.id, message.checkId);
        return;
      case 'check-reading':
        quick?.checkReading(bench.id, message.checkId, message.reading);
        return;
      case 'check-ended': {
        const { checkId, reason, message: text, errorCode, readings } = message;
        quick?.checkEnded(bench.id, checkId, reason, text, errorCode, readings);
        return;
      }
      case 'check-refused':
        quick?.checkRefused(bench.id, message.checkId, message.message);
        return;
    }
  }
}

function parse(text: string | null) {
  if (text === null) return null;
  try {
    const r = bridgeMessageSchema.safeParse(JSON.parse(text));
    return r.success ? r.data : null;
  } catch {
    return null;
  }
}
