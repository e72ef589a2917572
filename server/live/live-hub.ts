import type { IncomingMessage, Server } from 'node:http';
import type { Duplex } from 'node:stream';
import { WebSocketServer, type WebSocket } from 'ws';
import type { Logger } from '../http/error-middleware';
import type { HubServices } from '../hub-services';
import { serveBridge } from './bridge-session';
import { startHeartbeat } from './heartbeat';
import { identifyUpgrade, refuseUpgrade } from './upgrade-auth';

/** Props of the WebSocket side of the hub. */
export interface LiveHubProps {
  /** HTTP server whose upgrades are taken over. */
  server: Server;
  services: HubServices;
  logger: Logger;
  /** Ping period, ms. */
  pingIntervalMs: number;
}

/** Largest message a bridge may send: a resend of a whole sweep fits (about 2.5 MB). */
const BRIDGE_MAX_PAYLOAD = 8 << 20;
/** Browsers send only small commands. */
const BROWSER_MAX_PAYLOAD = 16 << 10;

/** The WebSocket endpoints /ws/bridge and /ws/live on the hub's HTTP server. */
export type LiveHub = ReturnType<typeof attachLiveHub>;

/**
 * Takes over upgrade requests of `server`. Credentials are checked before `handleUpgrade`, so
 * an unauthenticated socket never becomes a WebSocket and never emits `connection`.
 */
export function attachLiveHub({ server, services, logger, pingIntervalMs }: LiveHubProps) {
  const bridges = new WebSocketServer({ noServer: true, maxPayload: BRIDGE_MAX_PAYLOAD });
  const browsers = new WebSocketServer({ noServer: true, maxPayload: BROWSER_MAX_PAYLOAD });
  const stopHeartbeats = [
    startHeartbeat(bridges, pingIntervalMs),
    startHeartbeat(browsers, pingIntervalMs),
  ];

  async function upgrade(req: IncomingMessage, socket: Duplex, head: Buffer): Promise<void> {
    const who = await identifyUpgrade(req, {
      benchByToken: (token) => services.benches.findByToken(token),
      userByToken: (token) => services.auth.userFromToken(token),
    });
    if (who.endpoint === null) return refuseUpgrade(socket, who.status, who.message);
    if (socket.destroyed) return;
    if (who.endpoint === 'bridge') {
      bridges.handleUpgrade(req, socket, head, (ws: WebSocket) => {
        bridges.emit('connection', ws, req);
        serveBridge(ws, who.bench, services);
      });
    } else {
      browsers.handleUpgrade(req, socket, head, (ws: WebSocket) => {
        browsers.emit('connection', ws, req);
        services.browsers.add(ws, who.user);
      });
    }
  }

  const onUpgrade = (req: IncomingMessage, socket: Duplex, head: Buffer) => {
    socket.on('error', () => socket.destroy());
    upgrade(req, socket, head).catch((error) => {
      logger.error('upgrade failed', error);
      refuseUpgrade(socket, 500, 'internal error');
    });
  };
  server.on('upgrade', onUpgrade);

  return {
    /** Server of bridge connections (for tests: its `connection` events). */
    bridges,
    /** Server of browser connections. */
    browsers,

    /** Closes every WebSocket and stops taking upgrades. */
    close(): void {
      server.off('upgrade', onUpgrade);
      for (const stop of stopHeartbeats) stop();
      services.presence.closeAll(1001, 'hub shutting down');
      services.browsers.closeAll(1001, 'hub shutting down');
      for (const ws of [...bridges.clients, ...browsers.clients]) ws.terminate();
      bridges.close();
      browsers.close();
    },
  };
}
