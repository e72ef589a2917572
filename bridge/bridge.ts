import { createHash } from 'node:crypto';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { DeviceCapabilities } from '../shared/domain/sweep';
import type { DeviceExtensions } from '../shared/protocol/check-plan';
import type { BenchDeviceStatus, HubToBridge } from '../shared/hub/messages';
import type { DeviceMessage } from '../shared/protocol/messages';
import { Backoff } from './backoff';
import { CheckControl } from './check-control';
import { DeviceLink } from './device-link';
import type { DeviceEndpoint } from './device-transport';
import { HubLink } from './hub-link';
import { Journal } from './journal';
import { PointSender } from './point-sender';
import { SweepControl } from './sweep-control';

/** Version this bridge reports in its hello. */
export const BRIDGE_VERSION = '0.1.0';

/** Options of startBridge; every timing has the default shown. */
export interface BridgeOptions {
  /** Serial device of the tracer (e.g. /dev/ttyUSB0); give this or tcp. */
  serialPath?: string;
  /** TCP endpoint of a tracer behind a serial device server, or of the simulator. */
  tcp?: { host: string; port: number };
  /** WebSocket URL of the hub's bridge endpoint. */
  hubUrl: string;
  /** Bench token for the hub. */
  token: string;
  /** Journal file (default: see defaultJournalFile). */
  journalFile?: string;
  /** Where log lines go (default: stdout with a timestamp). */
  log?: (line: string) => void;
  /** First reconnect delay of both links, ms (default 500; doubles per failure). */
  reconnectInitialMs?: number;
  /** Largest reconnect delay, ms (default 10000). */
  reconnectMaxMs?: number;
  /** Keep-alive period to the tracer, ms (default 1000). */
  keepaliveMs?: number;
  /** Wait for the tracer's IDN and CAP, ms (default 2000), per attempt. */
  handshakeTimeoutMs?: number;
  /** A ready tracer silent this long is treated as gone, ms (default 3500). */
  deviceSilenceMs?: number;
  /** Wait for the tracer to answer HTR, SWP or ABT, ms (default 3000). */
  commandTimeoutMs?: number;
  /** Ping period to the hub, ms (default 5000). */
  pingIntervalMs?: number;
  /** No pong for this long drops the hub connection, ms (default 10000). */
  pongTimeoutMs?: number;
  /** Longest wait before live points go to the hub, ms (default 50). */
  pointBatchMs?: number;
  /** Most points in one message to the hub (default 200). */
  pointBatchMax?: number;
}

/** A running bridge. */
export interface Bridge {
  /** Status as last reported (or about to be reported) to the hub. */
  readonly status: BenchDeviceStatus;
  /** Tracer capabilities from the last handshake, or null. */
  readonly capabilities: DeviceCapabilities | null;
  /** Whether the tracer link is up and identified. */
  readonly deviceReady: boolean;
  /** Whether the hub connection is open. */
  readonly hubConnected: boolean;
  /** Sweep the bridge is starting or running, or null. */
  readonly activeSweepId: number | null;
  /** Check (quick-test step) the bridge is starting or running, or null. */
  readonly activeCheckId: number | null;
  /** Optional tracer functions from its EXT answer, or null. */
  readonly extensions: DeviceExtensions | null;
  /** The journal of unacknowledged points and ends. */
  readonly journal: Journal;
  /** Switches the tracer's outputs off, ends a running sweep, and closes both links. */
  stop(): Promise<void>;
}

/**
 * Default journal file: DATA_DIR (or the OS temporary directory) / bridge-journal-<id>.jsonl,
 * where id is derived from the bench token, so two bridges on one machine never share one.
 */
export function defaultJournalFile(token: string, dataDir = process.env['DATA_DIR']): string {
  const id = createHash('sha256').update(token).digest('hex').slice(0, 12);
  return join(dataDir || tmpdir(), `bridge-journal-${id}.jsonl`);
}

/** Starts a bridge between one tracer and the hub. */
export function startBridge(options: BridgeOptions): Bridge {
  if (!options.serialPath === !options.tcp) {
    throw new Error('startBridge needs exactly one of serialPath and tcp');
  }
  const log = options.log ?? ((line: string) => console.log(`${new Date().toISOString()} ${line}`));
  const endpoint: DeviceEndpoint = options.serialPath
    ? { kind: 'serial', path: options.serialPath }
    : { kind: 'tcp', host: options.tcp!.host, port: options.tcp!.port };
  const backoff = () => new Backoff(options.reconnectInitialMs, options.reconnectMaxMs);

  const journal = Journal.open(options.journalFile ?? defaultJournalFile(options.token));
  log(`journal: ${journal.file}, ${journal.unackedPointCount} unacknowledged points`);
  if (journal.unreadableLines) {
    log(`journal: skipped ${journal.unreadableLines} unreadable lines (cut short by a crash?)`);
  }
  for (const s of journal.list()) {
    if (s.end) continue;
    const message =
      `the bridge stopped during the sweep; ${s.pointCount} points were kept and the ` +
      "tracer's watchdog switched its outputs off";
    journal.end(s.sweepId, { reason: 'link-lost', count: s.pointCount, message });
    log(`sweep ${s.sweepId}: ended link-lost: ${message}`);
  }

  let stopped = false;
  let sweeps: SweepControl;
  let checks: CheckControl;
  const device = new DeviceLink({
    endpoint,
    log,
    backoff: backoff(),
    keepaliveMs: options.keepaliveMs,
    handshakeTimeoutMs: options.handshakeTimeoutMs,
    silenceMs: options.deviceSilenceMs,
    events: {
      ready: () => {
        if (stopped) return;
        sweeps.onDeviceReady();
        // Whatever a previous session left running, the bench starts from outputs off.
        device.send({ type: 'off' });
        device.send({ type: 'status' });
        // A tracer with optional functions answers; one without stays silent (PROTOCOL.md).
        device.queryExtensions();
        if (hub.connected) sendHello();
      },
      message: (m: DeviceMessage) => {
        if (stopped) return;
        if (m.type === 'heartbeat') checks.onDeviceMessage(m);
        if (m.type !== 'heartbeat' && checks.claims(m)) checks.onDeviceMessage(m);
        else sweeps.onDeviceMessage(m);
      },
      down: (reason) => {
        if (stopped) return;
        checks.onDeviceDown(reason);
        sweeps.onDeviceDown(reason);
      },
      extensions: (ext) => {
        if (stopped) return;
        log(`tracer: optional functions: ${ext.features.join(', ') || 'none'}`);
        if (hub.connected) sendHello();
      },
    },
  });
  const hub = new HubLink({
    url: options.hubUrl,
    token: options.token,
    log,
    backoff: backoff(),
    pingIntervalMs: options.pingIntervalMs,
    pongTimeoutMs: options.pongTimeoutMs,
    events: {
      open: () => {
        if (stopped) return;
        sendHello();
        sender.restart();
      },
      message: (m: HubToBridge) => {
        if (stopped) return;
        if (m.type === 'start-check' || m.type === 'abort-check') checks.onHubMessage(m);
        else sweeps.onHubMessage(m);
      },
      invalid: (raw, problem) => {
        if (stopped) return;
        const r = (raw ?? {}) as { type?: unknown; checkId?: unknown };
        if (r.type === 'start-check' || r.type === 'abort-check') {
          checks.onInvalidHubMessage(r, problem);
        } else sweeps.onInvalidHubMessage(raw, problem);
      },
      closed: (reason) => {
        if (stopped) return;
        checks.onHubLost();
        sweeps.onHubLost(reason);
      },
    },
  });
  const sender = new PointSender(
    journal,
    (m) => hub.send(m),
    options.pointBatchMs,
    options.pointBatchMax,
  );
  sweeps = new SweepControl({
    device,
    journal,
    sender,
    log,
    sendToHub: (m) => hub.send(m),
    commandTimeoutMs: options.commandTimeoutMs ?? 3000,
    activeCheckId: () => checks.activeCheckId,
  });
  checks = new CheckControl({
    device,
    log,
    sendToHub: (m) => hub.send(m),
    reportStatus: () => sweeps.reportStatus(),
    activeSweepId: () => sweeps.activeSweepId,
    commandTimeoutMs: options.commandTimeoutMs ?? 3000,
  });

  function sendHello(): void {
    hub.send({
      type: 'hello',
      bridgeVersion: BRIDGE_VERSION,
      capabilities: device.caps,
      status: sweeps.status(),
      extensions: device.extensions,
    });
  }

  device.start();
  hub.start();

  return {
    get status() {
      return sweeps.status();
    },
    get capabilities() {
      return device.caps;
    },
    get deviceReady() {
      return device.ready;
    },
    get hubConnected() {
      return hub.connected;
    },
    get activeSweepId() {
      return sweeps.activeSweepId;
    },
    get activeCheckId() {
      return checks.activeCheckId;
    },
    get extensions() {
      return device.extensions;
    },
    journal,
    async stop() {
      if (stopped) return;
      checks.shutDown();
      sweeps.shutDown();
      stopped = true;
      sender.flush();
      sender.stop();
      await device.close();
      await hub.close();
      journal.close();
      log('bridge: stopped, tracer outputs off');
    },
  };
}
