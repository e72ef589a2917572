import type { IncomingMessage } from 'node:http';
import type { AddressInfo } from 'node:net';
import WebSocket, { WebSocketServer } from 'ws';
import type { SweepPoint } from '../../shared/domain/sweep';
import type { BridgeToHub, HubToBridge } from '../../shared/hub/messages';
import { until } from './until';

/** A message as the fake hub received it, with the number of the connection it came on. */
export interface HubReceived {
  connection: number;
  message: BridgeToHub;
}

/**
 * A stand-in for the hub: a real ws WebSocketServer on port 0 that checks the bench token at
 * the upgrade, records what the bridge sends, stores points idempotently and, when autoAck is
 * on, acknowledges them the way the hub's contract says (cumulative ack, then ack-end).
 */
export class FakeHub {
  readonly received: HubReceived[] = [];
  readonly authHeaders: (string | undefined)[] = [];
  /** Points stored, once each, per sweep. */
  readonly stored = new Map<number, Map<number, SweepPoint>>();
  autoAck = true;
  /** While true, upgrades are refused with 503 (the hub is "down"). */
  down = false;
  token: string;
  connections = 0;
  private client: WebSocket | null = null;

  private constructor(
    private readonly server: WebSocketServer,
    token: string,
  ) {
    this.token = token;
    server.on('connection', (ws) => this.onConnection(ws));
  }

  /** Starts listening on 127.0.0.1, port 0. */
  static async start(token: string): Promise<FakeHub> {
    let hub!: FakeHub;
    const server = new WebSocketServer({
      host: '127.0.0.1',
      port: 0,
      path: '/ws/bridge',
      verifyClient: (info: { req: IncomingMessage }, done) => {
        hub.authHeaders.push(info.req.headers.authorization);
        if (hub.down) done(false, 503, 'hub down');
        else if (info.req.headers.authorization !== `Bearer ${hub.token}`) done(false, 401);
        else done(true);
      },
    });
    hub = new FakeHub(server, token);
    await new Promise<void>((ok) => server.once('listening', ok));
    return hub;
  }

  /** URL of the bridge endpoint. */
  get url(): string {
    return `ws://127.0.0.1:${(this.server.address() as AddressInfo).port}/ws/bridge`;
  }

  /** Whether a bridge is connected now. */
  get clientConnected(): boolean {
    return this.client?.readyState === WebSocket.OPEN;
  }

  /** Messages received of one type, in order. */
  messages<T extends BridgeToHub['type']>(type: T, connection?: number) {
    return this.received
      .filter((r) => connection === undefined || r.connection === connection)
      .map((r) => r.message)
      .filter((m): m is Extract<BridgeToHub, { type: T }> => m.type === type);
  }

  /** Every seq received for a sweep on a connection (or all), duplicates included, in order. */
  seqsReceived(sweepId: number, connection?: number): number[] {
    return this.messages('points', connection)
      .filter((m) => m.sweepId === sweepId)
      .flatMap((m) => m.points.map((p) => p.seq));
  }

  /** Waits for a message of a type that satisfies the test, and returns it. */
  waitFor<T extends BridgeToHub['type']>(
    type: T,
    test: (m: Extract<BridgeToHub, { type: T }>) => boolean = () => true,
    ms = 5000,
  ): Promise<Extract<BridgeToHub, { type: T }>> {
    return until(`a ${type} message at the hub`, () => this.messages(type).find(test), ms);
  }

  /** Sends a message to the connected bridge. */
  send(m: HubToBridge): void {
    if (!this.client) throw new Error('no bridge is connected to the fake hub');
    this.client.send(JSON.stringify(m));
  }

  /** Drops the connection without a close handshake, as a crashed hub or cut cable would. */
  dropClient(): void {
    this.client?.terminate();
  }

  /** Stops reading the connection: pings go unanswered, but TCP stays up. */
  freezeClient(): void {
    (this.client as unknown as { _socket: { pause(): void } })._socket.pause();
  }

  /** Stops the server. */
  async close(): Promise<void> {
    for (const c of this.server.clients) c.terminate();
    await new Promise<void>((done) => this.server.close(() => done()));
  }

  private onConnection(ws: WebSocket): void {
    const connection = ++this.connections;
    this.client = ws;
    ws.on('message', (data) => {
      const message = JSON.parse(String(data)) as BridgeToHub;
      this.received.push({ connection, message });
      if (message.type === 'points') this.store(message.sweepId, message.points, ws);
      if (message.type === 'sweep-ended' && this.autoAck) {
        ws.send(JSON.stringify({ type: 'ack-end', sweepId: message.sweepId }));
      }
    });
  }

  private store(sweepId: number, points: SweepPoint[], ws: WebSocket): void {
    let s = this.stored.get(sweepId);
    if (!s) this.stored.set(sweepId, (s = new Map()));
    for (const p of points) if (!s.has(p.seq)) s.set(p.seq, p);
    if (!this.autoAck) return;
    let through = -1;
    while (s.has(through + 1)) through++;
    if (through >= 0) ws.send(JSON.stringify({ type: 'ack-points', sweepId, throughSeq: through }));
  }
}
