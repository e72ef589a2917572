import type { WebSocket, WebSocketServer } from 'ws';

/**
 * Pings every client of `wss` each `intervalMs`; a client that has not answered the previous
 * ping (nor sent anything) by then is terminated, which fires its `close` as usual.
 * Returns a function that stops the heartbeat.
 */
export function startHeartbeat(wss: WebSocketServer, intervalMs: number): () => void {
  const alive = new WeakMap<WebSocket, boolean>();
  const mark = (ws: WebSocket) => alive.set(ws, true);
  wss.on('connection', (ws: WebSocket) => {
    mark(ws);
    ws.on('pong', () => mark(ws));
    ws.on('message', () => mark(ws));
  });
  const timer = setInterval(() => {
    for (const ws of wss.clients) {
      if (alive.get(ws) === false) {
        ws.terminate();
        continue;
      }
      alive.set(ws, false);
      ws.ping();
    }
  }, intervalMs);
  timer.unref();
  return () => clearInterval(timer);
}
