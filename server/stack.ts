import { spawn, type ChildProcess } from 'node:child_process';
import { createInterface } from 'node:readline';
import { fileURLToPath } from 'node:url';
import { dirname, join, resolve } from 'node:path';
import { DEMO_BENCHES, DEMO_USERS } from './demo/demo-data';

/**
 * Brings the whole product up on one machine: the hub, and for every demo bench a simulated
 * tracer and a bridge, each its own process as in production. `npm start` runs this file.
 */

const root = resolve(dirname(fileURLToPath(import.meta.url)), '..');

/** Options of startStack. */
export interface StackOptions {
  /** Hub HTTP port; 0 picks a free one. Default 4300. */
  port?: number;
  /** Hub data directory. Default ./data. */
  dataDir?: string;
  /** Simulator time factor (1 = real time). */
  speed?: number;
  /** Receives every line the processes print, prefixed with the process name. */
  log?: (line: string) => void;
  /** Extra environment for the hub. */
  hubEnv?: Record<string, string>;
}

/** A running stack. */
export interface RunningStack {
  /** Base URL of the hub, e.g. http://127.0.0.1:4300. */
  url: string;
  /** Control URLs of the simulators, by bench name. */
  simulatorControl: Record<string, string>;
  /** The child processes, by name. */
  processes: Map<string, ChildProcess>;
  /** Restarts one process by name (for failure tests). */
  restart(name: string): Promise<void>;
  /** Kills one process by name with SIGKILL (for failure tests). */
  kill(name: string): Promise<void>;
  /** Stops everything: bridges first (they switch outputs off), then simulators, then the hub. */
  stop(): Promise<void>;
}

/** One Node process of the product: a TypeScript entry file run with tsx. */
export interface ProcessSpec {
  /** Name used as the log prefix. */
  name: string;
  /** Entry file relative to the project root. */
  script: string;
  /** Command-line arguments. */
  args: string[];
  /** Extra environment. */
  env: Record<string, string>;
  /** A line matching this on stdout or stderr means the process is ready. */
  ready: RegExp;
}

/** A started process and the match of its ready line. */
export interface StartedProcess {
  /** The child process. */
  child: ChildProcess;
  /** The ready line's match. */
  ready: RegExpMatchArray;
}

/** Starts one process and resolves when it prints its ready line. */
export function startProcess(
  spec: ProcessSpec,
  log: (line: string) => void,
): Promise<StartedProcess> {
  return new Promise((resolveReady, reject) => {
    const child = spawn(
      process.execPath,
      ['--import', 'tsx', join(root, spec.script), ...spec.args],
      {
        cwd: root,
        env: { ...process.env, ...spec.env },
        stdio: ['ignore', 'pipe', 'pipe'],
      },
    );
    let ready = false;
    const onLine = (line: string) => {
      log(`[${spec.name}] ${line}`);
      const m = !ready && line.match(spec.ready);
      if (m) {
        ready = true;
        resolveReady({ child, ready: m });
      }
    };
    createInterface({ input: child.stdout! }).on('line', onLine);
    createInterface({ input: child.stderr! }).on('line', onLine);
    child.on('exit', (code, signal) => {
      if (!ready)
        reject(
          new Error(`${spec.name} exited before it was ready (code ${code}, signal ${signal})`),
        );
    });
  });
}

/** Stops a process with a signal, escalating to SIGKILL after 5 s. */
export function stopProcess(
  child: ChildProcess | undefined,
  signal: NodeJS.Signals = 'SIGTERM',
): Promise<void> {
  return new Promise<void>((done) => {
    if (!child || child.exitCode !== null || child.signalCode !== null) return done();
    const timer = setTimeout(() => child.kill('SIGKILL'), 5000);
    child.once('exit', () => {
      clearTimeout(timer);
      done();
    });
    child.kill(signal);
  });
}

/** Starts hub, simulators and bridges; resolves once all are ready. */
export async function startStack(options: StackOptions = {}): Promise<RunningStack> {
  const log = options.log ?? ((line: string) => console.log(line));
  const processes = new Map<string, ChildProcess>();
  const simulatorControl: Record<string, string> = {};

  const specs = new Map<string, ProcessSpec>();
  const launch = async (spec: ProcessSpec): Promise<RegExpMatchArray> => {
    specs.set(spec.name, spec);
    const started = await startProcess(spec, log);
    processes.set(spec.name, started.child);
    return started.ready;
  };

  const hubPort = options.port ?? Number(process.env.PORT ?? 4300);
  const dataDir = options.dataDir ?? process.env.DATA_DIR ?? join(root, 'data');
  const hubReady = await launch({
    name: 'hub',
    script: 'server/main.ts',
    args: [],
    env: {
      PORT: String(hubPort),
      DATA_DIR: dataDir,
      // A stack on a free port (tests) takes a free mail port too, so stacks never collide.
      ...(hubPort === 0 && !process.env.DEV_SMTP_PORT ? { DEV_SMTP_PORT: '0' } : {}),
      ...options.hubEnv,
    },
    ready: /hub listening on (http:\/\/\S+)/,
  });
  const url = hubReady[1];
  const hubWs = url.replace(/^http/, 'ws') + '/ws/bridge';

  for (const [i, bench] of DEMO_BENCHES.entries()) {
    const letter = String.fromCharCode(97 + i);
    const sim = await launch({
      name: `simulator-${letter}`,
      script: 'simulator/main.ts',
      args: [
        '--tcp',
        '0',
        '--control-port',
        '0',
        '--valve',
        bench.valve,
        '--speed',
        String(options.speed ?? 1),
      ],
      env: {},
      ready: /simulator ready tcp=(\S+)(?: control=(\S+))?/,
    });
    if (sim[2]) simulatorControl[bench.name] = `http://${sim[2]}`;
    await launch({
      name: `bridge-${letter}`,
      script: 'bridge/main.ts',
      args: ['--tcp', sim[1], '--hub', hubWs, '--token', bench.token, '--journal', join(dataDir, `bridge-${letter}-journal.jsonl`)],
      env: {},
      ready: /./,
    });
  }

  const stopOne = (name: string, signal: NodeJS.Signals = 'SIGTERM') =>
    stopProcess(processes.get(name), signal);

  return {
    url,
    simulatorControl,
    processes,
    async restart(name) {
      await stopOne(name);
      await launch(specs.get(name)!);
    },
    async kill(name) {
      await stopOne(name, 'SIGKILL');
    },
    async stop() {
      const names = [...processes.keys()];
      await Promise.all(names.filter((n) => n.startsWith('bridge')).map((n) => stopOne(n)));
      await Promise.all(names.filter((n) => n.startsWith('simulator')).map((n) => stopOne(n)));
      await stopOne('hub');
    },
  };
}

async function main(): Promise<void> {
  const stack = await startStack();
  const width = Math.max(...DEMO_USERS.map((u) => u.username.length));
  console.log('');
  console.log(`Emberline is running at ${stack.url}`);
  console.log('Demo sign-ins:');
  for (const u of DEMO_USERS)
    console.log(`  ${u.username.padEnd(width)}  ${u.password.padEnd(12)}  ${u.role}`);
  console.log('Benches: ' + DEMO_BENCHES.map((b) => `${b.name} (simulated ${b.valve})`).join(', '));
  console.log('Press Ctrl-C to stop.');
  console.log('');
  let stopping = false;
  const shutdown = () => {
    if (stopping) return;
    stopping = true;
    console.log('Stopping: outputs off, then bridges, simulators and hub.');
    void stack.stop().then(() => process.exit(0));
  };
  process.on('SIGINT', shutdown);
  process.on('SIGTERM', shutdown);
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  main().catch((err) => {
    console.error(String(err?.stack ?? err));
    process.exit(1);
  });
}
