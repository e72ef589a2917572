import { SerialPort } from 'serialport';
import type { SimulatedTracer } from './simulated-tracer';
import type { TransportStats } from './tcp-transport';

/** Options of a SerialTransport. */
export interface SerialTransportOptions {
  /** Device path, e.g. one end of a socat pty pair. */
  path: string;
  /** Line speed; default 115200 as PROTOCOL.md fixes. */
  baudRate?: number;
}

/**
 * Serves the tracer on a real serial device path through the `serialport` package. The port is
 * opened by path only: SerialPort.list() needs udevadm, which is not everywhere. Under the
 * unplug fault the port stays open and the tracer falls silent, as a pulled cable looks from
 * the device side.
 */
export class SerialTransport {
  private port: SerialPort | null = null;
  private unsubscribe: (() => void) | null = null;

  constructor(
    private readonly tracer: SimulatedTracer,
    private readonly options: SerialTransportOptions,
  ) {}

  /** Opens the port; resolves with its path. */
  start(): Promise<string> {
    const port = new SerialPort({
      path: this.options.path,
      baudRate: this.options.baudRate ?? 115200,
      autoOpen: false,
    });
    return new Promise((resolve, reject) => {
      port.open((err) => {
        if (err) {
          reject(new Error(`cannot open serial port ${this.options.path}: ${err.message}`));
          return;
        }
        this.port = port;
        port.on('data', (chunk: Buffer) => this.tracer.receive(chunk));
        port.on('error', (e) => process.stderr.write(`serial port error: ${e.message}\n`));
        this.unsubscribe = this.tracer.onLine((line) => {
          if (port.isOpen) port.write(Buffer.from(line, 'latin1'));
        });
        resolve(this.options.path);
      });
    });
  }

  /** Port figures. */
  stats(): TransportStats {
    return {
      kind: 'serial',
      address: this.options.path,
      connected: this.port?.isOpen ?? false,
      connections: 0,
      replaced: 0,
      refused: 0,
    };
  }

  /** Closes the port. */
  stop(): Promise<void> {
    this.unsubscribe?.();
    this.unsubscribe = null;
    const port = this.port;
    this.port = null;
    if (!port?.isOpen) return Promise.resolve();
    return new Promise((resolve) => {
      port.drain(() => port.close(() => resolve()));
    });
  }
}
