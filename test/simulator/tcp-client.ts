import { connect, type Socket } from 'node:net';
import { TestHost } from './test-host';

/** A test host on a real TCP connection to the simulator. */
export interface TcpClient {
  socket: Socket;
  host: TestHost;
  /** Resolves when the simulator closes the connection. */
  closed: Promise<void>;
  send(line: string): void;
  end(): void;
}

/** Connects to 127.0.0.1:port and resolves once connected. */
export function tcpClient(port: number): Promise<TcpClient> {
  return new Promise((resolve, reject) => {
    const host = new TestHost();
    const socket = connect(port, '127.0.0.1');
    const closed = new Promise<void>((done) => socket.once('close', () => done()));
    socket.on('data', host.feed);
    socket.on('error', () => undefined);
    socket.once('connect', () =>
      resolve({ socket, host, closed, send: (l) => socket.write(l), end: () => socket.destroy() }),
    );
    socket.once('error', reject);
  });
}
