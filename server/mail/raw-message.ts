/** Headers and attachments read from a raw RFC 822 message. */
export interface ParsedMessage {
  subject: string | null;
  from: string | null;
  to: string | null;
  messageId: string | null;
  /** The first text/plain part that is not an attachment, decoded; null if there is none. */
  text: string | null;
  attachments: { filename: string; contentType: string; content: Buffer }[];
}

/**
 * Reads what the development mail view needs from a raw message: top headers (unfolded, RFC
 * 2047 encoded words decoded), the first plain-text part and the parts that carry a file name
 * (base64, quoted-printable or plain). A small
 * reader suffices because the only sender is our own nodemailer; no full MIME parser is
 * installed.
 */
export function parseRawMessage(raw: string): ParsedMessage {
  const { headers, body } = splitHeaders(raw);
  const attachments: ParsedMessage['attachments'] = [];
  const texts: string[] = [];
  collectParts(headers, body, attachments, texts);
  return {
    subject: headers.get('subject') ?? null,
    from: headers.get('from') ?? null,
    to: headers.get('to') ?? null,
    messageId: headers.get('message-id') ?? null,
    text: texts[0] ?? null,
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
  texts: string[],
): void {
  const type = headers.get('content-type') ?? 'text/plain';
  const boundary = /boundary="?([^";]+)"?/i.exec(type)?.[1];
  if (/^multipart\//i.test(type) && boundary) {
    const parts = body.split(`--${boundary}`).slice(1);
    for (const part of parts) {
      if (part.startsWith('--')) break;
      const { headers: h, body: b } = splitHeaders(part.replace(/^\r?\n/, ''));
      collectParts(h, b, out, texts);
    }
    return;
  }
  const disposition = headers.get('content-disposition') ?? '';
  const filename = param(disposition, 'filename') ?? param(type, 'name');
  const encoding = (headers.get('content-transfer-encoding') ?? '').toLowerCase();
  const content = decodeBody(body, encoding);
  const contentType = type.split(';')[0].trim();
  if (filename) out.push({ filename, contentType, content });
  else if (contentType.toLowerCase() === 'text/plain') {
    texts.push(content.toString('utf8').replace(/\r\n/g, '\n'));
  }
}

function decodeBody(body: string, encoding: string): Buffer {
  if (encoding === 'base64') return Buffer.from(body.replace(/\s+/g, ''), 'base64');
  const text = body.replace(/\r?\n$/, '');
  if (encoding !== 'quoted-printable') return Buffer.from(text, 'utf8');
  // Soft line breaks join; =XX is one byte, so multi-byte UTF-8 survives.
  const src = Buffer.from(text.replace(/=\r?\n/g, ''), 'utf8');
  const bytes: number[] = [];
  const isHex = (b: number | undefined) =>
    b !== undefined && /[0-9a-f]/i.test(String.fromCharCode(b));
  for (let i = 0; i < src.length; i++) {
    if (src[i] === 0x3d && isHex(src[i + 1]) && isHex(src[i + 2])) {
      bytes.push(parseInt(src.toString('latin1', i + 1, i + 3), 16));
      i += 2;
    } else bytes.push(src[i]);
  }
  return Buffer.from(bytes);
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
