import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { ChildProcess } from 'node:child_process';
import Database from 'better-sqlite3';
import WebSocket from 'ws';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { SweepPlan, SweepPoint } from '../../shared/domain/sweep';
import type { BenchView, HubToBrowser, SweepView } from '../../shared/hub/messages';
import { DEMO_BENCHES, DEMO_USERS } from '../../server/demo/demo-data';
import { startProcess, stopProcess, type ProcessSpec } from '../../server/stack';
import { freePort } from '../support/free-port';
import { openPtyPair, type PtyPair } from '../support/pty-pair';

// The whole chain with every real part: simulator on a pty, bridge on the real serialport
// binding, hub on a real SQLite file, and a WebSocket client where a browser would be.

const lines: string[] = [];
const log = (line: string) => {
  lines.push(line);
  if (process.env.PIPELINE_LOG) console.log(line);
};

/** 10 curves x 50 points, kept well inside a 12AX7's ratings so no curve clips early. */
const plan: SweepPlan = {
  kind: 'anode',
  vaStartVolts: 4,
  vaStopVolts: 200,
  vaStepVolts: 4,
  vg1Volts: [0, -0.5, -1, -1.5, -2, -2.5, -3, -3.5, -4, -4.5],
  vg2Volts: 0,
  heaterVolts: 12.6,
  iaMaxMilliamps: 20,
  paMaxWatts: 1,
  iaTripMilliamps: 30,
  warmupSeconds: 1,
  settleMs: 5,
};

let dir: string;
let pty: PtyPair;
let port: number;
let hub: ChildProcess;
let simulator: ChildProcess;
let bridge: ChildProcess;
let token: string;
let control: string;
const bench = DEMO_BENCHES[0];
const tech = DEMO_USERS.find((u) => u.role === 'technician')!;

const hubSpec = (): ProcessSpec => ({
  name: 'hub',
  script: 'server/main.ts',
  args: [],
  env: { PORT: String(port), DATA_DIR: dir, DEMO: '1', JWT_SECRET: 'pipeline-test-secret' },
  ready: /hub listening on/,
});

async function api<T>(path: string, init: RequestInit = {}): Promise<T> {
  const res = await fetch(`http://127.0.0.1:${port}${path}`, {
    ...init,
    headers: { 'content-type': 'application/json', ...(token ? { authorization: `Bearer ${token}` } : {}), ...init.headers },
  });
  const body = await res.json();
  if (!res.ok) throw new Error(`${init.method ?? 'GET'} ${path}: ${res.status} ${JSON.stringify(body)}`);
  return body as T;
}

async function until<T>(what: string, probe: () => Promise<T | undefined> | T | undefined, ms = 30000): Promise<T> {
  const deadline = Date.now() + ms;
  for (;;) {
    const v = await probe();
    if (v !== undefined && v !== null && v !== false) return v;
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}\n${lines.slice(-30).join('\n')}`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

async function benchId(): Promise<number> {
  return until('bench online', async () => {
    const benches = await api<BenchView[]>('/api/benches');
    const b = benches.find((x) => x.name === bench.name);
    return b?.bridgeOnline && b.status?.deviceOnline && b.status.state === 'idle' ? b.id : undefined;
  });
}

/** A live client as a browser would hold: it watches one sweep and keeps every point it is sent. */
function watch(sweepId: number) {
  const ws = new WebSocket(`ws://127.0.0.1:${port}/ws/live?token=${token}`);
  const points: SweepPoint[] = [];
  let sweep: SweepView | undefined;
  ws.on('open', () => ws.send(JSON.stringify({ type: 'watch-sweep', sweepId })));
  ws.on('message', (data) => {
    const m = JSON.parse(String(data)) as HubToBrowser;
    if (m.type === 'points' && m.sweepId === sweepId) points.push(...m.points);
    if (m.type === 'sweep' && m.sweep.id === sweepId) sweep = m.sweep;
  });
  return { ws, points, sweep: () => sweep };
}

function storedSeqs(sweepId: number): number[] {
  const db = new Database(join(dir, 'emberline.sqlite'), { readonly: true, fileMustExist: true });
  try {
    return db
      .prepare('SELECT seq FROM sweep_points WHERE sweep_id = ? ORDER BY seq')
      .all(sweepId)
      .map((r) => (r as { seq: number }).seq);
  } finally {
    db.close();
  }
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'emberline-pipeline-'));
  pty = await openPtyPair(dir);
  port = await freePort();
  hub = (await startProcess(hubSpec(), log)).child;
  const sim = await startProcess(
    {
      name: 'simulator',
      script: 'simulator/main.ts',
      args: ['--serial', pty.a, '--valve', bench.valve, '--speed', '1', '--control-port', '0'],
      env: {},
      ready: /simulator ready serial=\S+ control=(\S+)/,
    },
    log,
  );
  simulator = sim.child;
  control = `http://${sim.ready[1]}`;
  bridge = (
    await startProcess(
      {
        name: 'bridge',
        script: 'bridge/main.ts',
        args: ['--port', pty.b, '--hub', `ws://127.0.0.1:${port}/ws/bridge`, '--token', bench.token, '--journal', join(dir, 'journal.jsonl')],
        env: {},
        ready: /./,
      },
      log,
    )
  ).child;
  token = (await api<{ token: string }>('/api/auth/login', { method: 'POST', body: JSON.stringify({ username: tech.username, password: tech.password }) })).token;
}, 120000);

afterAll(async () => {
  await stopProcess(bridge);
  await stopProcess(simulator);
  await stopProcess(hub);
  await pty?.close();
  rmSync(dir, { recursive: true, force: true });
});

describe('serial pipeline', () => {
  it('delivers a 10-curve x 50-point sweep complete and in order, stored once', async () => {
    const id = await benchId();
    const sweep = await api<SweepView>('/api/sweeps', { method: 'POST', body: JSON.stringify({ benchId: id, plan, valveType: '12AX7', valveLabel: 'pipeline-1' }) });
    const live = watch(sweep.id);
    const done = await until('sweep end', () => (live.sweep()?.status === 'complete' && live.points.length >= 500 ? live.sweep() : undefined), 60000);
    live.ws.close();

    expect(done.pointCount).toBe(500);
    expect(done.deviceCount).toBe(500);
    expect(live.points.map((p) => p.seq)).toEqual([...Array(500).keys()]);
    const curves = new Map<number, number>();
    for (const p of live.points) curves.set(p.curve, (curves.get(p.curve) ?? 0) + 1);
    expect([...curves.values()]).toEqual(Array(10).fill(50));
    expect(storedSeqs(sweep.id)).toEqual([...Array(500).keys()]);
    const detail = await api<SweepView & { points: SweepPoint[] }>(`/api/sweeps/${sweep.id}`);
    expect(detail.points).toHaveLength(500);
    expect(detail.points[0]).toEqual(live.points[0]);
  });

  it('loses and doubles nothing when the hub is killed and restarted mid-sweep', async () => {
    const id = await benchId();
    const slow = { ...plan, settleMs: 20 };
    const sweep = await api<SweepView>('/api/sweeps', { method: 'POST', body: JSON.stringify({ benchId: id, plan: slow, valveType: '12AX7', valveLabel: 'pipeline-2' }) });
    await until('some points stored', () => (storedSeqs(sweep.id).length >= 60 ? true : undefined), 30000);

    await stopProcess(hub, 'SIGKILL');
    // The bridge switches the tracer's outputs off when it loses the hub, so the sweep stops
    // early; what the tracer measured until then must arrive, once each.
    await new Promise((r) => setTimeout(r, 1500));
    hub = (await startProcess(hubSpec(), log)).child;

    const ended = await until('sweep recorded as ended', async () => {
      const s = await api<SweepView>(`/api/sweeps/${sweep.id}`);
      return s.status !== 'running' && s.status !== 'pending' ? s : undefined;
    });
    expect(ended.status).toBe('link-lost');
    const seqs = await until('all points resent', () => {
      const s = storedSeqs(sweep.id);
      return s.length === ended.pointCount && s.length > 0 ? s : undefined;
    });
    expect(seqs).toEqual([...Array(seqs.length).keys()]);
    expect(ended.deviceCount, 'stored count equals the count the tracer reported').toBe(seqs.length);
    expect(seqs.length).toBeGreaterThanOrEqual(60);
    expect(seqs.length).toBeLessThan(500);
  });

  it('ends the sweep with reason "limit" on an over-limit reading, and the tracer gets outputs-off', async () => {
    const id = await benchId();
    const slow = { ...plan, settleMs: 20 };
    const before = (await (await fetch(`${control}/state`)).json()) as { counters: { commands: { off: number } } };
    const sweep = await api<SweepView>('/api/sweeps', { method: 'POST', body: JSON.stringify({ benchId: id, plan: slow, valveType: '12AX7', valveLabel: 'pipeline-3' }) });
    await until('some points stored', () => (storedSeqs(sweep.id).length >= 30 ? true : undefined), 30000);
    // A short between electrodes mid-sweep: the next reading is far above the 30 mA trip.
    const put = await fetch(`${control}/fault`, { method: 'PUT', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ fault: 'short' }) });
    expect(put.status).toBe(200);
    try {
      const ended = await until('sweep ended', async () => {
        const s = await api<SweepView>(`/api/sweeps/${sweep.id}`);
        return s.status !== 'running' && s.status !== 'pending' ? s : undefined;
      });
      expect(ended.status).toBe('limit');
      const after = (await (await fetch(`${control}/state`)).json()) as { highVoltage: boolean; counters: { commands: { off: number } } };
      expect(after.highVoltage).toBe(false);
      expect(after.counters.commands.off).toBeGreaterThan(before.counters.commands.off);
    } finally {
      await fetch(`${control}/fault`, { method: 'PUT', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ fault: 'none' }) });
    }
  });
});
