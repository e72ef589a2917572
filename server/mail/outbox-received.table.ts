import type { Generated } from 'kysely';

/** Row of `outbox_received`: a message the development mail server took in, raw RFC 822. */
export interface OutboxReceivedTable {
  id: Generated<number>;
  envelope_from: string | null;
  envelope_to_json: string;
  raw: string;
  received_at: string;
}
