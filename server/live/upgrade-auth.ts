import type { IncomingMessage } from 'node:http';
import type { Duplex } from 'node:stream';
import type { AuthUser } from '../auth/auth-user';
import type { BenchRow } from '../db/database';

/** Who an upgrade request turned out to be. */
export type UpgradeIdentity =
  | { endpoint: 'bridge'; bench: BenchRow }
  | { endpoint: 'live'; user: AuthUser }
  | { endpoint: null; status: 401 | 404; message: string };

/** How to check the credentials of the two endpoints. */
export interface UpgradeAuthProps {
  benchByToken(token: string): Promise<BenchRow | undefined>;
  userByToken(token: string): Promise<AuthUser>;
}

/**
 * Checks an upgrade request before any WebSocket exists: /ws/bridge wants
 * `Authorization: Bearer <bench token>`, /ws/live wants `?token=<JWT>`.
 */
export async function identifyUpgrade(
  req: IncomingMessage,
  props: UpgradeAuthProps,
): Promise<UpgradeIdentity> {
  const url = new URL(req.url ?? '/', 'http://hub.invalid');
  if (url.pathname === '/ws/bridge') {
    const match = /^Bearer\s+(\S+)$/i.exec(req.headers.authorization ?? '');
    const bench = match ? await props.benchByToken(match[1]) : undefined;
    if (!bench) return { endpoint: null, status: 401, message: 'bench token missing or unknown' };
    return { endpoint: 'bridge', bench };
  }
  if (url.pathname === '/ws/live') {
    const token = url.searchParams.get('token');
    if (!token) return { endpoint: null, status: 401, message: 'sign-in token missing' };
    try {
      return { endpoint: 'live', user: await props.userByToken(token) };
    } catch {
      return { endpoint: null, status: 401, message: 'sign-in token invalid or expired' };
    }
  }
  return { endpoint: null, status: 404, message: 'no WebSocket endpoint here' };
}

/** Answers an upgrade with a plain HTTP error and closes the socket; no WebSocket opens. */
export function refuseUpgrade(socket: Duplex, status: 401 | 404 | 500, message: string): void {
  if (socket.destroyed) return;
  const reason = { 401: 'Unauthorized', 404: 'Not Found', 500: 'Internal Server Error' }[status];
  const body = JSON.stringify({
    error: { code: status === 401 ? 'unauthenticated' : 'not_found', message },
  });
  socket.once('finish', () => socket.destroy());
  socket.end(
    `HTTP/1.1 ${status} ${reason}\r\nConnection: close\r\nContent-Type: application/json\r\n` +
      `Content-Length: ${Buffer.byteLength(body)}\r\n\r\n${body}`,
  );
}
