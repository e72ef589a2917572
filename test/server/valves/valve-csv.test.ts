import Papa from 'papaparse';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { VALVE_CSV_COLUMNS } from '../../../server/valves/valve-csv';
import { multipart } from '../multipart';
import { startTestHub, type TestHub } from '../test-hub';

/** The fields a CSV carries of a record (times are the record's own and not imported). */
const FIELDS = [
  'label',
  'type',
  'maker',
  'dateCode',
  'originKind',
  'originText',
  'location',
  'status',
  'notes',
] as const;

describe('valve CSV export and import', () => {
  let source: TestHub;
  let target: TestHub;
  const techOf = new Map<TestHub, string>();

  beforeAll(async () => {
    [source, target] = await Promise.all([startTestHub(), startTestHub()]);
    for (const hub of [source, target]) techOf.set(hub, await auth(hub, 'tech'));
  });
  afterAll(async () => {
    await Promise.all([source.close(), target.close()]);
  });

  const auth = async (hub: TestHub, user: 'admin' | 'tech' | 'viewer') =>
    `Bearer ${await hub.token(user)}`;
  const allValves = async (hub: TestHub) =>
    (await hub.api.get('/api/valves?pageSize=100').set('authorization', await auth(hub, 'viewer')))
      .body.items as Record<string, unknown>[];
  const importCsv = (hub: TestHub, csv: string) =>
    hub.api
      .post('/api/valves/import')
      .set('authorization', techOf.get(hub)!)
      .set('content-type', 'text/csv')
      .send(Buffer.from(csv));

  it('exports every record with a header, quoting and formula-guarding the cells', async () => {
    const tech = await auth(source, 'tech');
    await source.api
      .post('/api/valves')
      .set('authorization', tech)
      .send({
        type: 'EL84',
        maker: 'Lyndmoor, "export" grade',
        notes: '=HYPERLINK("x")\nsecond line',
        location: '-3 shelf',
        originKind: 'lot',
        originText: 'Lot 9',
      })
      .expect(201);
    const res = await source.api
      .get('/api/valves/export?format=csv')
      .set('authorization', await auth(source, 'viewer'))
      .expect(200);
    expect(res.headers['content-type']).toContain('text/csv');
    expect(res.headers['content-disposition']).toContain('valves.csv');
    const parsed = Papa.parse<string[]>(res.text.trim());
    expect(parsed.data[0]).toEqual([...VALVE_CSV_COLUMNS]);
    expect(parsed.data).toHaveLength(1 + (await allValves(source)).length);
    const el84 = parsed.data.find((r) => r[1] === 'EL84')!;
    expect(el84[2]).toBe('Lyndmoor, "export" grade');
    expect(el84[8]).toBe('\'=HYPERLINK("x")\nsecond line');
    expect(el84[6]).toBe("'-3 shelf");
  });

  it('round-trips the records into an empty workshop', async () => {
    const csv = (
      await source.api
        .get('/api/valves/export')
        .set('authorization', await auth(source, 'viewer'))
        .expect(200)
    ).text;
    // The target starts with the same demo stock: clear it so every label is free.
    await target.services.db.deleteFrom('valves').execute();
    const res = await importCsv(target, csv).expect(200);
    const before = await allValves(source);
    expect(res.body).toMatchObject({ imported: before.length, rejected: [], ignoredColumns: [] });
    const after = await allValves(target);
    const pick = (v: Record<string, unknown>) => FIELDS.map((f) => v[f]);
    const byLabel = (a: unknown[], b: unknown[]) => String(a[0]).localeCompare(String(b[0]));
    expect(after.map(pick).sort(byLabel)).toEqual(before.map(pick).sort(byLabel));
    expect(after.every((v) => v.createdBy === 'tech')).toBe(true);
  });

  it('imports the good rows in one go and reports each bad row with its line and reason', async () => {
    const csv = [
      '# stock taken on the spring inventory',
      'Type, Label, Maker, Status, Notes, Colour',
      '12AX7,,Northvale,in-stock,first,red',
      '12AX7,KL-0001,Aurel,in-stock,label in use,red',
      'ZZ99,,Aurel,in-stock,unknown type,red',
      '12AU7,,Aurel,broken,bad status,red',
      ',,Aurel,in-stock,no type,red',
      '12AU7,,"Corrin & Hale",sold,"quoted, with comma',
      'and a second line",red',
      'EL34,NEW-1,Aurel,in-stock,fine,red',
      'EL34,new-1,Aurel,in-stock,repeat,red',
      'EL34,NEW-2,Aurel',
    ].join('\n');
    const before = (await allValves(target)).length;
    const res = await importCsv(target, csv).expect(200);
    expect(res.body.rejected).toEqual([
      { line: 4, reason: 'label KL-0001 is already in use' },
      { line: 5, reason: 'unknown valve type ZZ99' },
      { line: 6, reason: expect.stringMatching(/^status: /) },
      { line: 7, reason: 'type: the cell is empty' },
      { line: 11, reason: 'label new-1 repeats line 10' },
      { line: 12, reason: 'expected 6 columns, found 3' },
    ]);
    expect(res.body.imported).toBe(3);
    expect(res.body.ignoredColumns).toEqual(['colour']);
    expect(res.body.labels).toHaveLength(3);
    expect(res.body.labels[2]).toBe('NEW-1');
    const after = await allValves(target);
    expect(after).toHaveLength(before + 3);
    const quoted = after.find((v) => v.label === res.body.labels[1])!;
    expect(quoted).toMatchObject({
      maker: 'Corrin & Hale',
      notes: 'quoted, with comma\nand a second line',
    });
    const audit = await target.api
      .get('/api/audit?action=valve.import&pageSize=1')
      .set('authorization', await auth(target, 'admin'));
    expect(audit.body.items[0]).toMatchObject({
      username: 'tech',
      detail: { imported: 3, rejected: 6 },
    });
  });

  it('refuses a file it cannot read at all, importing nothing', async () => {
    const before = (await allValves(target)).length;
    const noType = await importCsv(target, 'label,maker\nX-1,Aurel\n').expect(400);
    expect(noType.body.error.message).toMatch(/^line 1: the header must name a "type" column/);
    const empty = await importCsv(target, '# only a comment\n').expect(400);
    expect(empty.body.error.code).toBe('bad_csv');
    const form = multipart([
      {
        name: 'file',
        filename: 'v.csv',
        contentType: 'text/csv',
        data: Buffer.from('type\n\u0000'),
      },
    ]);
    await target.api
      .post('/api/valves/import')
      .set('authorization', await auth(target, 'tech'))
      .set('content-type', form.contentType)
      .send(form.body)
      .expect(400);
    expect(await allValves(target)).toHaveLength(before);
    await target.api
      .post('/api/valves/import')
      .set('authorization', await auth(target, 'viewer'))
      .set('content-type', 'text/csv')
      .send('type\n12AX7\n')
      .expect(403);
  });
});
