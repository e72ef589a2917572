/** Headers and attachments read from a raw RFC 822 message. */
export interface ParsedMessage {
  subject: string | null;
  from: string | null;
  to: string | null;
  messageId: string | null;
  attachments: { filename: string; contentType: string; content: Buffer }[];
}

/**
 * Reads what the development mail view needs from a raw message: top headers (unfolded, RFC
 * 2047 encoded words decoded) and the parts that carry a file name, base64 or plain. A small
 * reader suffices because the only sender is our own nodemailer; no full MIME parser is
 * installed.
 */
export function parseRawMessage(raw: string): ParsedMessage {
  const { headers, body } = splitHeaders(raw);
  const attachments: ParsedMessage['attachments'] = [];
  collectParts(headers, body, attachments);
  return {
    subject: headers.get('subject') ?? null,
    from: headers.get('from') ?? null,
    to: headers.get('to') ?? null,
    messageId: headers.get('message-id') ?? null,
    attachments,
  };
}

function splitHeaders(text: string): { headers: Map<string, string>; body: string } {
  const end = text.search(/\r?\n\r?\n/);
  const head = end < 0 ? text : text.slice(0, end);
  const body = end < 0 ? '' : text.slice(end).replace(/^\r?\n\r?\n/, '');
  const headers = new Map<string, string>();
  for (const line of head.replace(/\r?\n[ \t]+/g, ' ').split(/\r?\n/)) {
    const i = line.indexOf(':');
    if (i > 0)
      headers.set(line.slice(0, i).trim().toLowerCase(), decodeWords(line.slice(i + 1).trim()));
  }
  return { headers, body };
}

function collectParts(
  headers: Map<string, string>,
  body: string,
  out: ParsedMessage['attachments'],
): void {
  const type = headers.get('content-type') ?? 'text/plain';
  const boundary = /boundary="?([^";]+)"?/i.exec(type)?.[1];
  if (/^multipart\//i.test(type) && boundary) {
    const parts = body.split(`--${boundary}`).slice(1);
    for (const part of parts) {
      if (part.startsWith('--')) break;
      const { headers: h, body: b } = splitHeaders(part.replace(/^\r?\n/, ''));
      collectParts(h, b, out);
    }
    return;
  }
  const disposition = headers.get('content-disposition') ?? '';
  const filename = param(disposition, 'filename') ?? param(type, 'name');
  if (!filename) return;
  const encoding = (headers.get('content-transfer-encoding') ?? '').toLowerCase();
  const content =
    encoding === 'base64'
      ? Buffer.from(body.replace(/\s+/g, ''), 'base64')
      : Buffer.from(body.replace(/\r?\n$/, ''), 'utf8');
  out.push({ filename, contentType: type.split(';')[0].trim(), content });
}

function param(header: string, name: string): string | undefined {
  const m = new RegExp(`${name}="?([^";]+)"?`, 'i').exec(header);
  return m?.[1];
}

function decodeWords(value: string): string {
  return value.replace(
    /=\?([^?]+)\?([bq])\?([^?]*)\?=/gi,
    (_all, _charset, enc: string, text: string) =>
      enc.toLowerCase() === 'b'
        ? Buffer.from(text, 'base64').toString('utf8')
        : Buffer.from(
            text
              .replace(/_/g, ' ')
              .replace(/=([0-9a-f]{2})/gi, (_m, h: string) => String.fromCharCode(parseInt(h, 16))),
            'latin1',
          ).toString('utf8'),
  );
}
