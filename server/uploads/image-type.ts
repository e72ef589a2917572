/** An image type Emberline stores, as found from a file's first bytes. */
export interface ImageType {
  /** Media type. */
  mime: 'image/jpeg' | 'image/png' | 'image/webp';
  /** File name extension, without the dot. */
  extension: 'jpg' | 'png' | 'webp';
}

const PNG = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];

function startsWith(bytes: Uint8Array, prefix: readonly number[], at = 0): boolean {
  return prefix.every((b, i) => bytes[at + i] === b);
}

function ascii(s: string): number[] {
  return [...s].map((c) => c.charCodeAt(0));
}

/**
 * The image type of a file from its magic bytes (JPEG, PNG, WebP), or null for anything else.
 * What the client claims (name, media type) is not consulted: it can say anything.
 */
export function detectImageType(bytes: Uint8Array): ImageType | null {
  if (startsWith(bytes, [0xff, 0xd8, 0xff])) return { mime: 'image/jpeg', extension: 'jpg' };
  if (startsWith(bytes, PNG)) return { mime: 'image/png', extension: 'png' };
  if (startsWith(bytes, ascii('RIFF')) && startsWith(bytes, ascii('WEBP'), 8)) {
    return { mime: 'image/webp', extension: 'webp' };
  }
  return null;
}
