import { checksum } from './checksum';

/** Longest frame accepted, in bytes from '$' to the last checksum digit. */
export const MAX_LINE_BYTES = 240;

/** Counters of what a line reader has seen; every dropped line is counted once, by its cause. */
export interface LineStats {
  /** Frames that passed framing and checksum. */
  accepted: number;
  /** Frames whose checksum did not match, or that had no checksum. */
  badChecksum: number;
  /** Frames longer than MAX_LINE_BYTES. */
  overlong: number;
  /** Frames cut short: a new '$' arrived before the line ended. */
  truncated: number;
  /** Frames with bytes outside printable ASCII. */
  badBytes: number;
  /** Bytes outside any frame (line noise, stray characters). */
  noiseBytes: number;
  /** Frames that passed the checksum but did not decode into a known message. */
  malformed: number;
}

/** A fresh set of zero counters. */
export function emptyStats(): LineStats {
  return { accepted: 0, badChecksum: 0, overlong: 0, truncated: 0, badBytes: 0, noiseBytes: 0, malformed: 0 };
}

/** Total frames dropped for any reason. */
export function droppedCount(s: LineStats): number {
  return s.badChecksum + s.overlong + s.truncated + s.badBytes + s.malformed;
}

/**
 * Incremental framer: feed it chunks as they arrive, in any split, and it returns the bodies of
 * the complete, checksum-valid frames. Everything else is dropped and counted, never returned.
 * A frame starts at '$' and ends at '\n' ('\r' before it is allowed); a '$' inside a frame
 * restarts framing, so a line cut short cannot merge with the next one.
 */
export class LineReader {
  readonly stats: LineStats = emptyStats();
  private buf = '';
  private inFrame = false;
  private overlong = false;

  /** Feeds a chunk (string or bytes) and returns the valid frame bodies it completed. */
  push(chunk: string | Uint8Array): string[] {
    const text = typeof chunk === 'string' ? chunk : latin1(chunk);
    const out: string[] = [];
    for (let i = 0; i < text.length; i++) {
      const c = text[i];
      if (c === '$') {
        if (this.inFrame) {
          if (this.overlong) this.stats.overlong++;
          else this.stats.truncated++;
        }
        this.inFrame = true;
        this.overlong = false;
        this.buf = '';
        continue;
      }
      if (!this.inFrame) {
        if (c !== '\n' && c !== '\r') this.stats.noiseBytes++;
        continue;
      }
      if (c === '\n') {
        this.inFrame = false;
        if (this.overlong) {
          this.stats.overlong++;
        } else {
          const body = this.check(this.buf.endsWith('\r') ? this.buf.slice(0, -1) : this.buf);
          if (body !== null) out.push(body);
        }
        this.buf = '';
        this.overlong = false;
        continue;
      }
      if (this.overlong) continue;
      this.buf += c;
      if (this.buf.length > MAX_LINE_BYTES) {
        this.overlong = true;
        this.buf = '';
      }
    }
    return out;
  }

  private check(line: string): string | null {
    for (let i = 0; i < line.length; i++) {
      const code = line.charCodeAt(i);
      if (code < 0x20 || code > 0x7e) {
        this.stats.badBytes++;
        return null;
      }
    }
    const star = line.lastIndexOf('*');
    if (star < 0 || star !== line.length - 3) {
      this.stats.badChecksum++;
      return null;
    }
    const body = line.slice(0, star);
    if (body.includes('*') || line.slice(star + 1) !== checksum(body)) {
      this.stats.badChecksum++;
      return null;
    }
    this.stats.accepted++;
    return body;
  }
}

function latin1(bytes: Uint8Array): string {
  let s = '';
  for (let i = 0; i < bytes.length; i++) s += String.fromCharCode(bytes[i]);
  return s;
}
