import { parseArgs } from 'node:util';
import { startBridge } from './bridge';

/** Hub URL used when neither --hub nor HUB_URL is given. */
const DEFAULT_HUB_URL = 'ws://127.0.0.1:4300/ws/bridge';

/** How long shutdown may take before the process exits anyway, ms. */
const STOP_TIMEOUT_MS = 5000;

const usage =
  'usage: npm run bridge -- (--port PATH | --tcp HOST:PORT) [--hub URL] --token TOKEN ' +
  '[--journal FILE]\n' +
  'environment fallbacks: SERIAL_PORT, DEVICE_TCP, HUB_URL, BENCH_TOKEN, JOURNAL_FILE, DATA_DIR';

function fail(message: string): never {
  console.error(`bridge: ${message}\n${usage}`);
  process.exit(2);
}

function parseTcp(text: string): { host: string; port: number } {
  const m = /^(.*):(\d{1,5})$/.exec(text);
  const port = m ? Number(m[2]) : NaN;
  if (!m || port < 1 || port > 65535) fail(`--tcp wants HOST:PORT, got "${text}"`);
  return { host: m[1] || '127.0.0.1', port };
}

let values: Record<string, string | boolean | undefined>;
try {
  values = parseArgs({
    options: {
      port: { type: 'string' },
      tcp: { type: 'string' },
      hub: { type: 'string' },
      token: { type: 'string' },
      journal: { type: 'string' },
      help: { type: 'boolean', short: 'h' },
    },
  }).values;
} catch (err) {
  fail((err as Error).message);
}
if (values['help']) {
  console.log(usage);
  process.exit(0);
}

const env = process.env;
const str = (v: unknown) => (typeof v === 'string' && v !== '' ? v : undefined);
// A flag on the command line wins over the environment, and picks the link kind with it.
const portFlag = str(values['port']);
const tcpFlag = str(values['tcp']);
if (portFlag && tcpFlag) fail('give --port or --tcp, not both');
let serialPath = portFlag;
let tcpText = tcpFlag;
if (!serialPath && !tcpText) {
  serialPath = str(env['SERIAL_PORT']);
  tcpText = str(env['DEVICE_TCP']);
  if (serialPath && tcpText) fail('SERIAL_PORT and DEVICE_TCP are both set; choose one');
}
if (!serialPath && !tcpText) fail('no tracer given');
const token = str(values['token']) ?? str(env['BENCH_TOKEN']);
if (!token) fail('no bench token given');

const bridge = startBridge({
  serialPath,
  tcp: tcpText ? parseTcp(tcpText) : undefined,
  hubUrl: str(values['hub']) ?? str(env['HUB_URL']) ?? DEFAULT_HUB_URL,
  token,
  journalFile: str(values['journal']) ?? str(env['JOURNAL_FILE']),
});

let stopping = false;
function shutdown(signal: string): void {
  if (stopping) return;
  stopping = true;
  console.log(`${new Date().toISOString()} bridge: ${signal}, switching outputs off`);
  setTimeout(() => process.exit(1), STOP_TIMEOUT_MS).unref();
  bridge.stop().then(
    () => process.exit(0),
    (err: Error) => {
      console.error(`bridge: stop failed: ${err.message}`);
      process.exit(1);
    },
  );
}
process.on('SIGINT', () => shutdown('SIGINT'));
process.on('SIGTERM', () => shutdown('SIGTERM'));
