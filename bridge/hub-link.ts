import WebSocket from 'ws';
import type { BridgeToHub, HubToBridge } from '../shared/hub/messages';
import { Backoff } from './backoff';
import { hubToBridgeSchema } from './hub-message-schema';

/** What the hub link tells its owner. */
export interface HubLinkEvents {
  /** Connected (the upgrade, with the bench token, was accepted). */
  open(): void;
  /** A valid message from the hub. */
  message(m: HubToBridge): void;
  /** A message that failed validation; raw is the parsed JSON, or undefined if it was not JSON. */
  invalid(raw: unknown, problem: string): void;
  /** An open connection ended (closed, failed, or terminated by the heartbeat). */
  closed(reason: string): void;
}

/** Settings of the hub link; every timing has the default shown. */
export interface HubLinkOptions {
  /** WebSocket URL of the hub's bridge endpoint, e.g. ws://127.0.0.1:4300/ws/bridge. */
  url: string;
  /** Bench token, sent as `Authorization: Bearer <token>`. */
  token: string;
  events: HubLinkEvents;
  log: (line: string) => void;
  /** Reconnect delays (default 0.5 s doubling to 10 s, jittered). */
  backoff?: Backoff;
  /** Ping period, ms (default 5000). */
  pingIntervalMs?: number;
  /** A connection with no pong for this long is terminated, ms (default 10000). */
  pongTimeoutMs?: number;
}

/** Upgrade handshake limit, ms: a hub that accepts TCP but never answers is retried. */
const HANDSHAKE_TIMEOUT_MS = 5000;

/**
 * The bridge's WebSocket to the hub: connects with the bench token, reconnects with backoff,
 * and pings so that a hub that vanished without closing (cable, sleep, crash) is noticed.
 */
export class HubLink {
  private socket: WebSocket | null = null;
  private isOpen = false;
  private stopped = false;
  private pingTimer: NodeJS.Timeout | null = null;
  private reconnectTimer: NodeJS.Timeout | null = null;
  private lastPongAt = 0;
  private lastFailure = '';
  private dropReason = '';
  private readonly backoff: Backoff;

  constructor(private readonly options: HubLinkOptions) {
    this.backoff = options.backoff ?? new Backoff();
  }

  /** Whether a connection is open. */
  get connected(): boolean {
    return this.isOpen;
  }

  /** Starts connecting (and reconnecting until close()). */
  start(): void {
    if (!this.socket && !this.stopped) this.connect();
  }

  /** Sends a message on the open connection; returns false when there is none. */
  send(m: BridgeToHub): boolean {
    if (!this.isOpen || !this.socket) return false;
    this.socket.send(JSON.stringify(m));
    return true;
  }

  /** Closes the connection cleanly and stops reconnecting. */
  async close(): Promise<void> {
    this.stopped = true;
    if (this.reconnectTimer) clearTimeout(this.reconnectTimer);
    this.stopPing();
    const ws = this.socket;
    if (!ws) return;
    await new Promise<void>((done) => {
      if (ws.readyState === WebSocket.CLOSED) {
        done();
        return;
      }
      const timer = setTimeout(() => ws.terminate(), 1000);
      ws.once('close', () => {
        clearTimeout(timer);
        done();
      });
      if (ws.readyState === WebSocket.OPEN) ws.close(1000, 'bridge stopping');
      else ws.terminate();
    });
  }

  private connect(): void {
    const { url, token } = this.options;
    const ws = new WebSocket(url, {
      headers: { Authorization: `Bearer ${token}` },
      handshakeTimeout: HANDSHAKE_TIMEOUT_MS,
    });
    this.socket = ws;
    this.dropReason = '';
    let failure = '';
    ws.on('open', () => {
      this.isOpen = true;
      this.lastFailure = '';
      this.backoff.reset();
      this.options.log(`hub: connected to ${url}`);
      this.startPing(ws);
      this.options.events.open();
    });
    ws.on('message', (data, isBinary) => {
      if (isBinary) {
        this.options.events.invalid(undefined, 'binary frame');
        return;
      }
      this.receive(data.toString());
    });
    ws.on('pong', () => {
      this.lastPongAt = Date.now();
    });
    ws.on('error', (err) => {
      failure = err.message;
    });
    ws.on('close', (code, reasonBuffer) => {
      const wasOpen = this.isOpen;
      this.isOpen = false;
      this.socket = null;
      this.stopPing();
      if (wasOpen) {
        const reason =
          this.dropReason || failure || reasonBuffer.toString() || `close code ${code}`;
        this.options.log(`hub: connection lost: ${reason}`);
        this.options.events.closed(reason);
      } else if (failure && failure !== this.lastFailure) {
        const hint = /\b401\b|\b403\b/.test(failure) ? ' (is the bench token right?)' : '';
        this.options.log(`hub: cannot connect to ${url}: ${failure}${hint}; retrying with backoff`);
        this.lastFailure = failure;
      }
      if (!this.stopped) {
        this.reconnectTimer = setTimeout(() => {
          this.reconnectTimer = null;
          if (!this.stopped) this.connect();
        }, this.backoff.next());
      }
    });
  }

  private receive(text: string): void {
    let raw: unknown;
    try {
      raw = JSON.parse(text);
    } catch {
      this.options.events.invalid(undefined, 'not JSON');
      return;
    }
    const parsed = hubToBridgeSchema.safeParse(raw);
    if (parsed.success) this.options.events.message(parsed.data);
    else {
      const problem = parsed.error.issues
        .map((i) => `${i.path.join('.') || 'message'}: ${i.message}`)
        .join('; ');
      this.options.events.invalid(raw, problem);
    }
  }

  private startPing(ws: WebSocket): void {
    const interval = this.options.pingIntervalMs ?? 5000;
    const timeout = this.options.pongTimeoutMs ?? 10_000;
    this.lastPongAt = Date.now();
    this.pingTimer = setInterval(() => {
      const silentMs = Date.now() - this.lastPongAt;
      if (silentMs > timeout) {
        this.dropReason = `no pong for ${silentMs} ms`;
        ws.terminate();
        return;
      }
      ws.ping();
    }, interval);
  }

  private stopPing(): void {
    if (this.pingTimer) clearInterval(this.pingTimer);
    this.pingTimer = null;
  }
}
