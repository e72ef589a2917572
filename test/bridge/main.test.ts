import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { startBridge, type Bridge } from '../../bridge/bridge';
import { FakeHub } from './fake-hub';
import { FakeTracer } from './fake-tracer';
import { SAFE_PLAN, TEST_TOKEN } from './test-bench';
import { until } from './until';

const root = resolve(__dirname, '../..');

interface Cli {
  child: ChildProcess;
  output: string[];
  exit: Promise<number | null>;
}

/** Runs bridge/main.ts in its own Node process (tsx as a loader, so signals reach it). */
function runCli(args: string[], env: Record<string, string> = {}): Cli {
  const clean = { ...process.env };
  for (const k of ['SERIAL_PORT', 'DEVICE_TCP', 'HUB_URL', 'BENCH_TOKEN', 'JOURNAL_FILE']) {
    delete clean[k];
  }
  const child = spawn(process.execPath, ['--import', 'tsx', 'bridge/main.ts', ...args], {
    cwd: root,
    env: { ...clean, ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  const output: string[] = [];
  const collect = (chunk: Buffer) => output.push(...chunk.toString().split('\n').filter(Boolean));
  child.stdout!.on('data', collect);
  child.stderr!.on('data', collect);
  const exit = new Promise<number | null>((done) => child.once('exit', (code) => done(code)));
  return { child, output, exit };
}

describe('bridge command line', () => {
  let dir: string;
  let hub: FakeHub;
  let tracer: FakeTracer;
  let port: number;
  let cli: Cli | null = null;
  let bridge: Bridge | null = null;

  beforeEach(async () => {
    dir = mkdtempSync(join(tmpdir(), 'emberline-bridge-cli-'));
    hub = await FakeHub.start(TEST_TOKEN);
    ({ tracer, port } = await FakeTracer.tcp());
  });
  afterEach(async () => {
    if (cli && cli.child.exitCode === null) {
      cli.child.kill('SIGKILL');
      await cli.exit;
    }
    cli = null;
    await bridge?.stop();
    bridge = null;
    await tracer.close();
    await hub.close();
    rmSync(dir, { recursive: true, force: true });
  });

  it('exits with status 2 and the usage when no tracer is given', async () => {
    cli = runCli(['--token', 'x']);
    expect(await cli.exit).toBe(2);
    expect(cli.output.join('\n')).toContain('no tracer given');
    expect(cli.output.join('\n')).toContain('usage:');
  });

  it('takes its settings from the environment, and on SIGTERM switches outputs off and exits 0', async () => {
    cli = runCli([], {
      DEVICE_TCP: `127.0.0.1:${port}`,
      HUB_URL: hub.url,
      BENCH_TOKEN: TEST_TOKEN,
      JOURNAL_FILE: join(dir, 'journal.jsonl'),
    });
    await until(
      'bridge ready',
      () => hub.clientConnected && tracer.commands('status').length > 0,
      20000,
    );
    const offsBefore = tracer.commands('off').length;
    cli.child.kill('SIGTERM');
    expect(await cli.exit).toBe(0);
    await tracer.waitFor('off', offsBefore + 1);
    expect(tracer.commands('off').length).toBe(offsBefore + 1);
    expect(cli.output.some((l) => l.includes('SIGTERM'))).toBe(true);
    // Plain log lines: printable ASCII only.
    for (const line of cli.output) expect(line).toMatch(/^[\x20-\x7e]*$/);
  });

  it("reports a sweep 'link-lost' with all its points after the bridge was killed mid-sweep", async () => {
    const journalFile = join(dir, 'journal.jsonl');
    const args = ['--tcp', `127.0.0.1:${port}`, '--hub', hub.url, '--token', TEST_TOKEN];
    cli = runCli([...args, '--journal', journalFile]);
    await until(
      'bridge ready',
      () => hub.clientConnected && tracer.commands('status').length > 0,
      20000,
    );
    hub.autoAck = false;
    hub.send({ type: 'start-sweep', sweepId: 41, plan: SAFE_PLAN });
    await hub.waitFor('sweep-started');
    for (let i = 0; i < 6; i++) tracer.point(i * 10, 0.1 * i);
    await until('6 points at the hub', () => hub.seqsReceived(41).length === 6);
    cli.child.kill('SIGKILL');
    await cli.exit;
    expect(hub.messages('sweep-ended')).toHaveLength(0);

    hub.autoAck = true;
    bridge = startBridge({
      tcp: { host: '127.0.0.1', port },
      hubUrl: hub.url,
      token: TEST_TOKEN,
      journalFile,
      log: () => undefined,
      reconnectInitialMs: 20,
    });
    const ended = await until('the end reported', () => hub.messages('sweep-ended', 2)[0]);
    expect(ended).toMatchObject({ sweepId: 41, reason: 'link-lost', count: 6 });
    expect(ended.message).toContain('the bridge stopped during the sweep');
    expect(hub.seqsReceived(41, 2)).toEqual([0, 1, 2, 3, 4, 5]);
  });
});
