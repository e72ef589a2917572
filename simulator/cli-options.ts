import { isFaultName, FAULT_NAMES, type FaultName } from './fault-name';
import { DEFAULT_WATCHDOG_MS } from './simulated-device';
import { parseValveSpec } from './valve-spec';

/** Settings of the simulator process, from flags and environment. */
export interface CliOptions {
  /** TCP port to serve on (0 = free port), or null for serial. */
  tcpPort: number | null;
  /** Serial device path to serve on, or null for TCP. */
  serialPath: string | null;
  /** Address the TCP and control servers listen on. */
  host: string;
  /** Valve in the socket, "TYPE#SEED". */
  valve: string;
  /** Simulated ms per wall-clock ms. */
  speed: number;
  /** Fault at start. */
  fault: FaultName;
  /** Control server port (0 = free port), or null for none. */
  controlPort: number | null;
  /** Watchdog period, wall-clock ms. */
  watchdogMs: number;
}

/** TCP port used when neither a port nor a serial path is given. */
export const DEFAULT_TCP_PORT = 4310;

/** Usage text for --help and for errors. */
export const USAGE = [
  'usage: simulator [--tcp PORT | --serial PATH] [--valve TYPE#SEED] [--speed N] [--fault NAME]',
  '                 [--control-port PORT] [--watchdog-ms N] [--host ADDR]',
  `  --tcp PORT           serve on TCP, 0 = free port (default ${DEFAULT_TCP_PORT}); env SIM_TCP_PORT`,
  '  --serial PATH        serve on a serial device path instead; env SIM_SERIAL',
  '  --valve TYPE#SEED    valve in the socket (default 12AX7#1; seed 0 = nominal); env SIM_VALVE',
  '  --speed N            simulated time factor (default 1); env SIM_SPEED',
  '  --fault NAME         fault at start (default none); env SIM_FAULT',
  '  --control-port PORT  HTTP control API, 0 = free port (default none); env SIM_CONTROL_PORT',
  `  --watchdog-ms N      watchdog period in ms (default ${DEFAULT_WATCHDOG_MS}); env SIM_WATCHDOG_MS`,
  '  --host ADDR          listen address (default 127.0.0.1); env SIM_HOST',
  `faults: ${FAULT_NAMES.join(', ')}`,
].join('\n');

const FLAGS = ['tcp', 'serial', 'valve', 'speed', 'fault', 'control-port', 'watchdog-ms', 'host'];

/** Parses flags (`--name value` or `--name=value`) over environment defaults; throws on bad input. */
export function parseCliOptions(
  argv: string[],
  env: Record<string, string | undefined>,
): CliOptions {
  const flags = new Map<string, string>();
  for (let i = 0; i < argv.length; i++) {
    const match = /^--([a-z-]+)(?:=(.*))?$/.exec(argv[i]);
    if (!match || !FLAGS.includes(match[1])) throw new Error(`unknown argument "${argv[i]}"`);
    const value = match[2] ?? argv[++i];
    if (value === undefined) throw new Error(`--${match[1]} needs a value`);
    flags.set(match[1], value);
  }
  const pick = (flag: string, envName: string) => flags.get(flag) ?? nonEmpty(env[envName]);

  const tcpText = pick('tcp', 'SIM_TCP_PORT');
  const serialPath = pick('serial', 'SIM_SERIAL') ?? null;
  if (flags.has('tcp') && flags.has('serial')) throw new Error('give --tcp or --serial, not both');
  const useSerial =
    flags.has('serial') || (!flags.has('tcp') && serialPath !== null && tcpText === undefined);
  if (!useSerial && serialPath !== null && tcpText !== undefined && !flags.has('tcp')) {
    throw new Error('SIM_TCP_PORT and SIM_SERIAL are both set; choose one');
  }

  const valve = pick('valve', 'SIM_VALVE') ?? '12AX7#1';
  parseValveSpec(valve);
  const speed = number(pick('speed', 'SIM_SPEED') ?? '1', 'speed');
  if (!(speed > 0)) throw new Error(`speed must be positive, got ${speed}`);
  const fault = pick('fault', 'SIM_FAULT') ?? 'none';
  if (!isFaultName(fault))
    throw new Error(`unknown fault "${fault}"; faults: ${FAULT_NAMES.join(', ')}`);
  const controlText = pick('control-port', 'SIM_CONTROL_PORT');
  const watchdogMs = number(
    pick('watchdog-ms', 'SIM_WATCHDOG_MS') ?? String(DEFAULT_WATCHDOG_MS),
    'watchdog-ms',
  );
  if (!Number.isInteger(watchdogMs) || watchdogMs < 100) {
    throw new Error(`watchdog-ms must be an integer of at least 100, got ${watchdogMs}`);
  }
  return {
    tcpPort: useSerial ? null : tcpPort(tcpText ?? String(DEFAULT_TCP_PORT), 'tcp'),
    serialPath: useSerial ? serialPath : null,
    host: pick('host', 'SIM_HOST') ?? '127.0.0.1',
    valve,
    speed,
    fault,
    controlPort: controlText === undefined ? null : tcpPort(controlText, 'control-port'),
    watchdogMs,
  };
}

function nonEmpty(s: string | undefined): string | undefined {
  return s === undefined || s.trim() === '' ? undefined : s.trim();
}

function number(text: string, name: string): number {
  const x = Number(text);
  if (text.trim() === '' || !Number.isFinite(x))
    throw new Error(`${name} must be a number, got "${text}"`);
  return x;
}

function tcpPort(text: string, name: string): number {
  const port = number(text, name);
  if (!Number.isInteger(port) || port < 0 || port > 65535) {
    throw new Error(`${name} must be a port number from 0 to 65535, got "${text}"`);
  }
  return port;
}
