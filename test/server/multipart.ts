import { randomBytes } from 'node:crypto';

/** A text field or a file of a multipart/form-data body. */
export type Part =
  | { name: string; value: string }
  | { name: string; filename: string; contentType: string; data: Buffer };

/**
 * Builds a multipart/form-data body by hand, so that tests can send what a browser would not:
 * a file name with a path in it, a media type that lies about the content.
 */
export function multipart(parts: readonly Part[]): { body: Buffer; contentType: string } {
  const boundary = `----emberline-test-${randomBytes(8).toString('hex')}`;
  const chunks: Buffer[] = [];
  for (const p of parts) {
    const head =
      'data' in p
        ? `Content-Disposition: form-data; name="${p.name}"; filename="${p.filename}"\r\n` +
          `Content-Type: ${p.contentType}\r\n`
        : `Content-Disposition: form-data; name="${p.name}"\r\n`;
    chunks.push(Buffer.from(`--${boundary}\r\n${head}\r\n`));
    chunks.push('data' in p ? p.data : Buffer.from(p.value));
    chunks.push(Buffer.from('\r\n'));
  }
  chunks.push(Buffer.from(`--${boundary}--\r\n`));
  return { body: Buffer.concat(chunks), contentType: `multipart/form-data; boundary=${boundary}` };
}
