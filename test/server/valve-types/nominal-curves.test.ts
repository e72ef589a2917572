import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { multipart } from '../multipart';
import { startTestHub, type TestHub } from '../test-hub';

/** A small invented family in the file format: two curves of three points and one of two. */
const GOOD = [
  '# digitised by hand; units V, V, mA, mA',
  ' VA , Vg1 ,IA ',
  '0,0,0',
  '100,0,1.1',
  '200,0,2.9',
  '',
  '0,-1,0',
  '200,-1,1.8',
  '100,-1,0.6',
  '150,-2,0.5',
  '250,-2,1.2',
].join('\r\n');

describe('nominal curves of a type', () => {
  let hub: TestHub;
  let admin: string;
  let tech: string;

  beforeAll(async () => {
    hub = await startTestHub();
    [admin, tech] = await Promise.all([hub.token('admin'), hub.token('tech')]);
  });
  afterAll(() => hub.close());

  const base = '/api/valve-types/12AU7/nominal-curves';
  const postCsv = (path: string, csv: string | Buffer, token = admin) =>
    hub.api
      .post(path)
      .set('authorization', `Bearer ${token}`)
      .set('content-type', 'text/csv')
      .send(Buffer.isBuffer(csv) ? csv : Buffer.from(csv));

  async function storedRows() {
    const db = hub.services.db;
    const points = await db.selectFrom('nominal_points').selectAll().orderBy('seq').execute();
    const sets = await db.selectFrom('nominal_curve_sets').selectAll().execute();
    return { points, sets };
  }

  it('previews a file as curves grouped by Vg1 with point counts, saving nothing', async () => {
    const res = await postCsv(`${base}/preview`, GOOD).expect(200);
    expect(res.body).toEqual({
      curves: [
        { vg1Volts: -2, pointCount: 2, vaMinVolts: 150, vaMaxVolts: 250 },
        { vg1Volts: -1, pointCount: 3, vaMinVolts: 0, vaMaxVolts: 200 },
        { vg1Volts: 0, pointCount: 3, vaMinVolts: 0, vaMaxVolts: 200 },
      ],
      pointCount: 8,
      hasScreenCurrent: false,
    });
    const rows = await storedRows();
    expect(rows.points).toHaveLength(0);
    expect(rows.sets).toHaveLength(0);
  });

  it('saves a multipart upload with its source, replacing the set, and serves it back', async () => {
    const first = multipart([
      { name: 'source', value: 'first try' },
      { name: 'file', filename: 'a.csv', contentType: 'text/csv', data: Buffer.from(GOOD) },
    ]);
    await hub.api
      .post(base)
      .set('authorization', `Bearer ${admin}`)
      .set('content-type', first.contentType)
      .send(first.body)
      .expect(201);
    const second = `va,vg1,ia,ig2\n0,-4,0,0\n300,-4,2.5,0.1\n0,-6,0,\n300,-6,1,`;
    const saved = await postCsv(
      `${base}?source=${encodeURIComponent('data sheet fig. 2')}`,
      second,
    ).expect(201);
    expect(saved.body).toMatchObject({
      designation: '12AU7',
      source: 'data sheet fig. 2',
      uploadedBy: 'admin',
      curves: [
        {
          vg1Volts: -6,
          points: [
            { vaVolts: 0, iaMilliamps: 0, ig2Milliamps: null },
            { vaVolts: 300, iaMilliamps: 1, ig2Milliamps: null },
          ],
        },
        {
          vg1Volts: -4,
          points: [
            { vaVolts: 0, iaMilliamps: 0, ig2Milliamps: 0 },
            { vaVolts: 300, iaMilliamps: 2.5, ig2Milliamps: 0.1 },
          ],
        },
      ],
    });
    const read = await hub.api
      .get(base)
      .set('authorization', `Bearer ${await hub.token('viewer')}`)
      .expect(200);
    expect(read.body).toEqual(saved.body);
    expect((await storedRows()).points).toHaveLength(4);
    const type = await hub.api
      .get('/api/valve-types/12AU7')
      .set('authorization', `Bearer ${admin}`);
    expect(type.body.hasNominalCurves).toBe(true);
    expect(type.body.sources).toContain('data sheet fig. 2');
  });

  it.each([
    ['a non-numeric cell', 'va,vg1,ia\n# note\n0,0,0\n10,0,abc\n', 4, 'ia "abc" is not a number'],
    ['a wrong column count', 'va,vg1,ia\n0,0,0\n10,0\n', 3, 'expected 3 columns, found 2'],
    ['a negative anode voltage', 'va,vg1,ia\n0,0,0\n-5,0,1\n', 3, 'va -5 V is negative'],
    ['a curve of one point', 'va,vg1,ia\n0,0,0\n9,0,1\n\n5,-1,0.1\n', 5, 'only 1 point'],
    ['a file that is not a CSV', 'hello there\nthis is a letter\n', 1, 'not a nominal-curve CSV'],
    ['binary data', '\u0000\u0001PNG', 1, 'not a CSV file'],
  ])(
    'refuses %s with the line number, leaving the stored set as it was',
    async (_what, csv, line, reason) => {
      const before = await storedRows();
      for (const path of [`${base}/preview`, `${base}?source=x`]) {
        const res = await postCsv(path, csv).expect(400);
        expect(res.body.error.code).toBe('bad_csv');
        expect(res.body.error.message).toContain(`line ${line}:`);
        expect(res.body.error.message).toContain(reason);
        expect(res.body.error.fields.file).toContain(`line ${line}`);
      }
      expect(await storedRows()).toEqual(before);
    },
  );

  it('refuses bytes that are not UTF-8 text, and a file over 1 MiB', async () => {
    const before = await storedRows();
    const png = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0xff, 0xfe]);
    const notText = await postCsv(`${base}?source=x`, png).expect(400);
    expect(notText.body.error).toMatchObject({
      code: 'not_csv',
      fields: { file: 'line 1: not UTF-8 text' },
    });
    const big = 'va,vg1,ia\n' + '100,-1,1.000000\n'.repeat(70_000);
    expect(big.length).toBeGreaterThan(1024 * 1024);
    const tooBig = await postCsv(`${base}?source=x`, big).expect(413);
    expect(tooBig.body.error).toMatchObject({
      code: 'file_too_large',
      fields: { file: 'at most 1 MiB' },
    });
    const form = multipart([
      { name: 'file', filename: 'big.csv', contentType: 'text/csv', data: Buffer.from(big) },
    ]);
    await hub.api
      .post(`${base}/preview`)
      .set('authorization', `Bearer ${admin}`)
      .set('content-type', form.contentType)
      .send(form.body)
      .expect(413);
    expect(await storedRows()).toEqual(before);
  });

  it('needs a source to save, an admin to upload, and a known type', async () => {
    const noSource = await postCsv(base, GOOD).expect(400);
    expect(noSource.body.error.fields).toHaveProperty('source');
    await postCsv(`${base}?source=x`, GOOD, tech).expect(403);
    await postCsv('/api/valve-types/NOPE1/nominal-curves/preview', GOOD).expect(404);
    const json = await hub.api
      .post(`${base}/preview`)
      .set('authorization', `Bearer ${admin}`)
      .send({ csv: GOOD })
      .expect(415);
    expect(json.body.error.fields).toHaveProperty('file');
  });
});
