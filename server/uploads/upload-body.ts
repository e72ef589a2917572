import express, { type Request, type Response } from 'express';
import multer, { MulterError } from 'multer';
import { HttpError } from '../http/http-error';

/** A file received in a request, kept in memory (uploads here are small). */
export interface ReceivedFile {
  /** The bytes. */
  buffer: Buffer;
  /** The client's file name as sent (untrusted; never used as a path). */
  clientName: string;
  /** The client's media type (untrusted). */
  clientMime: string;
}

/** A multipart or plain body: at most one file and the text fields beside it. */
export interface ReceivedBody {
  file: ReceivedFile | null;
  fields: Record<string, string>;
}

function run(middleware: express.RequestHandler, req: Request, res: Response): Promise<void> {
  return new Promise((resolve, reject) =>
    middleware(req, res, (error?: unknown) => (error ? reject(error) : resolve())),
  );
}

function tooLarge(field: string, maxBytes: number): HttpError {
  const mib = maxBytes / (1024 * 1024);
  return new HttpError(413, 'file_too_large', `${field} is larger than ${mib} MiB`, {
    [field]: `at most ${mib} MiB`,
  });
}

/**
 * Reads a multipart/form-data body with one file in `field` (and text fields), in memory,
 * refusing more than `maxBytes`, a second file or a file under another name. Client paths in
 * file names are kept as sent (preservePath) so that the caller can see and refuse them.
 */
export async function readMultipart(
  req: Request,
  res: Response,
  field: string,
  maxBytes: number,
): Promise<ReceivedBody> {
  const upload = multer({
    storage: multer.memoryStorage(),
    limits: { fileSize: maxBytes, files: 1, fields: 10, fieldSize: 4096, parts: 12 },
    preservePath: true,
    defParamCharset: 'utf8',
  }).single(field);
  try {
    await run(upload, req, res);
  } catch (error) {
    if (error instanceof MulterError) {
      if (error.code === 'LIMIT_FILE_SIZE') throw tooLarge(field, maxBytes);
      const name = error.field ?? field;
      throw new HttpError(400, 'bad_upload', `${error.message} (${name})`, {
        [name]: error.message,
      });
    }
    throw new HttpError(400, 'bad_upload', 'the multipart body could not be read', {
      [field]: 'the multipart body could not be read',
    });
  }
  const f = req.file;
  const fields: Record<string, string> = {};
  for (const [k, v] of Object.entries((req.body ?? {}) as Record<string, unknown>)) {
    if (typeof v === 'string') fields[k] = v;
  }
  return {
    file: f ? { buffer: f.buffer, clientName: f.originalname, clientMime: f.mimetype } : null,
    fields,
  };
}

/**
 * Reads a CSV file sent either as multipart/form-data (file in `field`) or as a text/csv (or
 * text/plain) body, at most `maxBytes`. Refuses other media types with 415 and bytes that are
 * not UTF-8 text with 400, naming `field`.
 */
export async function readCsvUpload(
  req: Request,
  res: Response,
  field: string,
  maxBytes: number,
): Promise<{ text: string; fields: Record<string, string> }> {
  let bytes: Buffer;
  let fields: Record<string, string> = {};
  if (req.is('multipart/form-data')) {
    const body = await readMultipart(req, res, field, maxBytes);
    if (!body.file) {
      throw new HttpError(400, 'file_missing', `no file in the field "${field}"`, {
        [field]: 'a CSV file is needed',
      });
    }
    bytes = body.file.buffer;
    fields = body.fields;
  } else if (req.is(['text/csv', 'text/plain'])) {
    const raw = express.raw({ type: () => true, limit: maxBytes });
    try {
      await run(raw, req, res);
    } catch (error) {
      if ((error as { type?: string }).type === 'entity.too.large') throw tooLarge(field, maxBytes);
      throw error;
    }
    bytes = Buffer.isBuffer(req.body) ? req.body : Buffer.alloc(0);
  } else {
    throw new HttpError(
      415,
      'unsupported_media_type',
      'send the CSV as multipart/form-data or as a text/csv body',
      { [field]: 'a CSV file is needed' },
    );
  }
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    throw new HttpError(400, 'not_csv', 'not a CSV file: it is not UTF-8 text (line 1)', {
      [field]: 'line 1: not UTF-8 text',
    });
  }
  return { text, fields };
}
