import type { WebSocket } from 'ws';
import type { SweepPoint } from '../../shared/domain/sweep';
import type { BenchView, HubToBrowser, QuickTestView, SweepView } from '../../shared/hub/messages';
import type { AuthUser } from '../auth/auth-user';
import { roleAtLeast } from '../auth/role';
import type { Logger } from '../http/error-middleware';
import { HttpError } from '../http/http-error';
import type { HubEvents } from './hub-events';
import { browserMessageSchema } from './live-message-schemas';
import { SweepWatch, type WatchOptions } from './sweep-watch';

/** What the browser side needs from the services. */
export interface BrowserFanoutProps {
  logger: Logger;
  listBenches(): Promise<BenchView[]>;
  sweepView(id: number): Promise<SweepView>;
  loadPoints(sweepId: number, fromSeq: number): Promise<SweepPoint[]>;
  abortSweep(id: number, user: AuthUser): Promise<SweepView>;
  /** Aborts a quick test (optional for hubs without them). */
  abortQuickTest?(id: number, user: AuthUser): Promise<QuickTestView>;
  /** Flow control of point streams. */
  watchOptions?: WatchOptions;
  /** A client with more than this queued is closed with 1013, whatever it was sent; 8 MiB. */
  closeAboveBytes?: number;
  /** Bench updates are gathered for this long and sent as one message, ms; default 100. */
  benchesDelayMs?: number;
}

interface Client {
  ws: WebSocket;
  user: AuthUser;
  watches: Map<number, SweepWatch>;
}

/** Most sweeps one browser connection may watch at once. */
const MAX_WATCHES = 8;

/** Browser connections on /ws/live and what each of them watches. */
export class BrowserFanout implements HubEvents {
  private readonly clients = new Set<Client>();
  private benchesTimer: NodeJS.Timeout | null = null;
  private readonly closeAboveBytes: number;

  constructor(private readonly props: BrowserFanoutProps) {
    this.closeAboveBytes = props.closeAboveBytes ?? 8 << 20;
  }

  /** Number of open browser connections. */
  get size(): number {
    return this.clients.size;
  }

  /** Takes over a freshly authenticated connection: sends the benches, then serves it. */
  add(ws: WebSocket, user: AuthUser): void {
    const client: Client = { ws, user, watches: new Map() };
    this.clients.add(client);
    ws.on('close', () => {
      this.clients.delete(client);
      for (const w of client.watches.values()) w.stop();
    });
    ws.on('message', (data, isBinary) => {
      this.handle(client, isBinary ? null : data.toString()).catch((error) => {
        const e = error instanceof HttpError ? error : null;
        if (!e) this.props.logger.error('browser message failed', error);
        this.send(client, {
          type: 'error',
          code: e?.code ?? 'internal',
          message: e?.message ?? 'internal error',
        });
      });
    });
    this.props
      .listBenches()
      .then((benches) => this.send(client, { type: 'benches', benches }))
      .catch((error) => this.props.logger.error('could not list benches', error));
  }

  /** Gathers bench changes for a moment, then sends every browser the list. */
  benchesChanged(): void {
    if (this.benchesTimer) return;
    this.benchesTimer = setTimeout(() => {
      this.benchesTimer = null;
      if (this.clients.size === 0) return;
      this.props
        .listBenches()
        .then((benches) => this.broadcast({ type: 'benches', benches }))
        .catch((error) => this.props.logger.error('could not list benches', error));
    }, this.props.benchesDelayMs ?? 100);
    this.benchesTimer.unref();
  }

  /** Sends a sweep's new state to every browser (lists and bench pages show it too). */
  sweepChanged(sweep: SweepView): void {
    this.broadcast({ type: 'sweep', sweep });
  }

  /** Sends a quick test's new state to every browser (small: one message per change). */
  quickTestChanged(quickTest: QuickTestView): void {
    this.broadcast({ type: 'quick-test', quickTest });
  }

  /** Passes new points to the browsers watching that sweep. */
  pointsStored(sweepId: number, points: SweepPoint[]): void {
    for (const c of this.clients) c.watches.get(sweepId)?.offer(points);
  }

  /** Closes every browser connection (hub shutdown). */
  closeAll(code: number, reason: string): void {
    if (this.benchesTimer) clearTimeout(this.benchesTimer);
    this.benchesTimer = null;
    for (const c of this.clients) {
      for (const w of c.watches.values()) w.stop();
      c.ws.close(code, reason);
    }
    this.clients.clear();
  }

  private broadcast(message: HubToBrowser): void {
    const data = JSON.stringify(message);
    for (const c of this.clients) this.sendRaw(c, data);
  }

  private send(client: Client, message: HubToBrowser): void {
    this.sendRaw(client, JSON.stringify(message));
  }

  private sendRaw(client: Client, data: string): void {
    if (client.ws.readyState !== client.ws.OPEN) return;
    if (client.ws.bufferedAmount > this.closeAboveBytes) {
      client.ws.close(1013, 'client too slow; reconnect');
      return;
    }
    client.ws.send(data);
  }

  private async handle(client: Client, text: string | null): Promise<void> {
    let json: unknown;
    try {
      json = JSON.parse(text ?? '');
    } catch {
      throw new HttpError(400, 'bad_message', 'messages are JSON text');
    }
    const parsed = browserMessageSchema.safeParse(json);
    if (!parsed.success) throw new HttpError(400, 'bad_message', 'unknown or malformed message');
    const message = parsed.data;
    if (message.type === 'unwatch-sweep') {
      client.watches.get(message.sweepId)?.stop();
      client.watches.delete(message.sweepId);
    } else if (message.type === 'watch-sweep') {
      await this.watch(client, message.sweepId);
    } else if (message.type === 'abort-quick-test') {
      if (!roleAtLeast(client.user.role, 'technician')) {
        throw new HttpError(
          403,
          'forbidden',
          'aborting a quick test needs the technician role or higher',
        );
      }
      if (!this.props.abortQuickTest) {
        throw new HttpError(400, 'bad_message', 'this hub runs no quick tests');
      }
      await this.props.abortQuickTest(message.quickTestId, client.user);
    } else {
      if (!roleAtLeast(client.user.role, 'technician')) {
        throw new HttpError(
          403,
          'forbidden',
          'aborting a sweep needs the technician role or higher',
        );
      }
      await this.props.abortSweep(message.sweepId, client.user);
    }
  }

  private async watch(client: Client, sweepId: number): Promise<void> {
    client.watches.get(sweepId)?.stop();
    client.watches.delete(sweepId);
    if (client.watches.size >= MAX_WATCHES) {
      throw new HttpError(429, 'too_many_watches', `watch at most ${MAX_WATCHES} sweeps at once`);
    }
    // Registered before the sweep is read, so no point stored from now on can be missed.
    const watch = new SweepWatch(
      sweepId,
      client.ws,
      this.props.loadPoints,
      this.props.watchOptions,
    );
    client.watches.set(sweepId, watch);
    try {
      const sweep = await this.props.sweepView(sweepId);
      this.send(client, { type: 'sweep', sweep });
    } catch (error) {
      watch.stop();
      client.watches.delete(sweepId);
      throw error;
    }
    await watch.start();
  }
}
