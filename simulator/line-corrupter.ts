import { SeededRandom } from './seeded-random';

/** Share of outgoing lines that get one bit flipped under the corrupt fault. */
export const CORRUPT_PROBABILITY = 0.05;

/**
 * Flips one bit in a share of outgoing lines, for testing the host's checksum handling. The
 * flip lands anywhere between '$' and the line end and stays 7-bit; the XOR checksum always
 * shows a single flipped bit.
 */
export class LineCorrupter {
  private readonly random: SeededRandom;
  /** Lines corrupted so far. */
  corrupted = 0;

  /** `seedText` names the random stream, so runs repeat. */
  constructor(seedText: string) {
    this.random = SeededRandom.fromText(seedText);
  }

  /** Returns the line, with one bit flipped for about CORRUPT_PROBABILITY of calls. */
  pass(line: string): string {
    if (this.random.next() >= CORRUPT_PROBABILITY) return line;
    this.corrupted++;
    const index = 1 + this.random.below(line.length - 3);
    const flipped = line.charCodeAt(index) ^ (1 << this.random.below(7));
    return line.slice(0, index) + String.fromCharCode(flipped) + line.slice(index + 1);
  }
}
