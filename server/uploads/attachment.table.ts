import type { Generated } from 'kysely';

/** Row of `attachments`: a file stored under DATA_DIR/uploads for a valve record. */
export interface AttachmentTable {
  id: Generated<number>;
  valve_id: number;
  kind: 'photo';
  /** Generated file name in the uploads directory; never the client's. */
  stored_name: string;
  /** Generated name of the thumbnail beside it. */
  thumb_name: string | null;
  /** The client's file name, sanitised, for display only. */
  original_name: string;
  /** Media type found from the content (magic bytes). */
  mime: string;
  bytes: number;
  /** Pixels. */
  width: number | null;
  height: number | null;
  created_by: number | null;
  created_at: string;
}
