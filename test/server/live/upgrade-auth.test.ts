import jwt from 'jsonwebtoken';
import WebSocket from 'ws';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_BENCHES } from '../../../server/demo/demo-data';
import { JsonClient, startTestHub, type TestHub } from '../test-hub';

/** Tries an upgrade; resolves with the HTTP status of the refusal, or 101 if it opened. */
function tryUpgrade(url: string, headers: Record<string, string> = {}): Promise<number> {
  return new Promise((resolve, reject) => {
    const ws = new WebSocket(url, { headers });
    ws.once('open', () => {
      ws.terminate();
      resolve(101);
    });
    ws.once('unexpected-response', (_req, res) => {
      resolve(res.statusCode ?? 0);
      ws.terminate();
    });
    ws.once('error', reject);
  });
}

describe('WebSocket upgrade authentication', () => {
  let hub: TestHub;
  let connections = 0;
  beforeAll(async () => {
    hub = await startTestHub();
    hub.live.bridges.on('connection', () => connections++);
    hub.live.browsers.on('connection', () => connections++);
  });
  afterAll(() => hub.close());

  it('refuses every bad credential with 401 and never opens a socket', async () => {
    const expired = jwt.sign(
      { role: 'admin', exp: Math.floor(Date.now() / 1000) - 10 },
      hub.config.jwtSecret,
      { subject: '1' },
    );
    const forged = jwt.sign({ role: 'admin' }, 'wrong-secret', { subject: '1' });
    const live = `${hub.wsUrl}/ws/live`;
    const bridge = `${hub.wsUrl}/ws/bridge`;
    const attempts: [string, Promise<number>][] = [
      ['live without token', tryUpgrade(live)],
      ['live with garbage token', tryUpgrade(`${live}?token=garbage`)],
      ['live with forged token', tryUpgrade(`${live}?token=${forged}`)],
      ['live with expired token', tryUpgrade(`${live}?token=${expired}`)],
      [
        'live with the JWT as a header',
        tryUpgrade(live, { authorization: `Bearer ${await hub.token('viewer')}` }),
      ],
      ['bridge without token', tryUpgrade(bridge)],
      [
        'bridge with wrong token',
        tryUpgrade(bridge, { authorization: 'Bearer demo-bench-a-000000' }),
      ],
      [
        'bridge with a user JWT',
        tryUpgrade(bridge, { authorization: `Bearer ${await hub.token('admin')}` }),
      ],
      ['bridge with token in query', tryUpgrade(`${bridge}?token=${DEMO_BENCHES[0].token}`)],
    ];
    for (const [what, status] of attempts) expect(await status, what).toBe(401);
    expect(await tryUpgrade(`${hub.wsUrl}/ws/elsewhere`)).toBe(404);
    expect(connections).toBe(0);
    expect(hub.services.browsers.size).toBe(0);
    expect(hub.services.presence.isOnline(1)).toBe(false);
  });

  it('opens with a valid JWT or bench token', async () => {
    const before = connections;
    const browser = await JsonClient.open(
      `${hub.wsUrl}/ws/live?token=${await hub.token('viewer')}`,
    );
    const bridge = await JsonClient.open(`${hub.wsUrl}/ws/bridge`, {
      headers: { authorization: `Bearer ${DEMO_BENCHES[1].token}` },
    });
    expect(connections).toBe(before + 2);
    expect(await bridge.next('welcome')).toEqual({
      type: 'welcome',
      benchId: 2,
      benchName: 'Bench B',
    });
    await browser.close();
    await bridge.close();
  });
});
