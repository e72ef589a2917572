import { readFile } from 'node:fs/promises';
import type { Request, Response } from 'express';
import type { z } from 'zod';
import type { AuditService } from '../audit/audit.service';
import type { AuthUser } from '../auth/auth-user';
import type { HubDb } from '../db/database';
import { HttpError, notFound } from '../http/http-error';
import { findValveRow } from '../valves/valve.repository';
import {
  deleteAttachment,
  findAttachment,
  insertAttachment,
  listAttachmentsOfValve,
  type AttachmentRecord,
} from './attachment.repository';
import type { PhotoStore } from './photo-store';
import type { photoViewSchema } from './photo.schemas';
import { readMultipart } from './upload-body';

/** Largest photo accepted, bytes (5 MiB). */
export const MAX_PHOTO_BYTES = 5 * 1024 * 1024;

/** Multipart field that carries the photo. */
export const PHOTO_FIELD = 'photo';

/** A photo as the API shows it. */
export type PhotoView = z.output<typeof photoViewSchema>;

function toPhotoView(r: AttachmentRecord): PhotoView {
  return {
    id: r.id,
    valveId: r.valve_id,
    originalName: r.original_name,
    mime: r.mime,
    bytes: r.bytes,
    width: r.width,
    height: r.height,
    uploadedBy: r.uploader,
    createdAt: r.created_at,
    url: `/api/photos/${r.id}`,
    thumbUrl: `/api/photos/${r.id}/thumb`,
  };
}

/**
 * The client's file name made fit to show: control characters out, at most 120 characters.
 * A name with a directory part (`../x.png`, `C:\x.png`) is refused rather than cut down: it is
 * never used as a path here, but a client that sends one is broken or probing.
 */
export function displayName(clientName: string): string {
  if (/[/\\]/.test(clientName) || /^\.+$/.test(clientName.trim())) {
    throw new HttpError(400, 'unsafe_file_name', 'the file name must not contain a path', {
      [PHOTO_FIELD]: 'the file name must not contain a path',
    });
  }
  // eslint-disable-next-line no-control-regex -- control characters are what is removed
  const clean = clientName.replace(/[\u0000-\u001f\u007f]/g, '').trim();
  return clean.slice(0, 120) || 'photo';
}

/** Photos of valve records: upload, list, read, delete. */
export type PhotoService = ReturnType<typeof createPhotoService>;

/** Builds the photo service. */
export function createPhotoService(props: { db: HubDb; audit: AuditService; store: PhotoStore }) {
  const { db, audit, store } = props;

  async function requirePhoto(id: number): Promise<AttachmentRecord> {
    const row = await findAttachment(db, id);
    if (!row) throw notFound('photo', id);
    return row;
  }

  return {
    /** Reads one photo from a multipart request and stores it with a thumbnail. */
    async upload(valveId: number, req: Request, res: Response, user: AuthUser) {
      const valve = await findValveRow(db, valveId);
      if (!valve) throw notFound('valve', valveId);
      const { file } = await readMultipart(req, res, PHOTO_FIELD, MAX_PHOTO_BYTES);
      if (!file) {
        throw new HttpError(400, 'file_missing', `no file in the field "${PHOTO_FIELD}"`, {
          [PHOTO_FIELD]: 'an image file is needed',
        });
      }
      const originalName = displayName(file.clientName);
      const stored = await store.save(file.buffer, PHOTO_FIELD);
      let id: number;
      try {
        id = await insertAttachment(db, {
          valve_id: valveId,
          kind: 'photo',
          stored_name: stored.storedName,
          thumb_name: stored.thumbName,
          original_name: originalName,
          mime: stored.type.mime,
          bytes: stored.bytes,
          width: stored.width,
          height: stored.height,
          created_by: user.id,
          created_at: new Date().toISOString(),
        });
      } catch (error) {
        await store.remove([stored.storedName, stored.thumbName]);
        throw error;
      }
      await audit.record(user, 'photo.upload', `valve:${valveId}`, {
        photoId: id,
        label: valve.label,
        originalName,
        bytes: stored.bytes,
      });
      return toPhotoView(await requirePhoto(id));
    },

    /** A valve's photos, oldest first. */
    async list(valveId: number): Promise<PhotoView[]> {
      if (!(await findValveRow(db, valveId))) throw notFound('valve', valveId);
      return (await listAttachmentsOfValve(db, valveId)).map(toPhotoView);
    },

    /** The bytes and media type of a photo or its thumbnail. */
    async content(id: number, which: 'full' | 'thumb'): Promise<{ mime: string; data: Buffer }> {
      const row = await requirePhoto(id);
      const name = which === 'thumb' ? (row.thumb_name ?? row.stored_name) : row.stored_name;
      const data = await readFile(await store.pathOf(name)).catch(() => {
        throw new HttpError(404, 'photo_file_missing', `the file of photo ${id} is missing`);
      });
      return { mime: which === 'thumb' && row.thumb_name ? 'image/webp' : row.mime, data };
    },

    /** Deletes a photo: the row first, then its files. */
    async remove(id: number, user: AuthUser): Promise<void> {
      const row = await requirePhoto(id);
      await deleteAttachment(db, id);
      await store.remove([row.stored_name, row.thumb_name]);
      await audit.record(user, 'photo.delete', `valve:${row.valve_id}`, {
        photoId: id,
        originalName: row.original_name,
      });
    },

    /** Files of a valve's photos, for deleting once the valve's rows are gone. */
    async filesOfValve(valveId: number): Promise<string[]> {
      const rows = await listAttachmentsOfValve(db, valveId);
      return rows.flatMap((r) => [r.stored_name, ...(r.thumb_name ? [r.thumb_name] : [])]);
    },

    /** Deletes stored files by name. */
    removeFiles: (names: readonly string[]) => store.remove(names),
  };
}
