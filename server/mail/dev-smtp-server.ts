import type { AddressInfo } from 'node:net';
import { SMTPServer } from 'smtp-server';
import type { HubDb } from '../db/database';
import type { Logger } from '../http/error-middleware';
import { insertReceived } from './dev-mail.repository';

/** A local SMTP server for development that keeps what it receives in outbox_received. */
export interface DevSmtpServer {
  /** smtp://127.0.0.1:PORT, for nodemailer. */
  url: string;
  port: number;
  close(): Promise<void>;
}

/** Largest message the development server takes, bytes (10 MiB). */
const MAX_MESSAGE_BYTES = 10 * 1024 * 1024;

/** Starts the development mail server on 127.0.0.1:port (0: any free port); no TLS, no auth. */
export async function startDevSmtpServer(
  db: HubDb,
  port: number,
  logger: Logger,
): Promise<DevSmtpServer> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    size: MAX_MESSAGE_BYTES,
    logger: false,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('end', () => {
        insertReceived(db, {
          envelope_from: session.envelope.mailFrom ? session.envelope.mailFrom.address : null,
          envelope_to_json: JSON.stringify(session.envelope.rcptTo.map((r) => r.address)),
          raw: Buffer.concat(chunks).toString('utf8'),
          received_at: new Date().toISOString(),
        }).then(
          () => callback(),
          (error: Error) => {
            logger.error('dev mail: could not keep a message', error);
            callback(error);
          },
        );
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, '127.0.0.1', () => {
      server.off('error', reject);
      resolve();
    });
  });
  server.on('error', (e) => logger.warn(`dev mail: ${e.message}`));
  const bound = (server.server.address() as AddressInfo).port;
  return {
    url: `smtp://127.0.0.1:${bound}`,
    port: bound,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
