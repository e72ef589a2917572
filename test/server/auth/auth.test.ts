import jwt from 'jsonwebtoken';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestHub, type TestHub } from '../test-hub';

describe('sign-in', () => {
  let hub: TestHub;
  beforeAll(async () => {
    hub = await startTestHub();
  });
  afterAll(() => hub.close());

  it('signs a demo user in and answers who they are', async () => {
    const res = await hub.api
      .post('/api/auth/login')
      .send({ username: 'tech', password: 'ember-tech' })
      .expect(200);
    expect(res.body.user).toEqual({
      id: expect.any(Number),
      username: 'tech',
      displayName: 'Bench technician',
      role: 'technician',
    });
    expect(res.body.user).not.toHaveProperty('password_hash');
    const me = await hub.api
      .get('/api/auth/me')
      .set('authorization', `Bearer ${res.body.token}`)
      .expect(200);
    expect(me.body).toEqual(res.body.user);
  });

  it('gives a token that expires after the configured lifetime', async () => {
    const token = await hub.token('viewer');
    const claims = jwt.decode(token) as jwt.JwtPayload;
    expect(claims.exp! - claims.iat!).toBe(hub.config.jwtLifetimeSeconds);
  });

  it('answers a wrong password and an unknown user alike', async () => {
    const wrong = await hub.api
      .post('/api/auth/login')
      .send({ username: 'tech', password: 'not-it' })
      .expect(401);
    const unknown = await hub.api
      .post('/api/auth/login')
      .send({ username: 'nobody', password: 'not-it' })
      .expect(401);
    expect(wrong.body).toEqual(unknown.body);
    expect(wrong.body.error.code).toBe('bad_credentials');
  });

  it('records sign-ins and failed sign-ins in the audit log', async () => {
    await hub.api.post('/api/auth/login').send({ username: 'ghost', password: 'x' }).expect(401);
    const admin = await hub.token('admin');
    const res = await hub.api
      .get('/api/audit?pageSize=100')
      .set('authorization', `Bearer ${admin}`)
      .expect(200);
    const actions = res.body.items.map(
      (e: { action: string; subject: string }) => `${e.action} ${e.subject}`,
    );
    expect(actions).toContain('auth.login-failed ghost');
    expect(
      res.body.items.some(
        (e: { action: string; username: string }) =>
          e.action === 'auth.login' && e.username === 'admin',
      ),
    ).toBe(true);
  });

  it('refuses a login body without a password, naming the field', async () => {
    const res = await hub.api.post('/api/auth/login').send({ username: 'tech' }).expect(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(Object.keys(res.body.error.fields)).toEqual(['password']);
  });

  it('refuses an expired token with its own code', async () => {
    const expired = jwt.sign(
      { role: 'admin', username: 'admin', exp: Math.floor(Date.now() / 1000) - 60 },
      hub.config.jwtSecret,
      { subject: '1' },
    );
    const res = await hub.api
      .get('/api/auth/me')
      .set('authorization', `Bearer ${expired}`)
      .expect(401);
    expect(res.body.error.code).toBe('token_expired');
  });

  it('refuses malformed, forged and unsigned tokens', async () => {
    const forged = jwt.sign({ role: 'admin' }, 'some-other-secret', { subject: '1' });
    const unsigned = jwt.sign({ role: 'admin' }, '', { subject: '1', algorithm: 'none' });
    for (const token of ['not-a-jwt', 'a.b.c', forged, unsigned]) {
      const res = await hub.api
        .get('/api/auth/me')
        .set('authorization', `Bearer ${token}`)
        .expect(401);
      expect(res.body.error.code).toBe('invalid_token');
    }
    const none = await hub.api.get('/api/auth/me').expect(401);
    expect(none.body.error.code).toBe('unauthenticated');
  });

  it('refuses a token of a user that no longer exists', async () => {
    const token = jwt.sign({ role: 'admin' }, hub.config.jwtSecret, { subject: '9999' });
    await hub.api.get('/api/auth/me').set('authorization', `Bearer ${token}`).expect(401);
  });
});
