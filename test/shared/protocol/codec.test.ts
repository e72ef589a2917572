import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { checksum, frame } from '../../../shared/protocol/checksum';
import { CHECK_FEATURES, ELECTRODE_PAIRS } from '../../../shared/protocol/check-plan';
import { CommandStreamDecoder, DeviceStreamDecoder } from '../../../shared/protocol/decoder';
import { droppedCount, LineReader, MAX_LINE_BYTES } from '../../../shared/protocol/line-reader';
import {
  decodeCommand,
  decodeDeviceMessage,
  encodeCommand,
  encodeDeviceMessage,
  type DeviceMessage,
  type HostCommand,
} from '../../../shared/protocol/messages';

const volts = fc.integer({ min: -50000, max: 50000 }).map((x) => x / 100);
const milliamps = fc.integer({ min: 0, max: 2500000 }).map((x) => x / 10000);
const point: fc.Arbitrary<DeviceMessage> = fc.record({
  type: fc.constant('point' as const),
  sweepId: fc.nat({ max: 1e9 }),
  seq: fc.nat({ max: 1e6 }),
  curve: fc.nat({ max: 40 }),
  vaVolts: volts.map(Math.abs),
  vg1Volts: volts,
  vg2Volts: volts.map(Math.abs),
  iaMilliamps: milliamps,
  ig2Milliamps: milliamps,
});
const otherMessage: fc.Arbitrary<DeviceMessage> = fc.oneof(
  fc.record({
    type: fc.constant('end' as const),
    sweepId: fc.nat({ max: 1e9 }),
    reason: fc.constantFrom('complete', 'aborted', 'limit', 'fault', 'link-lost' as const),
    count: fc.nat({ max: 1e6 }),
  }),
  fc.record({
    type: fc.constant('heartbeat' as const),
    uptimeMs: fc.nat({ max: 1e9 }),
    state: fc.constantFrom('idle', 'warming', 'sweeping', 'fault' as const),
    heaterVolts: fc.integer({ min: 0, max: 1320 }).map((x) => x / 100),
    highVoltage: fc.boolean(),
    warmupLeftSeconds: fc.nat({ max: 600 }),
  }),
  fc.record({
    type: fc.constant('ack' as const),
    command: fc.constantFrom('SWP', 'HTR', 'OFF'),
    sweepId: fc.nat({ max: 1e6 }),
  }),
);
const checkId = fc.nat({ max: 1e9 });
const flag = fc.boolean();
/** Messages of the optional extensions (EXT, LK, EM, GC). */
const extensionMessage: fc.Arbitrary<DeviceMessage> = fc.oneof(
  fc.record({
    type: fc.constant('extensions' as const),
    extensions: fc.record({
      features: fc.subarray([...CHECK_FEATURES]),
      gridFeedKiloohms: fc.integer({ min: 0, max: 100000 }).map((x) => x / 10),
      leakageMaxVolts: fc.integer({ min: 0, max: 10000 }).map((x) => x / 10),
    }),
  }),
  fc.record({
    type: fc.constant('leakage' as const),
    checkId,
    pair: fc.constantFrom(...ELECTRODE_PAIRS),
    volts: fc.integer({ min: 0, max: 2000 }).map((x) => x / 10),
    microamps: fc.integer({ min: 0, max: 5000000 }).map((x) => x / 10000),
    overRange: flag,
  }),
  fc.record({
    type: fc.constant('emission' as const),
    checkId,
    vaVolts: volts.map(Math.abs),
    milliamps,
    overRange: flag,
  }),
  fc.record({
    type: fc.constant('grid-current' as const),
    checkId,
    vaVolts: volts.map(Math.abs),
    vg1Volts: fc.integer({ min: -100000, max: 0 }).map((x) => x / 1000),
    vg2Volts: volts.map(Math.abs),
    iaMilliamps: milliamps,
    ig1Microamps: fc.integer({ min: -10000000, max: 10000000 }).map((x) => x / 10000),
    gridKiloohms: fc.integer({ min: 0, max: 100000 }).map((x) => x / 10),
  }),
);
const message = fc.oneof(
  { weight: 4, arbitrary: point },
  { weight: 1, arbitrary: otherMessage },
  { weight: 1, arbitrary: extensionMessage },
);
const centivolts = (min: number, max: number) =>
  fc.integer({ min: min * 100, max: max * 100 }).map((x) => x / 100);
const timing = { warmupSeconds: fc.nat({ max: 600 }), settleMs: fc.nat({ max: 10000 }) };
/** Commands of the optional extensions (EXT, LKG, EMI, GAS). */
const extensionCommand: fc.Arbitrary<HostCommand> = fc.oneof(
  fc.constant({ type: 'extensions' as const }),
  fc.record({
    type: fc.constant('leakage' as const),
    checkId,
    plan: fc.record({
      heaterVolts: centivolts(0, 13.2),
      ...timing,
      pairs: fc
        .shuffledSubarray([...ELECTRODE_PAIRS], { minLength: 1 })
        .chain((pairs) =>
          fc.tuple(
            ...pairs.map((pair) =>
              fc.integer({ min: 0, max: 2000 }).map((v) => ({ pair, volts: v / 10 })),
            ),
          ),
        ),
    }),
  }),
  fc.record({
    type: fc.constant('emission' as const),
    checkId,
    plan: fc.record({
      vaVolts: centivolts(0, 500),
      heaterVolts: centivolts(0, 13.2),
      iaTripMilliamps: centivolts(0, 250),
      paMaxWatts: centivolts(0, 50),
      ...timing,
    }),
  }),
  fc.record({
    type: fc.constant('grid-current' as const),
    checkId,
    plan: fc.record({
      vaVolts: centivolts(0, 500),
      vg1Volts: centivolts(-100, 0),
      vg2Volts: centivolts(0, 450),
      heaterVolts: centivolts(0, 13.2),
      iaTripMilliamps: centivolts(0, 250),
      paMaxWatts: centivolts(0, 50),
      ...timing,
    }),
  }),
);
const stream = fc.array(message, { minLength: 1, maxLength: 40 });

function wire(messages: DeviceMessage[]): string {
  return messages.map((m) => frame(encodeDeviceMessage(m))).join('');
}

/** Cuts a string at the given fractional positions into chunks. */
function chunk(text: string, cuts: number[]): string[] {
  const at = [...new Set(cuts.map((c) => Math.floor(c * text.length)))].sort((a, b) => a - b);
  const out: string[] = [];
  let last = 0;
  for (const i of at) {
    out.push(text.slice(last, i));
    last = i;
  }
  out.push(text.slice(last));
  return out;
}

function decodeAll(chunks: (string | Uint8Array)[]): {
  messages: DeviceMessage[];
  decoder: DeviceStreamDecoder;
} {
  const decoder = new DeviceStreamDecoder();
  const messages = chunks.flatMap((c) => decoder.push(c));
  return { messages, decoder };
}

describe('wire protocol codec', () => {
  it('computes the NMEA-style XOR checksum of the body', () => {
    // XOR of 'K' 0x4B, 'A' 0x41, 'L' 0x4C = 0x46.
    expect(checksum('KAL')).toBe('46');
    expect(frame('KAL')).toBe('$KAL*46\r\n');
  });

  it('round-trips every device message through encode and decode', () => {
    fc.assert(
      fc.property(message, (m) => {
        expect(decodeDeviceMessage(encodeDeviceMessage(m))).toEqual(m);
      }),
    );
  });

  it('round-trips a sweep command with its plan', () => {
    const command: HostCommand = {
      type: 'sweep',
      sweepId: 17,
      plan: {
        kind: 'anode',
        vaStartVolts: 0,
        vaStopVolts: 300,
        vaStepVolts: 10,
        vg1Volts: [0, -0.5, -1, -1.5],
        vg2Volts: 0,
        heaterVolts: 12.6,
        iaMaxMilliamps: 5,
        paMaxWatts: 0.75,
        iaTripMilliamps: 7.5,
        warmupSeconds: 20,
        settleMs: 2,
      },
    };
    expect(decodeCommand(encodeCommand(command))).toEqual(command);
  });

  it('sends section 2 as a 15th SWP field and keeps section 1 to the core 14', () => {
    const plan = {
      kind: 'anode' as const,
      vaStartVolts: 0,
      vaStopVolts: 300,
      vaStepVolts: 10,
      vg1Volts: [0, -1],
      vg2Volts: 0,
      heaterVolts: 12.6,
      iaMaxMilliamps: 5,
      paMaxWatts: 0.75,
      iaTripMilliamps: 7.5,
      warmupSeconds: 20,
      settleMs: 2,
    };
    const second: HostCommand = { type: 'sweep', sweepId: 18, plan: { ...plan, section: 2 } };
    expect(encodeCommand(second)).toBe('SWP,18,A,0,300,10,0,12.6,5,0.75,7.5,20,2,0;-1,2');
    expect(decodeCommand(encodeCommand(second))).toEqual(second);
    const first = encodeCommand({ type: 'sweep', sweepId: 19, plan: { ...plan, section: 1 } });
    expect(first.split(',')).toHaveLength(14);
    expect(decodeCommand(first)).toEqual({ type: 'sweep', sweepId: 19, plan });
    expect(decodeCommand('SWP,18,A,0,300,10,0,12.6,5,0.75,7.5,20,2,0;-1,3')).toBeNull();
  });

  it('parses a valid stream identically however it is split into chunks', () => {
    fc.assert(
      fc.property(
        stream,
        fc.array(fc.double({ min: 0, max: 1, noNaN: true }), { maxLength: 30 }),
        (messages, cuts) => {
          const text = wire(messages);
          const whole = decodeAll([text]).messages;
          const split = decodeAll(chunk(text, cuts));
          expect(whole).toEqual(messages);
          expect(split.messages).toEqual(messages);
          expect(droppedCount(split.decoder.reader.stats)).toBe(0);
        },
      ),
    );
  });

  it('accepts bytes as well as strings, and LF as well as CRLF line ends', () => {
    const m: DeviceMessage = { type: 'end', sweepId: 3, reason: 'complete', count: 93 };
    const text = frame(encodeDeviceMessage(m)).replace('\r\n', '\n');
    expect(decodeAll([new TextEncoder().encode(text)]).messages).toEqual([m]);
  });

  it('rejects and counts a line with any one corrupted byte, and never parses it as a point', () => {
    fc.assert(
      fc.property(stream, fc.nat(), fc.integer({ min: 1, max: 255 }), (messages, where, flip) => {
        const text = wire(messages);
        const lines = text
          .split('\n')
          .slice(0, -1)
          .map((l) => l + '\n');
        const target = where % lines.length;
        const line = lines[target];
        // Corrupt one byte of the frame itself ('$' .. last checksum digit), not the line end.
        const pos = where % (line.length - 2);
        const corrupted =
          line.slice(0, pos) +
          String.fromCharCode(line.charCodeAt(pos) ^ flip) +
          line.slice(pos + 1);
        lines[target] = corrupted;
        const { messages: got, decoder } = decodeAll(lines);
        const expected = messages.filter((_, i) => i !== target);
        expect(got).toEqual(expected);
        expect(
          droppedCount(decoder.reader.stats) + decoder.reader.stats.noiseBytes,
        ).toBeGreaterThan(0);
      }),
      { numRuns: 300 },
    );
  });

  it('rejects and counts a truncated line without losing the line after it', () => {
    fc.assert(
      fc.property(
        stream,
        fc.nat(),
        fc.double({ min: 0, max: 0.999, noNaN: true }),
        (messages, where, keep) => {
          const lines = messages.map((m) => frame(encodeDeviceMessage(m)));
          const target = where % lines.length;
          const full = lines[target];
          // Cut the frame short anywhere before its line end: the rest of it never arrives.
          lines[target] = full.slice(0, 1 + Math.floor(keep * (full.length - 3)));
          const { messages: got, decoder } = decodeAll([lines.join('')]);
          const expected = messages.filter((_, i) => i !== target);
          if (target === lines.length - 1) {
            // A frame cut at the very end of the stream is still waiting for its end: not emitted.
            expect(got).toEqual(expected);
          } else {
            expect(got).toEqual(expected);
            expect(decoder.reader.stats.truncated).toBe(1);
          }
        },
      ),
      { numRuns: 300 },
    );
  });

  it('rejects and counts an over-long line, then reads on', () => {
    const good: DeviceMessage = { type: 'end', sweepId: 1, reason: 'complete', count: 1 };
    const longBody = 'PT,' + '1'.repeat(MAX_LINE_BYTES + 10);
    const reader = new LineReader();
    const bodies = reader.push(frame(longBody) + frame(encodeDeviceMessage(good)));
    expect(bodies).toEqual([encodeDeviceMessage(good)]);
    expect(reader.stats.overlong).toBe(1);
  });

  it('counts a checksum-valid line that is not a known message as malformed', () => {
    const decoder = new DeviceStreamDecoder();
    expect(
      decoder.push(frame('PT,1,2,3') + frame('XYZ,1') + frame('PT,1,2,0,10,-1,0,abc,0')),
    ).toEqual([]);
    expect(decoder.reader.stats.malformed).toBe(3);
  });

  it('ignores line noise between frames and counts it', () => {
    const m: DeviceMessage = { type: 'end', sweepId: 9, reason: 'limit', count: 4 };
    const { messages, decoder } = decodeAll(['\x00\xffgarbage' + frame(encodeDeviceMessage(m))]);
    expect(messages).toEqual([m]);
    expect(decoder.reader.stats.noiseBytes).toBe(9);
  });
  it('round-trips every extension command through encode and decode', () => {
    fc.assert(
      fc.property(extensionCommand, (c) => {
        const body = encodeCommand(c);
        expect(body.length).toBeLessThanOrEqual(MAX_LINE_BYTES);
        expect(decodeCommand(body)).toEqual(c);
      }),
    );
  });

  it('writes the extension lines as PROTOCOL.md shows them', () => {
    const leakage: HostCommand = {
      type: 'leakage',
      checkId: 41,
      plan: {
        heaterVolts: 12.6,
        warmupSeconds: 20,
        settleMs: 200,
        pairs: [
          { pair: 'heater-cathode', volts: 100 },
          { pair: 'grid1-cathode', volts: 100 },
          { pair: 'grid1-anode', volts: 100 },
          { pair: 'anode-cathode', volts: 100 },
        ],
      },
    };
    expect(encodeCommand(leakage)).toBe('LKG,41,12.6,20,200,HK;G1K;G1A;AK,100;100;100;100');
    expect(
      encodeDeviceMessage({
        type: 'extensions',
        extensions: {
          features: ['leakage', 'emission', 'grid-current'],
          gridFeedKiloohms: 47,
          leakageMaxVolts: 200,
        },
      }),
    ).toBe('EXT,LKG;EMI;GAS,47,200');
    const short: DeviceMessage = {
      type: 'leakage',
      checkId: 41,
      pair: 'anode-cathode',
      volts: 100,
      microamps: 500,
      overRange: true,
    };
    expect(encodeDeviceMessage(short)).toBe('LK,41,AK,100,500,1');
    expect(decodeDeviceMessage('GC,42,250,-2,0,1.0132,-0.6214,47')).toEqual({
      type: 'grid-current',
      checkId: 42,
      vaVolts: 250,
      vg1Volts: -2,
      vg2Volts: 0,
      iaMilliamps: 1.0132,
      ig1Microamps: -0.6214,
      gridKiloohms: 47,
    });
  });

  it('skips feature codes it does not know, so a newer tracer still announces the known ones', () => {
    expect(decodeDeviceMessage('EXT,XYZ;GAS;Q9,47,200')).toEqual({
      type: 'extensions',
      extensions: { features: ['grid-current'], gridFeedKiloohms: 47, leakageMaxVolts: 200 },
    });
    expect(decodeDeviceMessage('EXT,,0,0')).toEqual({
      type: 'extensions',
      extensions: { features: [], gridFeedKiloohms: 0, leakageMaxVolts: 0 },
    });
  });

  it('refuses a leakage command whose pair and voltage lists disagree or repeat a pair', () => {
    expect(decodeCommand('LKG,1,12.6,20,200,HK;AK,100')).toBeNull();
    expect(decodeCommand('LKG,1,12.6,20,200,HK;HK,100;100')).toBeNull();
    expect(decodeCommand('LKG,1,12.6,20,200,HK;XX,100;100')).toBeNull();
    expect(decodeCommand('LKG,1,12.6,20,200,,')).toBeNull();
    expect(decodeDeviceMessage('LK,1,G3K,100,0.1,0')).toBeNull();
  });

  it('rejects a command line with any one corrupted byte, and never acts on it', () => {
    fc.assert(
      fc.property(
        fc.array(extensionCommand, { minLength: 1, maxLength: 20 }),
        fc.nat(),
        fc.integer({ min: 1, max: 255 }),
        (commands, where, flip) => {
          const lines = commands.map((c) => frame(encodeCommand(c)));
          const target = where % lines.length;
          const line = lines[target];
          const pos = where % (line.length - 2);
          lines[target] =
            line.slice(0, pos) +
            String.fromCharCode(line.charCodeAt(pos) ^ flip) +
            line.slice(pos + 1);
          const decoder = new CommandStreamDecoder();
          const got = lines.flatMap((l) => decoder.push(l));
          expect(got).toEqual(commands.filter((_, i) => i !== target));
        },
      ),
      { numRuns: 300 },
    );
  });
});
