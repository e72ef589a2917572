import WebSocket from 'ws';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_BENCHES } from '../../../server/demo/demo-data';
import { eventually, startTestHub, type TestHub } from '../test-hub';

function openBridge(hub: TestHub, bench: 0 | 1, autoPong: boolean): Promise<WebSocket> {
  return new Promise((resolve, reject) => {
    const ws = new WebSocket(`${hub.wsUrl}/ws/bridge`, {
      headers: { authorization: `Bearer ${DEMO_BENCHES[bench].token}` },
      autoPong,
    });
    ws.once('open', () => resolve(ws));
    ws.once('error', reject);
  });
}

describe('WebSocket heartbeat', () => {
  let hub: TestHub;
  beforeAll(async () => {
    hub = await startTestHub({ pingIntervalMs: 100 });
  });
  afterAll(() => hub.close());

  it('drops a peer that stops answering pings and keeps one that answers', async () => {
    const silent = await openBridge(hub, 0, false);
    const healthy = await openBridge(hub, 1, true);
    let pings = 0;
    healthy.on('ping', () => pings++);
    const closed = new Promise<number>((resolve) => silent.once('close', (code) => resolve(code)));
    expect(await closed).toBe(1006); // terminated, no close handshake
    await eventually(() => !hub.services.presence.isOnline(1), 'bench A offline');
    await eventually(() => pings >= 3, 'three pings answered');
    expect(healthy.readyState).toBe(WebSocket.OPEN);
    expect(hub.services.presence.isOnline(2)).toBe(true);
    healthy.close();
  });
});
