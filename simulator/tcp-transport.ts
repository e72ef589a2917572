import { createServer, type AddressInfo, type Server, type Socket } from 'node:net';
import type { SimulatedTracer } from './simulated-tracer';

/** Options of a TcpTransport. */
export interface TcpTransportOptions {
  /** TCP port; 0 picks a free one. */
  port: number;
  /** Address to listen on; default 127.0.0.1. */
  host?: string;
}

/** Connection figures of a transport, for the control API. */
export interface TransportStats {
  /** "tcp" or "serial". */
  kind: 'tcp' | 'serial';
  /** Where it listens or which device path it holds. */
  address: string;
  /** Whether a host is attached (TCP) or the port is open (serial). */
  connected: boolean;
  /** Host connections accepted so far (TCP). */
  connections: number;
  /** Connections closed because a newer one replaced them (TCP). */
  replaced: number;
  /** Connections refused while the unplug fault is in effect (TCP). */
  refused: number;
}

/**
 * Serves the tracer on a raw TCP port, as a serial device server does: one host at a time, and
 * a new connection replaces the old one (a host that reconnects after a crash must not find the
 * port taken). Under the unplug fault the socket is closed and new connections are dropped.
 */
export class TcpTransport {
  private readonly server: Server;
  private socket: Socket | null = null;
  private readonly unsubscribe: Array<() => void> = [];
  private readonly counts = { connections: 0, replaced: 0, refused: 0 };
  private address = '';

  constructor(
    private readonly tracer: SimulatedTracer,
    private readonly options: TcpTransportOptions,
  ) {
    this.server = createServer((s) => this.attach(s));
  }

  /** Starts listening; resolves with "HOST:PORT". */
  start(): Promise<string> {
    const host = this.options.host ?? '127.0.0.1';
    return new Promise((resolve, reject) => {
      this.server.once('error', reject);
      this.server.listen(this.options.port, host, () => {
        this.server.off('error', reject);
        const a = this.server.address() as AddressInfo;
        this.address = `${host}:${a.port}`;
        this.unsubscribe.push(
          this.tracer.onLine((line) => this.socket?.write(line, 'latin1')),
          this.tracer.onLinkChange((plugged) => {
            if (!plugged) this.dropSocket();
          }),
        );
        resolve(this.address);
      });
    });
  }

  /** The port listened on (after start). */
  get port(): number {
    return (this.server.address() as AddressInfo | null)?.port ?? 0;
  }

  /** Connection figures. */
  stats(): TransportStats {
    return { kind: 'tcp', address: this.address, connected: this.socket !== null, ...this.counts };
  }

  /** Closes the host connection (after flushing what was sent) and stops listening. */
  stop(): Promise<void> {
    for (const u of this.unsubscribe.splice(0)) u();
    const socket = this.socket;
    this.socket = null;
    socket?.end(() => socket.destroy());
    return new Promise((resolve) => this.server.close(() => resolve()));
  }

  private attach(socket: Socket): void {
    if (this.tracer.isUnplugged) {
      this.counts.refused++;
      socket.destroy();
      return;
    }
    this.counts.connections++;
    if (this.socket) {
      this.counts.replaced++;
      this.socket.destroy();
    }
    this.socket = socket;
    socket.setNoDelay(true);
    socket.on('data', (chunk) => {
      if (this.socket === socket) this.tracer.receive(chunk);
    });
    socket.on('error', () => socket.destroy());
    socket.on('close', () => {
      if (this.socket === socket) this.socket = null;
    });
  }

  private dropSocket(): void {
    this.socket?.destroy();
    this.socket = null;
  }
}
