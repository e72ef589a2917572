import type { Test } from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { VALVE_TYPES } from '../../../shared/catalog/valve-types';
import { readingEndsCurve } from '../../../shared/domain/plan-check';
import { anodeSteps, type SweepPlan, type SweepPoint } from '../../../shared/domain/sweep';
import { korenTriodeIa, type KorenTriodeParams } from '../../../shared/physics/koren';
import { splitRouteKey } from '../../../server/http/route-spec';
import { ROUTES } from '../../../server/route-table';
import { smallTriodePlan, startTestHub, type TestHub } from '../test-hub';
import { clearDemoSweeps } from '../demo/clear-demo-sweeps';

/** Koren's published 12AX7 set (Glass Audio 8(5), 1996), as the catalog carries it. */
const KOREN_12AX7 = VALVE_TYPES.find((t) => t.designation === '12AX7')!.model!
  .params as KorenTriodeParams;

/** A 12AX7 family around the reference point (250 V, -2 V), in half-volt grid steps. */
const PLAN: SweepPlan = smallTriodePlan({
  vaStopVolts: 300,
  vaStepVolts: 10,
  vg1Volts: [0, -0.5, -1, -1.5, -2, -2.5, -3, -3.5, -4],
});

/** Readings of a valve that follows the Koren model with KG1 scaled by kg1Factor. */
function family(kg1Factor: number): SweepPoint[] {
  const params = { ...KOREN_12AX7, kg1: KOREN_12AX7.kg1 * kg1Factor };
  const points: SweepPoint[] = [];
  PLAN.vg1Volts.forEach((vg1, curve) => {
    for (const va of anodeSteps(PLAN)) {
      const ia = korenTriodeIa(params, va, vg1);
      points.push({
        seq: points.length,
        curve,
        vaVolts: va,
        vg1Volts: vg1,
        vg2Volts: 0,
        iaMilliamps: ia,
        ig2Milliamps: 0,
      });
      if (readingEndsCurve(PLAN, va, ia)) break;
    }
  });
  return points;
}

/** Four valves within about 2 % of each other: the quad any good grouping must find. */
const PLANTED = [1.0, 1.012, 0.992, 1.006];
/** Four weaker valves, about 13 % apart: a group of their own, outside the tolerance. */
const SCATTERED = [1.3, 1.36, 1.42, 1.48];

describe('matching runs and match sets', () => {
  let hub: TestHub;
  let tech: string;
  let admin: string;
  let viewer: string;
  const planted: number[] = [];
  const scattered: number[] = [];
  let runId: number;
  let setId: number;
  let code: string;

  const as = (token: string) => ({
    get: (url: string) => hub.api.get(url).set('authorization', `Bearer ${token}`),
    post: (url: string, body: object = {}) =>
      hub.api.post(url).set('authorization', `Bearer ${token}`).send(body),
    delete: (url: string) => hub.api.delete(url).set('authorization', `Bearer ${token}`),
  });

  async function valveWithSweep(kg1Factor: number): Promise<number> {
    const id = (await as(tech).post('/api/valves', { type: '12AX7' }).expect(201)).body
      .id as number;
    const db = hub.services.db;
    const bench = await db.selectFrom('benches').select('id').executeTakeFirstOrThrow();
    const user = await db
      .selectFrom('users')
      .select('id')
      .where('username', '=', 'tech')
      .executeTakeFirstOrThrow();
    const points = family(kg1Factor);
    const at = new Date().toISOString();
    const { id: sweepId } = await db
      .insertInto('sweeps')
      .values({
        bench_id: bench.id,
        valve_type: '12AX7',
        valve_label: null,
        plan_json: JSON.stringify(PLAN),
        operator_id: user.id,
        status: 'complete',
        end_reason: 'complete',
        end_message: null,
        override_by: null,
        reported_count: points.length,
        point_count: points.length,
        created_at: at,
        started_at: at,
        ended_at: at,
        valve_id: id,
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    await db
      .insertInto('sweep_points')
      .values(
        points.map((p) => ({
          sweep_id: sweepId,
          seq: p.seq,
          curve: p.curve,
          va_volts: p.vaVolts,
          vg1_volts: p.vg1Volts,
          vg2_volts: p.vg2Volts,
          ia_milliamps: p.iaMilliamps,
          ig2_milliamps: p.ig2Milliamps,
        })),
      )
      .execute();
    return id;
  }

  beforeAll(async () => {
    hub = await startTestHub({ devSmtpPort: 0 });
    // These tests assume stock without sweeps; the demo's sweeps are tested on their own.
    await clearDemoSweeps(hub);
    [tech, admin, viewer] = await Promise.all([
      hub.token('tech'),
      hub.token('admin'),
      hub.token('viewer'),
    ]);
    // Interleaved, so the quad is not simply the first four records.
    for (let i = 0; i < 4; i++) {
      scattered.push(await valveWithSweep(SCATTERED[i]));
      planted.push(await valveWithSweep(PLANTED[i]));
    }
  });
  afterAll(async () => {
    await hub.close();
  });

  it('finds the planted quad as the best group of the stock', async () => {
    const res = await as(tech)
      .post('/api/matching/runs', { valveType: '12AX7', groupSize: 4 })
      .expect(201);
    runId = res.body.id;
    expect(res.body.poolSize).toBe(8);
    const best = res.body.groups[0];
    expect(best.members.map((m: { valveId: number }) => m.valveId).sort()).toEqual(
      [...planted].sort(),
    );
    expect(best.acceptable).toBe(true);
    expect(res.body.groups[1].acceptable).toBe(false);
    expect(res.body.metricDescription).toMatch(/common practice/);
    expect(res.body.criteria.tolerancePercent).toBe(5);
    const again = await as(viewer).get(`/api/matching/runs/${runId}`).expect(200);
    expect(again.body.groups).toEqual(res.body.groups);
  });

  it('ranks the quad mates first as partners of one of its valves', async () => {
    const res = await as(viewer).get(`/api/valves/${planted[0]}/partners?limit=5`).expect(200);
    const ids = res.body.partners.map((p: { valveId: number }) => p.valveId);
    expect(ids).toHaveLength(5);
    expect(ids.slice(0, 3).sort()).toEqual(planted.slice(1).sort());
    expect(res.body.partners[0].withinTolerance).toBe(true);
  });

  it('lets no viewer run matching or reserve a set', async () => {
    await as(viewer).post('/api/matching/runs', { valveType: '12AX7', groupSize: 2 }).expect(403);
    await as(viewer).post('/api/match-sets', { runId: 1, groupIndex: 0 }).expect(403);
  });

  it('reserves a group of a run, marking and auditing every member', async () => {
    const res = await as(tech).post('/api/match-sets', { runId, groupIndex: 0 }).expect(201);
    setId = res.body.id;
    code = res.body.code;
    expect(code).toMatch(/^MS-\d{4}$/);
    expect(res.body.status).toBe('reserved');
    expect(res.body.members).toHaveLength(4);
    expect(res.body.figures.acceptable).toBe(true);
    expect(res.body.members[0].bench).toBe('Bench A');
    expect(res.body.members[0].conditions.vaStopVolts).toBe(300);
    expect(res.body.members[0].readings[0].iaMilliamps).toBeGreaterThan(0);
    for (const id of planted) {
      expect((await as(viewer).get(`/api/valves/${id}`).expect(200)).body.status).toBe('reserved');
    }
    const audit = await as(admin).get('/api/audit?action=valve.reserve&pageSize=100').expect(200);
    const subjects = audit.body.items.map((e: { subject: string }) => e.subject).sort();
    expect(subjects).toEqual(planted.map((id) => `valve:${id}`).sort());
    const list = await as(viewer).get('/api/match-sets').expect(200);
    expect(list.body.items[0]).toMatchObject({ id: setId, code, memberCount: 4 });
  });

  it('gives a signed-in reader the report with every curve, figure and caution', async () => {
    const res = await as(viewer).get(`/api/match-sets/${setId}/report`).expect(200);
    const r = res.body;
    expect(r).toMatchObject({ code, valveType: '12AX7', status: 'reserved' });
    expect(r.workshop.length).toBeGreaterThan(0);
    expect(r.members.map((m: { valveId: number }) => m.valveId).sort()).toEqual(
      [...planted].sort(),
    );
    for (const m of r.members) {
      expect(m).not.toHaveProperty('status');
      expect(m.curves.map((c: { vg1Volts: number }) => c.vg1Volts)).toEqual(PLAN.vg1Volts);
      expect(m.conditions).toMatchObject({ vaStepVolts: 10, vg1Volts: PLAN.vg1Volts });
    }
    // The downsampled curve keeps its ends: the first and last measured points of curve 0.
    const first = family(PLANTED[0]).filter((p) => p.curve === 0);
    const own = r.members.find((m: { valveId: number }) => m.valveId === planted[0]);
    expect(own.curves[0].points[0]).toEqual([first[0].vaVolts, first[0].iaMilliamps]);
    expect(own.curves[0].points.at(-1)).toEqual([first.at(-1)!.vaVolts, first.at(-1)!.iaMilliamps]);
    expect(r.figures.tolerancePercent).toBe(5);
    expect(r.toleranceNote).toMatch(/common practice/);
    expect(r.cautions.join(' ')).toMatch(/local codes and licensed practice/);
    expect(JSON.stringify(r)).not.toMatch(/"createdBy"|"mailings"|"shares"/);
    await hub.api.get(`/api/match-sets/${setId}/report`).expect(401);
    await as(viewer).get('/api/match-sets/99999/report').expect(404);
  });

  it('refuses to reserve a valve that is already reserved', async () => {
    const res = await as(tech)
      .post('/api/match-sets', { valveIds: [planted[0], scattered[0]], valveType: '12AX7' })
      .expect(409);
    expect(res.body.error.code).toBe('valve_unavailable');
    expect((await as(viewer).get(`/api/valves/${scattered[0]}`)).body.status).toBe('in-stock');
  });

  it('prints a PDF report that names the set', async () => {
    const res = await download(as(viewer).get(`/api/match-sets/${setId}/report.pdf`)).expect(200);
    expect(res.headers['content-type']).toMatch(/application\/pdf/);
    const pdf = res.body as Buffer;
    expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    expect(pdfTitle(pdf)).toBe(`Match report ${code}`);
  });

  it('mails the report to the local mail server with the PDF attached', async () => {
    const sent = await as(tech)
      .post(`/api/match-sets/${setId}/send-report`, {
        to: 'buyer@example.test',
        message: 'Your quad.',
      })
      .expect(200);
    expect(sent.body.messageId).toMatch(/@/);
    await as(tech).get('/api/dev-mail').expect(403);
    const inbox = await as(admin).get('/api/dev-mail').expect(200);
    const mail = inbox.body[0];
    expect(mail.envelopeTo).toEqual(['buyer@example.test']);
    expect(mail.subject).toContain(code);
    expect(mail.messageId).toBe(sent.body.messageId);
    expect(mail.attachments).toHaveLength(1);
    expect(mail.attachments[0].filename).toBe(`match-report-${code}.pdf`);
    expect(mail.textPreview).toMatch(/^Your quad\.\n/);
    expect(mail.textPreview).toContain(`4 x 12AX7`);
    const file = await download(as(admin).get(`/api/dev-mail/${mail.id}/attachments/0`)).expect(
      200,
    );
    expect((file.body as Buffer).subarray(0, 5).toString('latin1')).toBe('%PDF-');
    const detail = await as(viewer).get(`/api/match-sets/${setId}`).expect(200);
    expect(detail.body.mailings).toMatchObject([{ to: 'buyer@example.test', by: 'tech' }]);
    const audit = await as(admin).get('/api/audit?action=match-set.send-report').expect(200);
    expect(audit.body.items[0].subject).toBe(`match-set:${setId}`);
  });

  it('opens a buyer link signed out, and the link opens nothing else', async () => {
    const share = await as(tech)
      .post(`/api/match-sets/${setId}/share`, { expiresInDays: 7 })
      .expect(201);
    const { token } = share.body;
    const origin = new URL(share.body.url).origin;
    expect(share.body.url).toBe(`${origin}/shared/${token}`);
    expect(share.body.reportUrl).toBe(`${origin}/api/shared/match-sets/${token}/report.pdf`);
    const view = await hub.api.get(`/api/shared/match-sets/${token}`).expect(200);
    expect(view.body.code).toBe(code);
    expect(view.body.members).toHaveLength(4);
    expect(view.body.expiresAt).toBe(share.body.expiresAt);
    const curve = view.body.members[0].curves[0];
    expect(curve.points.length).toBeGreaterThan(2);
    expect(curve.points.length).toBeLessThanOrEqual(41);
    expect(view.body.cautions.join(' ')).toMatch(/high voltages/);
    expect(view.body.notes.join(' ')).toMatch(/What was measured/);
    const { expiresAt: _, ...report } = view.body;
    expect((await as(viewer).get(`/api/match-sets/${setId}/report`).expect(200)).body).toEqual(
      report,
    );
    const pdf = await download(hub.api.get(`/api/shared/match-sets/${token}/report.pdf`)).expect(
      200,
    );
    expect((pdf.body as Buffer).subarray(0, 5).toString('latin1')).toBe('%PDF-');
    for (const url of [
      `/api/match-sets/${setId}`,
      '/api/valves',
      '/api/auth/me',
      '/api/dev-mail',
    ]) {
      await as(token).get(url).expect(401);
      await hub.api.get(`${url}?token=${token}`).expect(401);
    }
    await hub.api.get(`/api/shared/match-sets/${'x'.repeat(32)}`).expect(404);
    await as(tech).delete(`/api/match-sets/${setId}/share/${share.body.id}`).expect(204);
    expect((await hub.api.get(`/api/shared/match-sets/${token}`).expect(410)).body.error.code).toBe(
      'share_gone',
    );
  });

  it('turns a buyer token away from every route that needs a sign-in', async () => {
    const share = await as(tech).post(`/api/match-sets/${setId}/share`, { expiresInDays: 7 });
    const { token } = share.body;
    const guarded = Object.entries(ROUTES).filter(([, spec]) => spec.minRole !== null);
    expect(guarded.length).toBeGreaterThan(40);
    for (const [key] of guarded) {
      const [method, route] = splitRouteKey(key as keyof typeof ROUTES);
      const url = route.replace(/:[A-Za-z]+/g, String(setId));
      const res = await hub.api[method](url).set('authorization', `Bearer ${token}`).send({});
      expect(res.status, key).toBe(401);
    }
  });

  it('refuses an expired buyer link', async () => {
    const share = await as(tech)
      .post(`/api/match-sets/${setId}/share`, { expiresInDays: 1 })
      .expect(201);
    await hub.services.db
      .updateTable('match_set_shares')
      .set({ expires_at: new Date(Date.now() - 1000).toISOString() })
      .where('id', '=', share.body.id)
      .execute();
    await hub.api.get(`/api/shared/match-sets/${share.body.token}`).expect(410);
    await hub.api.get(`/api/shared/match-sets/${share.body.token}/report.pdf`).expect(410);
  });

  it('releases a set back to stock, so its valves can be reserved again', async () => {
    await as(viewer).post(`/api/match-sets/${setId}/release`).expect(403);
    const res = await as(tech).post(`/api/match-sets/${setId}/release`).expect(200);
    expect(res.body.status).toBe('released');
    for (const id of planted) {
      expect((await as(viewer).get(`/api/valves/${id}`)).body.status).toBe('in-stock');
    }
    await as(tech).post(`/api/match-sets/${setId}/release`).expect(409);
    const audit = await as(admin).get('/api/audit?action=valve.release&pageSize=100').expect(200);
    expect(audit.body.items).toHaveLength(4);
    await as(tech)
      .post('/api/match-sets', { valveIds: [planted[0], planted[1]], valveType: '12AX7' })
      .expect(201);
  });

  it('sells a reserved pair, and a sold set can no longer be released', async () => {
    const pair = await as(tech)
      .post('/api/match-sets', { valveIds: [planted[2], planted[3]], valveType: '12AX7' })
      .expect(201);
    expect(pair.body.figures.acceptable).toBe(true);
    await as(viewer).post(`/api/match-sets/${pair.body.id}/sell`).expect(403);
    const sold = await as(tech).post(`/api/match-sets/${pair.body.id}/sell`).expect(200);
    expect(sold.body.status).toBe('sold');
    expect(sold.body.members.map((m: { status: string }) => m.status)).toEqual(['sold', 'sold']);
    await as(tech).post(`/api/match-sets/${pair.body.id}/release`).expect(409);
    const again = await as(tech)
      .post('/api/match-sets', { valveIds: [planted[2], scattered[1]], valveType: '12AX7' })
      .expect(409);
    expect(again.body.error.fields).toEqual({ [`valve.${planted[2]}`]: 'sold' });
  });

  it('refuses to delete the record of a set member, naming the set, and keeps it', async () => {
    const res = await as(admin).delete(`/api/valves/${planted[2]}`).expect(409);
    expect(res.body.error.code).toBe('valve_in_match_set');
    expect(res.body.error.message).toMatch(/member of match set .*MS-\d+ \(sold\)/);
    await as(viewer).get(`/api/valves/${planted[2]}`).expect(200);
  });
});

/** A request whose answer body is kept as a Buffer. */
function download(test: Test): Test {
  return test.buffer(true).parse((res, done) => {
    const chunks: Buffer[] = [];
    res.on('data', (c: Buffer) => chunks.push(c));
    res.on('end', () => done(null, Buffer.concat(chunks)));
  });
}

/** The Title of a PDF's information dictionary (pdfkit writes it as its own literal object). */
function pdfTitle(pdf: Buffer): string | null {
  const text = pdf.toString('latin1');
  const ref = /\/Title (\d+) 0 R/.exec(text);
  if (!ref) return null;
  const value = new RegExp(`\\n${ref[1]} 0 obj\\n\\(((?:\\\\.|[^)])*)\\)`).exec(text);
  return value ? value[1].replace(/\\(.)/g, '$1') : null;
}
