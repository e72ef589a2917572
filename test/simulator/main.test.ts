import { spawn, type ChildProcess } from 'node:child_process';
import { createInterface } from 'node:readline';
import { fileURLToPath } from 'node:url';
import { afterEach, describe, expect, it } from 'vitest';
import { tcpClient } from './tcp-client';
import { line, smallTriodePlan, sweepLine } from './test-host';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const TSX = `${ROOT}node_modules/.bin/tsx`;
const children: ChildProcess[] = [];

function start(args: string[], env: Record<string, string> = {}) {
  const child = spawn(TSX, ['simulator/main.ts', ...args], {
    cwd: ROOT,
    env: { ...process.env, ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  children.push(child);
  const stdout: string[] = [];
  let stderr = '';
  child.stderr!.on('data', (d) => (stderr += d));
  const exited = new Promise<number | null>((resolve) =>
    child.once('exit', (code) => resolve(code)),
  );
  const ready = new Promise<string>((resolve, reject) => {
    createInterface({ input: child.stdout! }).on('line', (l) => {
      stdout.push(l);
      if (stdout.length === 1) resolve(l);
    });
    exited.then((code) => reject(new Error(`exited ${code}: ${stderr}`)));
  });
  return { child, ready, exited, stdout, stderr: () => stderr };
}

afterEach(() => {
  for (const c of children.splice(0)) if (c.exitCode === null) c.kill('SIGKILL');
});

describe('simulator main', () => {
  it('prints one ready line, serves TCP and control, and stops cleanly on SIGTERM', async () => {
    const sim = start(['--tcp', '0', '--control-port', '0', '--valve', 'EL34#4', '--speed', '100']);
    const ready = await sim.ready;
    const match = /^simulator ready tcp=127\.0\.0\.1:(\d+) control=127\.0\.0\.1:(\d+)$/.exec(ready);
    expect(match).not.toBeNull();
    const state = await (await fetch(`http://127.0.0.1:${match![2]}/state`)).json();
    expect(state).toMatchObject({ valve: 'EL34#4', speed: 100 });

    const c = await tcpClient(Number(match![1]));
    c.send(line({ type: 'identify' }));
    await c.host.waitFor('caps');
    c.send(sweepLine(3, smallTriodePlan({ vg2Volts: 250, heaterVolts: 6.3, warmupSeconds: 600 })));
    await c.host.waitFor('ack');
    sim.child.kill('SIGTERM');
    expect(await sim.exited).toBe(0);
    await c.closed;
    // Outputs off first: the running sweep is ended before the link closes.
    expect(c.host.of('end')).toEqual([{ type: 'end', sweepId: 3, reason: 'aborted', count: 0 }]);
    expect(sim.stdout).toEqual([ready]);
  });

  it('takes its settings from the environment and omits control= without a control port', async () => {
    const sim = start([], { SIM_TCP_PORT: '0', SIM_VALVE: '12AU7#2', SIM_SPEED: '10' });
    expect(await sim.ready).toMatch(/^simulator ready tcp=127\.0\.0\.1:\d+$/);
    sim.child.kill('SIGINT');
    expect(await sim.exited).toBe(0);
  });

  it('exits with status 2 and a reason on bad arguments', async () => {
    const sim = start(['--tcp', '0', '--fault', 'smoke']);
    await expect(sim.ready).rejects.toThrow(/unknown fault/);
    expect(await sim.exited).toBe(2);
  });
});
