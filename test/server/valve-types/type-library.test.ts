import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { REFERENCE_TYPES } from '../../fixtures/reference-figures';
import {
  connectBridge,
  eventually,
  smallTriodePlan,
  startTestHub,
  type TestHub,
} from '../test-hub';

type Bridge = Awaited<ReturnType<typeof connectBridge>>;
type Cited = { source: string; confidence: string | null };

/** A library figure's citation as the reference sheet writes it: "source; confidence". */
const cited = (f: Cited) => (f.confidence ? `${f.source}; ${f.confidence}` : f.source);

/** A new type as an admin would enter it (invented figures: only its shape matters here). */
function testType(designation: string) {
  return {
    designation,
    equivalents: [`${designation}A`],
    valveClass: 'triode',
    base: 'B9A',
    sections: 1,
    heaterVolts: 6.3,
    heaterAmps: 0.3,
    operatingPoints: [
      {
        vaVolts: 200,
        vg1Volts: -3,
        iaMilliamps: 4,
        gmMicrosiemens: 2000,
        raKiloohms: 10,
        mu: 20,
        source: 'bench notes',
      },
    ],
    ratings: { vaMaxVolts: 300, paMaxWatts: 2, source: 'bench notes', confidence: 'low' },
  };
}

describe('type library', () => {
  let hub: TestHub;
  let bridge: Bridge;
  let admin: string;
  let tech: string;
  let viewer: string;

  beforeAll(async () => {
    hub = await startTestHub();
    bridge = await connectBridge(hub, 0);
    [admin, tech, viewer] = await Promise.all([
      hub.token('admin'),
      hub.token('tech'),
      hub.token('viewer'),
    ]);
  });
  afterAll(async () => {
    await bridge.close();
    await hub.close();
  });

  const as = (token: string) => ({
    get: (path: string) => hub.api.get(path).set('authorization', `Bearer ${token}`),
    post: (path: string, body: object) =>
      hub.api.post(path).set('authorization', `Bearer ${token}`).send(body),
    patch: (path: string, body: object) =>
      hub.api.patch(path).set('authorization', `Bearer ${token}`).send(body),
    delete: (path: string) => hub.api.delete(path).set('authorization', `Bearer ${token}`),
  });

  it('seeds every published operating point and rating, row by row, with its source', async () => {
    const res = await as(viewer).get('/api/valve-types').expect(200);
    const library = new Map((res.body as { designation: string }[]).map((t) => [t.designation, t]));
    // The reference sheet gives no maximum ratings for these two, and the library does not
    // take a type without ratings (the bench checks need them).
    const unrated = REFERENCE_TYPES.filter((r) => !library.has(r.designation));
    expect(unrated.map((r) => r.designation)).toEqual(['6BA6', '6AU6']);
    expect(unrated.every((r) => r.ratings === null)).toBe(true);

    for (const ref of REFERENCE_TYPES.filter((r) => library.has(r.designation))) {
      // eslint-disable-next-line @typescript-eslint/no-explicit-any -- JSON answer
      const t = library.get(ref.designation) as any;
      expect([t.heaterVolts, t.heaterAmps], ref.designation).toEqual([
        ref.heaterVolts,
        ref.heaterAmps,
      ]);
      expect(t.operatingPoints, ref.designation).toHaveLength(ref.operatingPoints.length);
      ref.operatingPoints.forEach((op, i) => {
        const got = t.operatingPoints[i];
        const { source, ...figures } = op;
        expect({ ...got, source: cited(got), confidence: undefined }, ref.designation).toEqual({
          ...figures,
          source,
          confidence: undefined,
        });
      });
      const { source, ...ratings } = ref.ratings!;
      expect({ ...t.ratings, source: cited(t.ratings) }, ref.designation).toEqual({
        ...ratings,
        ikMaxMilliamps: null,
        confidence: t.ratings.confidence,
        source,
      });
      expect(t.sources).toContain(t.ratings.source);
    }
  });

  it('holds gm x ra = mu within 5 % on every seeded row that gives all three', async () => {
    const res = await as(viewer).get('/api/valve-types').expect(200);
    let checked = 0;
    for (const t of res.body) {
      for (const op of t.operatingPoints) {
        if (op.gmMicrosiemens === null || op.raKiloohms === null || op.mu === null) continue;
        // µS x kΩ / 1000 is dimensionless: the amplification factor.
        const product = (op.gmMicrosiemens * op.raKiloohms) / 1000;
        expect(
          Math.abs(product - op.mu) / op.mu,
          `${t.designation} at ${op.vaVolts} V`,
        ).toBeLessThan(0.05);
        checked++;
      }
    }
    // 12AX7 (two points), 12AU7, 12AT7, 6SN7GT and 300B give all three.
    expect(checked).toBe(6);
    const refRows = REFERENCE_TYPES.flatMap((r) => r.operatingPoints).filter(
      (op) => op.gmMicrosiemens !== null && op.raKiloohms !== null && op.mu !== null,
    );
    expect(refRows).toHaveLength(checked);
  });

  it('keeps the shape the app reads, adds id and sources, and finds a type by equivalent', async () => {
    const res = await as(viewer).get('/api/valve-types/ecc83').expect(200);
    expect(res.body).toMatchObject({
      designation: '12AX7',
      equivalents: ['ECC83'],
      valveClass: 'double-triode',
      base: 'B9A',
      sections: 2,
      hasScreen: false,
      hasModel: true,
      model: { kind: 'triode', params: { mu: 100, ex: 1.4, kg1: 1060, kp: 600, kvb: 300 } },
      defaultPlan: { kind: 'anode', vaStopVolts: 300 },
    });
    expect(res.body.id).toEqual(expect.any(Number));
    expect(res.body.sources).toEqual(['RCA data sheet', 'RCA', 'Koren, Glass Audio 8(5), 1996']);
    const missing = await as(viewer).get('/api/valve-types/XYZ99').expect(404);
    expect(missing.body.error.code).toBe('valve_type_not_found');
  });

  it('lets an admin add, change and delete a type, and audits each with who', async () => {
    const created = await as(admin).post('/api/valve-types', testType('TT1')).expect(201);
    expect(created.body).toMatchObject({ designation: 'TT1', equivalents: ['TT1A'] });
    const patched = await as(admin)
      .patch('/api/valve-types/tt1a', { ratings: { paMaxWatts: 1.5 }, notes: 'checked' })
      .expect(200);
    expect(patched.body.ratings).toMatchObject({ paMaxWatts: 1.5, vaMaxVolts: 300 });
    expect(patched.body.notes).toBe('checked');
    await as(admin).delete('/api/valve-types/TT1').expect(204);
    await as(viewer).get('/api/valve-types/TT1').expect(404);

    const audit = await as(admin).get('/api/audit?pageSize=10').expect(200);
    const entries = audit.body.items.filter(
      (e: { subject: string }) => e.subject === 'valve-type:TT1',
    );
    expect(entries.map((e: { action: string }) => e.action)).toEqual([
      'valve-type.delete',
      'valve-type.update',
      'valve-type.create',
    ]);
    expect(entries.every((e: { username: string }) => e.username === 'admin')).toBe(true);
    expect(entries[1].detail.changes).toMatchObject({
      ratings: { paMaxWatts: { from: 2, to: 1.5 } },
      notes: { from: null, to: 'checked' },
    });
  });

  it('refuses inconsistent or clashing types, naming the field', async () => {
    const noScreen = { ...testType('TT2'), valveClass: 'pentode' };
    const res = await as(admin).post('/api/valve-types', noScreen).expect(400);
    expect(res.body.error.fields).toHaveProperty(['ratings.vg2MaxVolts']);
    expect(res.body.error.fields).toHaveProperty(['operatingPoints.0.vg2Volts']);

    const hot = testType('TT3');
    hot.operatingPoints[0].iaMilliamps = 20; // 200 V x 20 mA = 4 W > 2 W
    const pa = await as(admin).post('/api/valve-types', hot).expect(400);
    expect(pa.body.error.fields['operatingPoints.0.iaMilliamps']).toContain('Pa max');

    const clash = await as(admin)
      .post('/api/valve-types', { ...testType('TT4'), equivalents: ['ecc83'] })
      .expect(409);
    expect(clash.body.error.code).toBe('valve_type_name_taken');
    const over = await as(admin)
      .patch('/api/valve-types/12AX7', { ratings: { vaMaxVolts: 200 } })
      .expect(400);
    expect(over.body.error.fields['operatingPoints.0.vaVolts']).toContain('Va max');
    await as(admin).patch('/api/valve-types/12AX7', { designation: 'X' }).expect(400);
  });

  it('lets a technician read the library but not change or delete a type', async () => {
    await as(tech).get('/api/valve-types/12AU7').expect(200);
    const del = await as(tech).delete('/api/valve-types/12AU7').expect(403);
    expect(del.body.error.code).toBe('forbidden');
    await as(tech).patch('/api/valve-types/12AU7', { notes: 'x' }).expect(403);
    await as(viewer).post('/api/valve-types', testType('TT5')).expect(403);
    await as(admin).get('/api/valve-types/12AU7').expect(200);
  });

  it('refuses to delete a type that valve records use', async () => {
    const res = await as(admin).delete('/api/valve-types/12AX7').expect(409);
    expect(res.body.error.code).toBe('valve_type_in_use');
  });

  describe('the bench check uses the ratings as stored', () => {
    const start = (token: string, plan: object, extra: object = {}) =>
      as(token).post('/api/sweeps', { benchId: 1, plan, valveType: '12AX7', ...extra });

    async function finish(id: number) {
      bridge.send({ type: 'sweep-ended', sweepId: id, reason: 'complete', count: 0, message: '' });
      await eventually(
        async () => (await hub.services.sweeps.view(id)).status === 'complete',
        'sweep ended',
      );
    }

    it("follows an admin's change of Va max in both directions, keeping the override", async () => {
      const plan = smallTriodePlan({ vaStopVolts: 280 });
      const before = await start(tech, plan).expect(201);
      await finish(before.body.id);

      await as(admin)
        .patch('/api/valve-types/12AX7', { ratings: { vaMaxVolts: 260 } })
        .expect(200);
      const refused = await start(tech, plan).expect(422);
      expect(refused.body.error.fields['plan.vaStopVolts']).toBe(
        'anode voltage 280 V is above the limit of 260 V (12AX7 maximum ratings)',
      );

      const overridden = await start(admin, plan, { override: true }).expect(201);
      await finish(overridden.body.id);
      const audit = await as(admin).get('/api/audit?action=sweep.start&pageSize=1').expect(200);
      expect(audit.body.items[0].detail.overriddenRatings).toEqual({
        'plan.vaStopVolts':
          'anode voltage 280 V is above the limit of 260 V (12AX7 maximum ratings)',
      });

      await as(admin)
        .patch('/api/valve-types/12AX7', { ratings: { vaMaxVolts: 330 } })
        .expect(200);
      const wider = await start(tech, smallTriodePlan({ vaStopVolts: 320 })).expect(201);
      await finish(wider.body.id);
      const change = await as(admin).get('/api/audit?action=valve-type.update&pageSize=1');
      expect(change.body.items[0].detail.changes.ratings).toEqual({
        vaMaxVolts: { from: 260, to: 330 },
      });
      await as(admin)
        .patch('/api/valve-types/12AX7', { ratings: { vaMaxVolts: 300 } })
        .expect(200);
    });
  });
});
