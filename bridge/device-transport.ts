import { connect } from 'node:net';
import { SerialPort } from 'serialport';

/** Where the tracer is: a serial device path, or a TCP endpoint carrying the same bytes. */
export type DeviceEndpoint =
  { kind: 'serial'; path: string } | { kind: 'tcp'; host: string; port: number };

/** Serial line speed of the tracer link, baud (PROTOCOL.md). */
export const SERIAL_BAUD_RATE = 115200;

/** How long closing waits for written bytes to leave, ms, before closing anyway. */
const DRAIN_TIMEOUT_MS = 1000;

/** An open byte link to the tracer. */
export interface DeviceTransport {
  /** The endpoint in words, for logs. */
  readonly name: string;
  /** Queues text for the tracer. */
  write(text: string): void;
  /** Lets queued bytes leave (bounded wait), then closes; resolves once closed. */
  close(): Promise<void>;
}

/** Callbacks of an open transport. */
export interface TransportHandlers {
  /** Bytes arrived. */
  data(chunk: Buffer): void;
  /** The link closed by itself (unplug, peer closed, error); not called after close(). */
  closed(reason: string): void;
}

/** Names an endpoint for logs. */
export function endpointName(endpoint: DeviceEndpoint): string {
  return endpoint.kind === 'serial'
    ? `serial ${endpoint.path}`
    : `tcp ${endpoint.host}:${endpoint.port}`;
}

/** Opens the endpoint; rejects when it cannot be opened (missing device, refused connection). */
export function openTransport(
  endpoint: DeviceEndpoint,
  handlers: TransportHandlers,
): Promise<DeviceTransport> {
  return endpoint.kind === 'serial'
    ? openSerial(endpoint.path, handlers)
    : openTcp(endpoint.host, endpoint.port, handlers);
}

function openSerial(path: string, handlers: TransportHandlers): Promise<DeviceTransport> {
  return new Promise((resolve, reject) => {
    // autoOpen off so an open failure reaches the callback instead of an unhandled 'error'.
    // SerialPort.list() is never used: it needs udevadm, which many small boards lack.
    const port = new SerialPort({ path, baudRate: SERIAL_BAUD_RATE, autoOpen: false });
    let closing = false;
    let reported = false;
    const report = (reason: string) => {
      if (closing || reported) return;
      reported = true;
      handlers.closed(reason);
    };
    port.on('error', (err: Error) => {
      if (!port.isOpen) report(`serial ${path} error: ${err.message}`);
    });
    port.open((err) => {
      if (err) {
        reject(err);
        return;
      }
      port.on('data', (chunk: Buffer) => handlers.data(chunk));
      port.on('close', (closeErr: (Error & { disconnected?: boolean }) | null) => {
        report(
          closeErr?.disconnected
            ? `serial ${path} disconnected (unplugged?): ${closeErr.message}`
            : `serial ${path} closed`,
        );
      });
      resolve({
        name: `serial ${path}`,
        write(text) {
          if (port.isOpen && !closing) port.write(text);
        },
        close() {
          closing = true;
          return new Promise<void>((done) => {
            if (!port.isOpen) {
              done();
              return;
            }
            let finished = false;
            const shut = () => {
              if (finished) return;
              finished = true;
              if (port.isOpen) port.close(() => done());
              else done();
            };
            setTimeout(shut, DRAIN_TIMEOUT_MS).unref();
            port.drain(shut);
          });
        },
      });
    });
  });
}

function openTcp(
  host: string,
  portNumber: number,
  handlers: TransportHandlers,
): Promise<DeviceTransport> {
  return new Promise((resolve, reject) => {
    const socket = connect({ host, port: portNumber });
    let open = false;
    let closing = false;
    let lastError = '';
    socket.setNoDelay(true);
    socket.on('error', (err) => {
      lastError = err.message;
      if (!open) reject(err);
    });
    socket.on('close', () => {
      if (open && !closing) {
        handlers.closed(`tcp ${host}:${portNumber} closed${lastError ? `: ${lastError}` : ''}`);
      }
    });
    socket.once('connect', () => {
      open = true;
      socket.on('data', (chunk: Buffer) => handlers.data(chunk));
      resolve({
        name: `tcp ${host}:${portNumber}`,
        write(text) {
          if (!socket.destroyed && !closing) socket.write(text);
        },
        close() {
          closing = true;
          return new Promise<void>((done) => {
            if (socket.destroyed) {
              done();
              return;
            }
            const timer = setTimeout(() => socket.destroy(), DRAIN_TIMEOUT_MS);
            timer.unref();
            socket.once('close', () => {
              clearTimeout(timer);
              done();
            });
            socket.end();
          });
        },
      });
    });
  });
}
