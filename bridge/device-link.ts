import type { DeviceCapabilities } from '../shared/domain/sweep';
import type { DeviceExtensions } from '../shared/protocol/check-plan';
import { frame } from '../shared/protocol/checksum';
import { DeviceStreamDecoder } from '../shared/protocol/decoder';
import { emptyStats, type LineStats } from '../shared/protocol/line-reader';
import {
  encodeCommand,
  PROTOCOL_VERSION,
  type DeviceMessage,
  type HostCommand,
} from '../shared/protocol/messages';
import { Backoff } from './backoff';
import {
  endpointName,
  openTransport,
  type DeviceEndpoint,
  type DeviceTransport,
} from './device-transport';

/** What the device link tells its owner. */
export interface DeviceLinkEvents {
  /** The handshake succeeded; commands may be sent. */
  ready(caps: DeviceCapabilities): void;
  /** A message from a ready tracer, in arrival order. */
  message(m: DeviceMessage): void;
  /** A ready link went down; it reconnects by itself. */
  down(reason: string): void;
  /** The tracer answered EXT with its optional functions. */
  extensions?(extensions: DeviceExtensions): void;
}

/** Settings of a device link; every timing has the default shown. */
export interface DeviceLinkOptions {
  endpoint: DeviceEndpoint;
  events: DeviceLinkEvents;
  log: (line: string) => void;
  /** Reconnect delays (default 0.5 s doubling to 10 s, jittered). */
  backoff?: Backoff;
  /** Keep-alive period, ms (default 1000; the tracer's watchdog is several times longer). */
  keepaliveMs?: number;
  /** Wait for IDN and CAP after each identify, ms (default 2000). */
  handshakeTimeoutMs?: number;
  /** Identify attempts per connection before the link is reopened (default 3). */
  handshakeAttempts?: number;
  /** A ready tracer silent this long is treated as gone, ms (default 3500: 3 missed heartbeats). */
  silenceMs?: number;
}

type LinkState = 'closed' | 'opening' | 'handshake' | 'ready' | 'stopped';

/**
 * The bridge's link to one tracer: opens the serial port or TCP socket, identifies the tracer,
 * keeps its watchdog fed, notices unplugging or silence, and reopens with backoff. Raw chunks go
 * to the shared DeviceStreamDecoder, so CR LF or LF endings and bad lines are handled there.
 */
export class DeviceLink {
  private state: LinkState = 'closed';
  private transport: DeviceTransport | null = null;
  /** Identity of the current connection; callbacks of an older one are ignored. */
  private connection = 0;
  private decoder = new DeviceStreamDecoder();
  private earlierStats: LineStats = emptyStats();
  private ident: Extract<DeviceMessage, { type: 'ident' }> | null = null;
  private capsMessage: Extract<DeviceMessage, { type: 'caps' }> | null = null;
  private identifyTries = 0;
  private handshakeTimer: NodeJS.Timeout | null = null;
  private keepaliveTimer: NodeJS.Timeout | null = null;
  private reconnectTimer: NodeJS.Timeout | null = null;
  private lastHeardAt = 0;
  private lastOpenError = '';
  private versionRefused = false;
  private capabilities: DeviceCapabilities | null = null;
  private ext: DeviceExtensions | null = null;
  private readonly backoff: Backoff;
  private readonly name: string;

  constructor(private readonly options: DeviceLinkOptions) {
    this.backoff = options.backoff ?? new Backoff();
    this.name = endpointName(options.endpoint);
  }

  /** Whether the handshake is done and commands may be sent. */
  get ready(): boolean {
    return this.state === 'ready';
  }

  /** Capabilities from the last successful handshake, or null before one. */
  get caps(): DeviceCapabilities | null {
    return this.capabilities;
  }

  /**
   * Optional functions the tracer announced in answer to EXT on this connection; null before
   * the answer, and for a tracer with none (it never answers).
   */
  get extensions(): DeviceExtensions | null {
    return this.ext;
  }

  /** Asks a ready tracer for its optional functions; the answer arrives as `extensions`. */
  queryExtensions(): void {
    this.send({ type: 'extensions' });
  }

  /** Line counters over every connection so far. */
  get lineStats(): LineStats {
    const now = this.decoder.reader.stats;
    const out = emptyStats();
    for (const k of Object.keys(out) as (keyof LineStats)[]) out[k] = this.earlierStats[k] + now[k];
    return out;
  }

  /** Starts connecting (and reconnecting until close()). */
  start(): void {
    if (this.state === 'closed') void this.open();
  }

  /**
   * Sends a command to a ready tracer; OFF goes out on any open link, even mid-handshake,
   * because switching outputs off must never wait. Returns whether it was written.
   */
  send(command: HostCommand): boolean {
    if (!this.transport) return false;
    if (this.state !== 'ready' && command.type !== 'off') return false;
    this.transport.write(frame(encodeCommand(command)));
    return true;
  }

  /** Stops reconnecting and closes the link after queued bytes have left. */
  async close(): Promise<void> {
    this.state = 'stopped';
    this.clearTimers();
    if (this.reconnectTimer) clearTimeout(this.reconnectTimer);
    const t = this.transport;
    this.transport = null;
    this.connection++;
    if (t) await t.close();
  }

  private async open(): Promise<void> {
    this.state = 'opening';
    const connection = ++this.connection;
    let transport: DeviceTransport;
    try {
      transport = await openTransport(this.options.endpoint, {
        data: (chunk) => {
          if (connection === this.connection) this.onData(chunk);
        },
        closed: (reason) => {
          if (connection === this.connection) this.lost(reason);
        },
      });
    } catch (err) {
      if (connection !== this.connection) return;
      const message = (err as Error).message;
      // One line per new cause: an unplugged tracer must not flood the log every few seconds.
      if (message !== this.lastOpenError) {
        this.options.log(`tracer: cannot open ${this.name}: ${message}; retrying with backoff`);
        this.lastOpenError = message;
      }
      this.state = 'closed';
      this.scheduleReconnect();
      return;
    }
    if (connection !== this.connection) {
      await transport.close();
      return;
    }
    this.lastOpenError = '';
    this.transport = transport;
    this.decoder = new DeviceStreamDecoder();
    this.options.log(`tracer: ${this.name} open, identifying`);
    this.state = 'handshake';
    this.ident = null;
    this.capsMessage = null;
    this.identifyTries = 0;
    this.identify();
  }

  private identify(): void {
    const attempts = this.options.handshakeAttempts ?? 3;
    if (this.identifyTries >= attempts) {
      this.drop(`no answer to identify after ${attempts} tries`);
      return;
    }
    this.identifyTries++;
    this.transport?.write(frame(encodeCommand({ type: 'identify' })));
    this.handshakeTimer = setTimeout(
      () => this.identify(),
      this.options.handshakeTimeoutMs ?? 2000,
    );
  }

  private onData(chunk: Buffer): void {
    for (const m of this.decoder.push(chunk)) {
      this.lastHeardAt = Date.now();
      if (this.state === 'handshake') this.onHandshakeMessage(m);
      else if (this.state === 'ready' && m.type === 'extensions') {
        this.ext = m.extensions;
        this.options.events.extensions?.(m.extensions);
      } else if (this.state === 'ready') this.options.events.message(m);
      // The owner may have closed the link while handling a message.
      if (this.state !== 'handshake' && this.state !== 'ready') return;
    }
  }

  private onHandshakeMessage(m: DeviceMessage): void {
    if (m.type === 'ident') {
      if (m.protocolVersion !== PROTOCOL_VERSION) {
        this.options.log(
          `tracer: refusing ${m.model} ${m.serial}: it speaks protocol version ` +
            `${m.protocolVersion}, this bridge speaks version ${PROTOCOL_VERSION} only; ` +
            'no command will be sent to it',
        );
        this.versionRefused = true;
        this.drop('protocol version not supported');
        return;
      }
      this.ident = m;
    } else if (m.type === 'caps') {
      this.capsMessage = m;
    }
    if (!this.ident || !this.capsMessage) return;
    if (this.handshakeTimer) clearTimeout(this.handshakeTimer);
    this.handshakeTimer = null;
    const { protocolVersion, model, serial, firmware } = this.ident;
    this.capabilities = { protocolVersion, model, serial, firmware, ...this.capsMessage.caps };
    this.state = 'ready';
    this.versionRefused = false;
    this.backoff.reset();
    this.lastHeardAt = Date.now();
    this.options.log(
      `tracer: ready: ${model} serial ${serial} firmware ${firmware}, protocol ${protocolVersion}`,
    );
    const keepaliveMs = this.options.keepaliveMs ?? 1000;
    this.keepaliveTimer = setInterval(() => this.keepalive(), keepaliveMs);
    this.options.events.ready(this.capabilities);
  }

  private keepalive(): void {
    const silenceMs = this.options.silenceMs ?? 3500;
    const quietMs = Date.now() - this.lastHeardAt;
    if (quietMs > silenceMs) {
      this.drop(`tracer silent for ${quietMs} ms`);
      return;
    }
    this.send({ type: 'keepalive' });
  }

  /** Gives up the current connection at once and reconnects later. */
  private drop(reason: string): void {
    const t = this.transport;
    this.lost(reason);
    if (t) void t.close();
  }

  private lost(reason: string): void {
    if (this.state === 'stopped') return;
    const wasReady = this.state === 'ready';
    this.clearTimers();
    this.connection++;
    this.transport = null;
    this.ext = null;
    this.earlierStats = this.lineStats;
    this.decoder = new DeviceStreamDecoder();
    this.state = 'closed';
    this.options.log(`tracer: link down: ${reason}`);
    if (wasReady) this.options.events.down(reason);
    this.scheduleReconnect();
  }

  private scheduleReconnect(): void {
    if (this.state === 'stopped') return;
    // A tracer of another protocol version will not change soon: retry rarely.
    const delay = this.versionRefused ? this.backoff.longest() : this.backoff.next();
    this.reconnectTimer = setTimeout(() => {
      this.reconnectTimer = null;
      if (this.state === 'closed') void this.open();
    }, delay);
  }

  private clearTimers(): void {
    if (this.handshakeTimer) clearTimeout(this.handshakeTimer);
    if (this.keepaliveTimer) clearInterval(this.keepaliveTimer);
    this.handshakeTimer = null;
    this.keepaliveTimer = null;
  }
}
