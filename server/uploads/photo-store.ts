import { randomUUID } from 'node:crypto';
import { mkdir, rm, writeFile } from 'node:fs/promises';
import path from 'node:path';
import sharp from 'sharp';
import { HttpError } from '../http/http-error';
import { detectImageType, type ImageType } from './image-type';

/** Longest side of a thumbnail, px. */
export const THUMB_PIXELS = 320;

/** Largest image sharp is allowed to decode, px (guards against decompression bombs). */
const MAX_INPUT_PIXELS = 50_000_000;

/** A photo checked and written to the uploads directory. */
export interface StoredPhoto {
  storedName: string;
  thumbName: string;
  type: ImageType;
  bytes: number;
  /** Pixels. */
  width: number;
  height: number;
}

/** Files of one kind under one directory, with names the hub generates. */
export class PhotoStore {
  constructor(private readonly dir: () => Promise<string>) {}

  /** Absolute path of a stored file; the name must be one this store generated. */
  async pathOf(name: string): Promise<string> {
    if (!/^[0-9a-f-]{36}(\.thumb)?\.(jpg|png|webp)$/.test(name)) {
      throw new Error(`not a stored name: ${name}`);
    }
    return path.join(await this.dir(), name);
  }

  /**
   * Checks that `buffer` is a JPEG, PNG or WebP image by its magic bytes and by decoding it,
   * then writes it and a thumbnail under generated names. Refuses (400, naming `field`)
   * anything else; writes nothing unless both files can be made.
   */
  async save(buffer: Buffer, field: string): Promise<StoredPhoto> {
    const type = detectImageType(buffer);
    if (!type) {
      throw new HttpError(415, 'not_an_image', `${field} is not a JPEG, PNG or WebP image`, {
        [field]: 'only JPEG, PNG or WebP images (checked by content)',
      });
    }
    let width: number;
    let height: number;
    let thumb: Buffer;
    try {
      const image = sharp(buffer, { limitInputPixels: MAX_INPUT_PIXELS, failOn: 'error' });
      const meta = await image.metadata();
      if (meta.format !== { jpg: 'jpeg', png: 'png', webp: 'webp' }[type.extension]) {
        throw new Error(`decodes as ${meta.format}`);
      }
      width = meta.width;
      height = meta.height;
      thumb = await image
        .rotate()
        .resize(THUMB_PIXELS, THUMB_PIXELS, { fit: 'inside', withoutEnlargement: true })
        .webp({ quality: 80 })
        .toBuffer();
    } catch {
      throw new HttpError(415, 'not_an_image', `${field} could not be read as an image`, {
        [field]: 'the image is damaged or not what its first bytes say',
      });
    }
    const id = randomUUID();
    const storedName = `${id}.${type.extension}`;
    const thumbName = `${id}.thumb.webp`;
    const dir = await this.dir();
    await mkdir(dir, { recursive: true });
    try {
      await writeFile(path.join(dir, storedName), buffer, { flag: 'wx' });
      await writeFile(path.join(dir, thumbName), thumb, { flag: 'wx' });
    } catch (error) {
      await this.remove([storedName, thumbName]);
      throw error;
    }
    return { storedName, thumbName, type, bytes: buffer.length, width, height };
  }

  /** Deletes stored files; names already gone are ignored. */
  async remove(names: readonly (string | null)[]): Promise<void> {
    for (const name of names) {
      if (name) await rm(await this.pathOf(name), { force: true });
    }
  }
}
