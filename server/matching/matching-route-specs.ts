import { z } from 'zod';
import { idParams } from '../http/common-schemas';
import type { RouteKey, RouteSpec } from '../http/route-spec';
import { devMailAttachmentParams, devMailListQuery, devMailSchema } from '../mail/dev-mail.schemas';
import {
  createMatchSetBody,
  matchSetDetailSchema,
  matchReportSchema,
  matchSetListQuery,
  matchSetPage,
  sendReportBody,
  shareBody,
  shareParams,
  sharedMatchSetSchema,
  shareResponse,
  tokenParams,
} from './match-set.schemas';
import { matchRunBody, matchRunSchema, partnerListSchema, partnerQuery } from './matching.schemas';

/** Routes of matching, match sets, buyer links and the development mail view. */
export const MATCHING_ROUTES = {
  'POST /api/matching/runs': {
    minRole: 'technician',
    tag: 'matching',
    summary:
      'Group the stock of a type into matched pairs, quads or larger sets on their newest ' +
      'anode family; the run is kept',
    body: matchRunBody,
    response: matchRunSchema,
    status: 201,
  },
  'GET /api/matching/runs/:id': {
    minRole: 'viewer',
    tag: 'matching',
    summary: 'A kept matching run with its groups and left-over valves',
    params: idParams,
    response: matchRunSchema,
  },
  'GET /api/valves/:id/partners': {
    minRole: 'viewer',
    tag: 'matching',
    summary: 'In-stock valves of the same type ranked as partners for this one, nearest first',
    params: idParams,
    query: partnerQuery,
    response: partnerListSchema,
  },
  'GET /api/match-sets': {
    minRole: 'viewer',
    tag: 'match sets',
    summary: 'Match sets, newest first',
    query: matchSetListQuery,
    response: matchSetPage,
  },
  'POST /api/match-sets': {
    minRole: 'technician',
    tag: 'match sets',
    summary: 'Reserve a group of a run, or chosen valves, as a match set (409 if one is taken)',
    body: createMatchSetBody,
    response: matchSetDetailSchema,
    status: 201,
  },
  'GET /api/match-sets/:id': {
    minRole: 'viewer',
    tag: 'match sets',
    summary: 'A match set with its members, figures, mailings and links',
    params: idParams,
    response: matchSetDetailSchema,
  },
  'POST /api/match-sets/:id/release': {
    minRole: 'technician',
    tag: 'match sets',
    summary: "Give a reserved set's valves back to stock",
    params: idParams,
    response: matchSetDetailSchema,
  },
  'POST /api/match-sets/:id/sell': {
    minRole: 'technician',
    tag: 'match sets',
    summary: 'Mark a reserved set and its valves sold',
    params: idParams,
    response: matchSetDetailSchema,
  },
  'GET /api/match-sets/:id/report': {
    minRole: 'viewer',
    tag: 'match sets',
    summary:
      "The match report as the printable page shows it (the buyer's link shows the same shape)",
    params: idParams,
    response: matchReportSchema,
  },
  'GET /api/match-sets/:id/report.pdf': {
    minRole: 'viewer',
    tag: 'match sets',
    summary: 'The printable match report',
    params: idParams,
    produces: ['application/pdf'],
  },
  'POST /api/match-sets/:id/send-report': {
    minRole: 'technician',
    tag: 'match sets',
    summary: 'E-mail the match report as a PDF attachment',
    params: idParams,
    body: sendReportBody,
    response: z.object({ to: z.string(), at: z.string(), messageId: z.string() }),
  },
  'POST /api/match-sets/:id/share': {
    minRole: 'technician',
    tag: 'match sets',
    summary: "Make a buyer's read-only link (the token is shown once)",
    params: idParams,
    body: shareBody,
    response: shareResponse,
    status: 201,
  },
  'DELETE /api/match-sets/:id/share/:shareId': {
    minRole: 'technician',
    tag: 'match sets',
    summary: "Withdraw a buyer's link",
    params: shareParams,
    status: 204,
  },
  'GET /api/shared/match-sets/:token': {
    minRole: null,
    tag: 'shared',
    summary: "A match report through a buyer's link (no sign-in; 410 once expired or withdrawn)",
    params: tokenParams,
    response: sharedMatchSetSchema,
  },
  'GET /api/shared/match-sets/:token/report.pdf': {
    minRole: null,
    tag: 'shared',
    summary: "The match report PDF through a buyer's link",
    params: tokenParams,
    produces: ['application/pdf'],
  },
  'GET /api/dev-mail': {
    minRole: 'admin',
    tag: 'development',
    summary: 'Messages the development mail server received, newest first',
    query: devMailListQuery,
    response: z.array(devMailSchema),
  },
  'GET /api/dev-mail/:id/attachments/:n': {
    minRole: 'admin',
    tag: 'development',
    summary: 'One attachment of a received message, 0-based',
    params: devMailAttachmentParams,
    produces: ['application/octet-stream'],
  },
} as const satisfies Record<RouteKey, RouteSpec>;
