import type { Generated } from 'kysely';

/** Status of a match set: held for a buyer, sold, or given back to stock. */
export type MatchSetStatus = 'reserved' | 'sold' | 'released';

/** Row of `match_runs`: criteria and result of one matching run, as JSON. */
export interface MatchRunTable {
  id: Generated<number>;
  valve_type: string;
  criteria_json: string;
  result_json: string;
  created_by: number | null;
  created_at: string;
}

/** Row of `match_sets`; `code` is set right after the insert, from the id (MS-0007). */
export interface MatchSetTable {
  id: Generated<number>;
  code: string | null;
  valve_type: string;
  criteria_json: string;
  /** Spreads of the group and readings of every member, as JSON (MatchSetFigures). */
  figures_json: string;
  run_id: number | null;
  status: MatchSetStatus;
  created_by: number | null;
  created_at: string;
  updated_at: string;
}

/** Row of `match_set_members`: one valve of a set and the sweep it was matched on. */
export interface MatchSetMemberTable {
  match_set_id: number;
  position: number;
  valve_id: number;
  sweep_id: number | null;
}

/** Row of `match_set_mailings`: a report e-mail sent for a set. */
export interface MatchSetMailingTable {
  id: Generated<number>;
  match_set_id: number;
  to_address: string;
  message_id: string | null;
  sent_by: number | null;
  sent_at: string;
}

/** Row of `match_set_shares`: a buyer's read-only link; only the token's hash is kept. */
export interface MatchSetShareTable {
  id: Generated<number>;
  match_set_id: number;
  token_hash: string;
  expires_at: string;
  revoked_at: string | null;
  created_by: number | null;
  created_at: string;
}
