import { LineReader } from './line-reader';
import { decodeCommand, decodeDeviceMessage, type DeviceMessage, type HostCommand } from './messages';

/** Turns a byte stream from the tracer into device messages; bad lines are dropped and counted. */
export class DeviceStreamDecoder {
  readonly reader = new LineReader();

  /** Feeds a chunk and returns the messages it completed. */
  push(chunk: string | Uint8Array): DeviceMessage[] {
    const out: DeviceMessage[] = [];
    for (const body of this.reader.push(chunk)) {
      const m = decodeDeviceMessage(body);
      if (m) out.push(m);
      else this.reader.stats.malformed++;
    }
    return out;
  }
}

/** Turns a byte stream from the host into commands; bad lines are dropped and counted. */
export class CommandStreamDecoder {
  readonly reader = new LineReader();

  /** Feeds a chunk and returns the commands it completed. */
  push(chunk: string | Uint8Array): HostCommand[] {
    const out: HostCommand[] = [];
    for (const body of this.reader.push(chunk)) {
      const c = decodeCommand(body);
      if (c) out.push(c);
      else this.reader.stats.malformed++;
    }
    return out;
  }
}
