import QRCode from 'qrcode';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../../server/app';
import { DEMO_STOCK } from '../../../server/demo/demo-stock';
import { startTestHub, type TestHub } from '../test-hub';

/** The dark modules of the QR code of `text`, as the label draws them. */
function modulesOf(text: string): string[] {
  const { modules } = QRCode.create(text, { errorCorrectionLevel: 'M' });
  const out: string[] = [];
  for (let row = 0; row < modules.size; row++) {
    for (let col = 0; col < modules.size; col++) {
      if (modules.get(row, col)) out.push(`M${col} ${row}`);
    }
  }
  return out;
}

/** The module squares drawn in a label's QR path. */
function drawnModules(svg: string): string[] {
  const d = /<path d="([^"]*)"/.exec(svg)![1];
  return [...d.matchAll(/M(\d+) (\d+)h1v1h-1z/g)].map((m) => `M${m[1]} ${m[2]}`);
}

describe('printable valve labels', () => {
  let hub: TestHub;
  let viewer: string;
  let id: number;

  beforeAll(async () => {
    hub = await startTestHub();
    viewer = await hub.token('viewer');
    const created = await hub.api
      .post('/api/valves')
      .set('authorization', `Bearer ${await hub.token('tech')}`)
      .send({ type: '6L6GC', maker: '<Corrin & Hale>', dateCode: 'K7 3B' })
      .expect(201);
    id = created.body.id;
  });
  afterAll(() => hub.close());

  it('draws the label, the type and a QR code of the record address the request came to', async () => {
    const res = await hub.api
      .get(`/api/valves/${id}/label.svg`)
      .set('authorization', `Bearer ${viewer}`)
      .set('host', 'bench-pc.local:4300')
      .buffer(true)
      .parse((r, cb) => {
        let s = '';
        r.on('data', (c: Buffer) => (s += c.toString('utf8')));
        r.on('end', () => cb(null, s));
      })
      .expect(200);
    expect(res.headers['content-type']).toContain('image/svg+xml');
    const svg = res.body as string;
    const url = `http://bench-pc.local:4300/valves/${id}`;
    expect(svg).toContain(`data-url="${url}"`);
    expect(svg).toContain(`>KL-${String(DEMO_STOCK.length + 1).padStart(4, '0')}</text>`);
    expect(svg).toContain('>6L6GC</text>');
    expect(svg).toContain('&lt;Corrin &amp; Hale&gt; \u00b7 K7 3B');
    expect(svg).not.toContain('<Corrin');
    expect(drawnModules(svg)).toEqual(modulesOf(url));
    expect(drawnModules(svg)).not.toEqual(modulesOf(`http://bench-pc.local:4300/valves/${id + 1}`));
  });

  it('uses the public address when one is configured', async () => {
    const app = createApp({
      services: hub.services,
      version: 'test',
      staticDir: null,
      publicUrl: 'https://valves.kestrel.example/',
    });
    const res = await request(app)
      .get(`/api/valves/${id}/label.svg`)
      .set('authorization', `Bearer ${viewer}`)
      .buffer(true)
      .parse((r, cb) => {
        let s = '';
        r.on('data', (c: Buffer) => (s += c.toString('utf8')));
        r.on('end', () => cb(null, s));
      })
      .expect(200);
    const url = `https://valves.kestrel.example/valves/${id}`;
    expect(res.body).toContain(`data-url="${url}"`);
    expect(drawnModules(res.body)).toEqual(modulesOf(url));
  });

  it('needs a sign-in and a valve that exists', async () => {
    await hub.api.get(`/api/valves/${id}/label.svg`).expect(401);
    await hub.api
      .get('/api/valves/99999/label.svg')
      .set('authorization', `Bearer ${viewer}`)
      .expect(404);
  });
});
