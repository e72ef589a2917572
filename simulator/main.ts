import { parseCliOptions, USAGE } from './cli-options';
import { startControlServer, type ControlServer } from './control-server';
import { SerialTransport } from './serial-transport';
import { SimulatedTracer } from './simulated-tracer';
import { TcpTransport } from './tcp-transport';

/*
 * The simulated tracer as a process. stdout carries exactly one line, the ready line, so a
 * supervisor can wait for it; everything else goes to stderr.
 */
async function main(): Promise<void> {
  const argv = process.argv.slice(2);
  if (argv.includes('--help') || argv.includes('-h')) {
    process.stdout.write(`${USAGE}\n`);
    return;
  }
  let options;
  try {
    options = parseCliOptions(argv, process.env);
  } catch (e) {
    process.stderr.write(`simulator: ${(e as Error).message}\n${USAGE}\n`);
    process.exit(2);
  }

  const tracer = new SimulatedTracer({
    valve: options.valve,
    speed: options.speed,
    fault: options.fault,
    watchdogMs: options.watchdogMs,
  });
  const transport =
    options.serialPath !== null
      ? new SerialTransport(tracer, { path: options.serialPath })
      : new TcpTransport(tracer, { port: options.tcpPort ?? 0, host: options.host });
  let control: ControlServer | null = null;
  try {
    const where = await transport.start();
    if (options.controlPort !== null) {
      control = await startControlServer({
        tracer,
        transport,
        port: options.controlPort,
        host: options.host,
      });
    }
    const link = options.serialPath !== null ? `serial=${where}` : `tcp=${where}`;
    process.stdout.write(
      `simulator ready ${link}${control ? ` control=${control.address}` : ''}\n`,
    );
  } catch (e) {
    tracer.shutdown();
    process.stderr.write(`simulator: ${(e as Error).message}\n`);
    process.exit(1);
  }
  process.stderr.write(
    `simulator: valve ${options.valve}, speed ${options.speed}, fault ${options.fault}, watchdog ${options.watchdogMs} ms\n`,
  );

  let stopping = false;
  const stop = async (signal: string) => {
    if (stopping) return;
    stopping = true;
    tracer.shutdown();
    process.stderr.write(`simulator: ${signal}, outputs off, closing\n`);
    await Promise.all([transport.stop(), control?.close()]);
    process.exit(0);
  };
  process.on('SIGINT', () => void stop('SIGINT'));
  process.on('SIGTERM', () => void stop('SIGTERM'));
}

void main();
