/**
 * NMEA-0183-style checksum: XOR of every byte between '$' and '*', as two upper-case hex digits.
 */
export function checksum(body: string): string {
  let x = 0;
  for (let i = 0; i < body.length; i++) x ^= body.charCodeAt(i);
  return x.toString(16).toUpperCase().padStart(2, '0');
}

/** Wraps a message body into one framed line: `$BODY*HH\r\n`. */
export function frame(body: string): string {
  return `$${body}*${checksum(body)}\r\n`;
}
