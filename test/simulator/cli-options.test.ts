import { describe, expect, it } from 'vitest';
import { DEFAULT_TCP_PORT, parseCliOptions } from '../../simulator/cli-options';

describe('parseCliOptions', () => {
  it('reads every flag', () => {
    const o = parseCliOptions(
      [
        '--tcp',
        '0',
        '--valve',
        'EL34#4',
        '--speed=50',
        '--fault',
        'gas',
        '--control-port',
        '0',
        '--watchdog-ms',
        '500',
      ],
      {},
    );
    expect(o).toEqual({
      tcpPort: 0,
      serialPath: null,
      host: '127.0.0.1',
      valve: 'EL34#4',
      speed: 50,
      fault: 'gas',
      controlPort: 0,
      watchdogMs: 500,
    });
  });

  it('falls back to the environment, and flags win over it', () => {
    const env = { SIM_SERIAL: '/tmp/ttyA', SIM_VALVE: '12AU7#2', SIM_SPEED: '10' };
    expect(parseCliOptions([], env)).toMatchObject({
      serialPath: '/tmp/ttyA',
      tcpPort: null,
      valve: '12AU7#2',
      speed: 10,
    });
    expect(parseCliOptions(['--tcp', '4400'], env)).toMatchObject({
      tcpPort: 4400,
      serialPath: null,
    });
    expect(parseCliOptions([], { SIM_TCP_PORT: '0' })).toMatchObject({
      tcpPort: 0,
      controlPort: null,
    });
  });

  it('serves TCP on the default port when no link is given', () => {
    expect(parseCliOptions([], {})).toMatchObject({
      tcpPort: DEFAULT_TCP_PORT,
      valve: '12AX7#1',
      speed: 1,
      fault: 'none',
    });
  });

  it('refuses bad input with a clear reason', () => {
    expect(() => parseCliOptions(['--tcp', '1', '--serial', '/dev/x'], {})).toThrow(/not both/);
    expect(() => parseCliOptions(['--speed', '0'], {})).toThrow(/positive/);
    expect(() => parseCliOptions(['--fault', 'smoke'], {})).toThrow(/unknown fault "smoke"/);
    expect(() => parseCliOptions(['--valve', '6SN7GT#1'], {})).toThrow(/no published model/);
    expect(() => parseCliOptions(['--tcp', '70000'], {})).toThrow(/port number/);
    expect(() => parseCliOptions(['--colour', 'red'], {})).toThrow(/unknown argument/);
    expect(() => parseCliOptions(['--valve'], {})).toThrow(/needs a value/);
    expect(() => parseCliOptions(['--watchdog-ms', '10'], {})).toThrow(/at least 100/);
  });
});
