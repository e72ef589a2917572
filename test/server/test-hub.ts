import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import request from 'supertest';
import WebSocket from 'ws';
import type { SweepPlan, DeviceCapabilities } from '../../shared/domain/sweep';
import type { BenchDeviceStatus, BridgeToHub } from '../../shared/hub/messages';
import { createApp } from '../../server/app';
import type { HubConfig } from '../../server/config';
import { DEMO_BENCHES, DEMO_USERS } from '../../server/demo/demo-data';
import type { Logger } from '../../server/http/error-middleware';
import { createHub, type RunningHub } from '../../server/main';

/** Collects log lines instead of printing them. */
export function quietLogger(): Logger & { lines: string[] } {
  const lines: string[] = [];
  return {
    lines,
    info: (m) => lines.push(`info ${m}`),
    warn: (m) => lines.push(`warn ${m}`),
    error: (m, e) => lines.push(`error ${m} ${e instanceof Error ? e.stack : String(e ?? '')}`),
  };
}

/** A hub on port 0 with a fresh SQLite file in a temporary directory. */
export interface TestHub extends RunningHub {
  config: HubConfig;
  logger: ReturnType<typeof quietLogger>;
  /** supertest agent on an app built by createApp from the running hub's services. */
  api: ReturnType<typeof request>;
  /** ws://127.0.0.1:PORT */
  wsUrl: string;
  /** Signs a demo user in; returns the JWT. */
  token(username: 'admin' | 'tech' | 'viewer'): Promise<string>;
  /** Stops the hub but keeps its directory, for a restart on the same database. */
  stop(): Promise<void>;
}

/** Starts a test hub (in `dir`, to restart one); `close()` also deletes its directory. */
export async function startTestHub(
  overrides: Partial<HubConfig> = {},
  dir = mkdtempSync(path.join(tmpdir(), 'emberline-hub-')),
): Promise<TestHub> {
  const config: HubConfig = {
    port: 0,
    host: '127.0.0.1',
    dataDir: dir,
    databaseFile: path.join(dir, 'hub.sqlite'),
    jwtSecret: 'test-secret-not-for-production',
    jwtLifetimeSeconds: 3600,
    demo: true,
    adminPassword: null,
    staticDir: path.join(dir, 'no-app-here'),
    linkGraceMs: 30_000,
    startTimeoutMs: 15_000,
    pingIntervalMs: 10_000,
    version: 'test',
    ...overrides,
  };
  const logger = quietLogger();
  const hub = await createHub(config, logger);
  const app = createApp({ services: hub.services, version: config.version, staticDir: null });
  const api = request(app);
  const tokens = new Map<string, string>();
  return {
    ...hub,
    config,
    logger,
    api,
    wsUrl: hub.url.replace(/^http/, 'ws'),
    async token(username) {
      const cached = tokens.get(username);
      if (cached) return cached;
      const password = DEMO_USERS.find((u) => u.username === username)!.password;
      const res = await api.post('/api/auth/login').send({ username, password }).expect(200);
      tokens.set(username, res.body.token);
      return res.body.token as string;
    },
    stop: () => hub.close(),
    async close() {
      await hub.close();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

/** Polls `check` until it returns a truthy value (5 s at most); returns that value. */
export async function eventually<T>(
  check: () => T | Promise<T>,
  what = 'condition',
): Promise<NonNullable<T>> {
  const deadline = Date.now() + 5000;
  for (;;) {
    const value = await check();
    if (value) return value as NonNullable<T>;
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 20));
  }
}

/** A WebSocket client that keeps every JSON message it receives. */
export class JsonClient<In extends { type: string }> {
  readonly received: In[] = [];
  private waiters: { match: (m: In) => boolean; resolve: (m: In) => void }[] = [];

  private constructor(readonly ws: WebSocket) {
    ws.on('message', (data) => {
      const m = JSON.parse(data.toString()) as In;
      this.received.push(m);
      this.waiters = this.waiters.filter((w) => {
        if (!w.match(m)) return true;
        w.resolve(m);
        return false;
      });
    });
  }

  /** Opens a connection; rejects with the HTTP status if the upgrade is refused. */
  static open<In extends { type: string }>(
    url: string,
    options: WebSocket.ClientOptions = {},
  ): Promise<JsonClient<In>> {
    return new Promise((resolve, reject) => {
      const ws = new WebSocket(url, options);
      const client = new JsonClient<In>(ws);
      ws.once('open', () => resolve(client));
      ws.once('unexpected-response', (_req, res) => {
        reject(
          Object.assign(new Error(`refused with ${res.statusCode}`), { status: res.statusCode }),
        );
        ws.terminate();
      });
      ws.once('error', reject);
    });
  }

  /** Sends a message as JSON. */
  send(message: unknown): void {
    this.ws.send(JSON.stringify(message));
  }

  /** The first message (already received or still to come) that matches; 5 s at most. */
  next<T extends In['type']>(
    type: T,
    match: (m: Extract<In, { type: T }>) => boolean = () => true,
    from = 0,
  ): Promise<Extract<In, { type: T }>> {
    const test = (m: In): boolean => m.type === type && match(m as Extract<In, { type: T }>);
    const seen = this.received.slice(from).find(test);
    if (seen) return Promise.resolve(seen as Extract<In, { type: T }>);
    return new Promise((resolve, reject) => {
      const timer = setTimeout(() => reject(new Error(`no ${type} message within 5 s`)), 5000);
      this.waiters.push({
        match: test,
        resolve: (m) => {
          clearTimeout(timer);
          resolve(m as Extract<In, { type: T }>);
        },
      });
    });
  }

  /** Every message of one type received so far. */
  all<T extends In['type']>(type: T): Extract<In, { type: T }>[] {
    return this.received.filter((m) => m.type === type) as Extract<In, { type: T }>[];
  }

  /** Closes and waits for the close to finish. */
  close(): Promise<void> {
    if (this.ws.readyState === WebSocket.CLOSED) return Promise.resolve();
    return new Promise((resolve) => {
      this.ws.once('close', () => resolve());
      this.ws.close();
    });
  }
}

/** Capabilities a test tracer announces. */
export const TEST_CAPABILITIES: DeviceCapabilities = {
  protocolVersion: 1,
  model: 'TEST-TRACER',
  serial: 'T-0001',
  firmware: '1.0',
  vaMaxVolts: 500,
  vg2MaxVolts: 450,
  vg1MinVolts: -100,
  vg1MaxVolts: 0,
  iaMaxMilliamps: 250,
  heaterMaxVolts: 13.2,
  heaterMaxAmps: 2,
  pulse: true,
  watchdogMs: 3000,
};

/** An idle tracer's status; `sweepId` set makes it a running one. */
export function testStatus(sweepId: number | null = null): BenchDeviceStatus {
  return {
    deviceOnline: true,
    state: sweepId === null ? 'idle' : 'sweeping',
    highVoltage: sweepId !== null,
    heaterVolts: sweepId === null ? 0 : 12.6,
    warmupLeftSeconds: 0,
    sweepId,
    lineStats: {
      accepted: 0,
      badChecksum: 0,
      overlong: 0,
      truncated: 0,
      badBytes: 0,
      noiseBytes: 0,
      malformed: 0,
    },
  };
}

/** A 12AX7 anode-family plan within its ratings: 7 anode steps x 3 curves = 21 points. */
export function smallTriodePlan(changes: Partial<SweepPlan> = {}): SweepPlan {
  return {
    kind: 'anode',
    vaStartVolts: 0,
    vaStopVolts: 300,
    vaStepVolts: 50,
    vg1Volts: [0, -1, -2],
    vg2Volts: 0,
    heaterVolts: 12.6,
    iaMaxMilliamps: 5,
    paMaxWatts: 0.75,
    iaTripMilliamps: 7.5,
    warmupSeconds: 0,
    settleMs: 1,
    ...changes,
  };
}

type HubToBridgeMessage = import('../../shared/hub/messages').HubToBridge;

/** A bridge of a demo bench, connected and announced (hello) and known to the hub. */
export async function connectBridge(
  hub: TestHub,
  bench: 0 | 1 = 0,
): Promise<JsonClient<HubToBridgeMessage> & { benchId: number }> {
  const client = await JsonClient.open<HubToBridgeMessage>(`${hub.wsUrl}/ws/bridge`, {
    headers: { authorization: `Bearer ${DEMO_BENCHES[bench].token}` },
  });
  const welcome = await client.next('welcome');
  const hello: BridgeToHub = {
    type: 'hello',
    bridgeVersion: 'test',
    capabilities: TEST_CAPABILITIES,
    status: testStatus(),
  };
  client.send(hello);
  await eventually(
    () => hub.services.presence.capabilities(welcome.benchId),
    'hello to be handled',
  );
  return Object.assign(client, { benchId: welcome.benchId });
}

/** Points of a plan-like grid: seq n on curve n % 3, with made-up readings. */
export function makePoints(seqs: readonly number[]) {
  return seqs.map((seq) => ({
    seq,
    curve: seq % 3,
    vaVolts: 10 * seq,
    vg1Volts: seq % 3 === 0 ? 0 : -(seq % 3),
    vg2Volts: 0,
    iaMilliamps: Math.round(seq * 0.013 * 1000) / 1000,
    ig2Milliamps: 0,
  }));
}
