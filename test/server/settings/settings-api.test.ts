import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEFAULT_GRADE_THRESHOLDS } from '../../../shared/grading/grade-thresholds';
import { startTestHub, type TestHub } from '../test-hub';

describe('workshop settings', () => {
  let hub: TestHub;
  let admin: string;

  beforeAll(async () => {
    hub = await startTestHub({ demo: false, adminPassword: 'admin-pass-for-tests' });
    const login = await hub.api
      .post('/api/auth/login')
      .send({ username: 'admin', password: 'admin-pass-for-tests' })
      .expect(200);
    admin = login.body.token;
  });
  afterAll(() => hub.close());

  const put = (body: object) =>
    hub.api.put('/api/settings').set('authorization', `Bearer ${admin}`).send(body);

  it('starts from the defaults: common-practice grade thresholds and a plain label scheme', async () => {
    const res = await hub.api
      .get('/api/settings')
      .set('authorization', `Bearer ${admin}`)
      .expect(200);
    expect(res.body).toEqual({
      labelPrefix: 'V',
      labelDigits: 4,
      nextLabelNumber: 1,
      gradeThresholds: DEFAULT_GRADE_THRESHOLDS,
      quickTestLimits: {
        reducedHeaterMaxDropPercent: 10,
        gasMaxMicroamps: 0.2,
        leakageMaxMicroamps: 10,
        electrodeLeakageMaxMicroamps: 2,
        shortMinMicroamps: 100,
      },
    });
    // Common practice (no single source): below about 60-70 % of nominal a valve is replaced.
    expect(DEFAULT_GRADE_THRESHOLDS.fairMinPercent).toBeGreaterThanOrEqual(60);
    expect(DEFAULT_GRADE_THRESHOLDS.fairMinPercent).toBeLessThanOrEqual(70);
  });

  it('changes the label scheme for the next record and audits the change', async () => {
    await put({ labelPrefix: 'wk', nextLabelNumber: 120, labelDigits: 5 }).expect(200);
    const valve = await hub.api
      .post('/api/valves')
      .set('authorization', `Bearer ${admin}`)
      .send({ type: 'EF86' })
      .expect(201);
    expect(valve.body.label).toBe('WK-00120');
    const settings = await hub.api.get('/api/settings').set('authorization', `Bearer ${admin}`);
    expect(settings.body.nextLabelNumber).toBe(121);
    const audit = await hub.api
      .get('/api/audit?action=settings.update&pageSize=1')
      .set('authorization', `Bearer ${admin}`);
    expect(audit.body.items[0].detail.changes.labelPrefix).toEqual({ from: 'V', to: 'WK' });
  });

  it('refuses thresholds out of order, unknown keys and an empty change', async () => {
    const res = await put({ gradeThresholds: { strongMinPercent: 60, fairMinPercent: 70 } }).expect(
      400,
    );
    expect(res.body.error.fields).toHaveProperty(['gradeThresholds.strongMinPercent']);
    await put({ colour: 'red' }).expect(400);
    await put({}).expect(400);
    await put({ labelPrefix: 'has space' }).expect(400);
    const neg = await put({ quickTestLimits: { gasMaxMicroamps: -1 } }).expect(400);
    expect(neg.body.error.fields).toHaveProperty(['quickTestLimits.gasMaxMicroamps']);
    const order = await put({ quickTestLimits: { shortMinMicroamps: 5 } }).expect(400);
    expect(order.body.error.message).toMatch(/shortMinMicroamps must be above/);
  });

  it('changes one quick-test limit and keeps the others, audited', async () => {
    const res = await put({ quickTestLimits: { gasMaxMicroamps: 1.5 } }).expect(200);
    expect(res.body.quickTestLimits).toMatchObject({
      gasMaxMicroamps: 1.5,
      leakageMaxMicroamps: 10,
    });
    const again = await hub.api.get('/api/settings').set('authorization', `Bearer ${admin}`);
    expect(again.body.quickTestLimits).toEqual(res.body.quickTestLimits);
    const audit = await hub.api
      .get('/api/audit?action=settings.update&pageSize=1')
      .set('authorization', `Bearer ${admin}`);
    expect(audit.body.items[0].detail.changes.quickTestLimits.from.gasMaxMicroamps).toBe(0.2);
    expect(audit.body.items[0].detail.changes.quickTestLimits.to.gasMaxMicroamps).toBe(1.5);
  });
});
