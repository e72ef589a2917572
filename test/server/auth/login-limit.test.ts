import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { LOGIN_FAILURES_PER_USER } from '../../../server/auth/login-limiter';
import { DEMO_USERS } from '../../../server/demo/demo-data';
import { startTestHub, type TestHub } from '../test-hub';

describe('sign-in attempts', () => {
  let hub: TestHub;
  beforeAll(async () => {
    hub = await startTestHub();
  });
  afterAll(() => hub.close());

  const login = (username: string, password: string) =>
    hub.api.post('/api/auth/login').send({ username, password });
  const passwordOf = (username: string) =>
    DEMO_USERS.find((u) => u.username === username)!.password;

  it('never holds up successful sign-ins, however many', async () => {
    for (let i = 0; i < LOGIN_FAILURES_PER_USER + 5; i++) {
      await login('tech', passwordOf('tech')).expect(200);
    }
  });

  it('refuses a user name with 429 after repeated wrong passwords, and not the others', async () => {
    for (let i = 0; i < LOGIN_FAILURES_PER_USER; i++) {
      await login('admin', `guess-${i}`).expect(401);
    }
    const held = await login('Admin', 'guess-again').expect(429);
    expect(held.body.error.code).toBe('too_many_attempts');
    expect(held.body.error.message).toContain('for this user name');
    expect(Number(held.headers['retry-after'])).toBeGreaterThan(0);
    // Even the right password waits out the window: the guesser must not learn it works.
    await login('admin', passwordOf('admin')).expect(429);
    // Other users of the workshop sign in as before.
    await login('viewer', passwordOf('viewer')).expect(200);
    await login('viewer', 'wrong').expect(401);
  });
});
