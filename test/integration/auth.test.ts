import { createHmac } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Role } from '@kiln/shared';
import { createPerson, type TestPerson } from '../support/people';
import { startTestApi, TEST_JWT_SECRET, type TestApi } from '../support/test-api';
import { createTestDatabase, type TestDatabase } from '../support/test-database';

/** A JWT signed by hand, so tests can make expired, forged and odd tokens. */
function signJwt(payload: Record<string, unknown>, secret: string, header: Record<string, unknown> = { alg: 'HS256', typ: 'JWT' }) {
  const encode = (value: unknown) => Buffer.from(JSON.stringify(value)).toString('base64url');
  const unsigned = `${encode(header)}.${encode(payload)}`;
  const signature = header.alg === 'none' ? '' : createHmac('sha256', secret).update(unsigned).digest('base64url');
  return `${unsigned}.${signature}`;
}

describe('sign-in and roles', () => {
  let database: TestDatabase;
  let api: TestApi;
  const people = {} as Record<Role, TestPerson>;
  let disabled: TestPerson;
  let throttled: TestPerson;
  const responses: string[] = [];

  const login = async (email: string, password: string) => {
    const response = await api.request('POST', '/api/auth/login', { body: { email, password } });
    responses.push(response.text);
    return response;
  };

  beforeAll(async () => {
    database = await createTestDatabase();
    // A low limit keeps the throttling test short; each e-mail has its own budget.
    api = await startTestApi(database.url, { KILN_LOGIN_LIMIT_PER_MINUTE: '4' });
    for (const role of [Role.Admin, Role.Researcher, Role.Collaborator]) people[role] = await createPerson(database.db, role);
    disabled = await createPerson(database.db, Role.Researcher, { disabled: true });
    throttled = await createPerson(database.db, Role.Collaborator);
  });

  afterAll(async () => {
    await api?.close();
    await database?.drop();
  });

  it('signs in with the right password and returns a token that /api/auth/me accepts', async () => {
    const researcher = people[Role.Researcher];
    const response = await login(researcher.email.toUpperCase(), researcher.password);
    expect(response.status).toBe(200);
    expect(response.body.user).toMatchObject({ email: researcher.email, role: 'researcher', name: researcher.name });
    expect(response.body.expiresIn).toBeGreaterThan(0);
    const me = await api.request('GET', '/api/auth/me', { token: response.body.accessToken });
    responses.push(me.text);
    expect(me.status).toBe(200);
    expect(me.body).toMatchObject({ id: researcher.id, role: 'researcher' });
  });

  it('refuses a wrong password and an unknown e-mail with the same message', async () => {
    const wrong = await login(people[Role.Admin].email, 'not-the-password');
    const unknown = await login('nobody@test.example', 'whatever');
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(wrong.body).toEqual({ error: 'unauthenticated', message: 'E-mail or password is wrong.', details: [] });
    expect(unknown.body.message).toBe(wrong.body.message);
  });

  it('refuses a disabled account even with the right password', async () => {
    const response = await login(disabled.email, disabled.password);
    expect(response.status).toBe(401);
    expect(response.body.message).toMatch(/disabled/);
  });

  it('throttles repeated attempts for one e-mail with 429, without locking out others', async () => {
    const target = throttled;
    const statuses: number[] = [];
    for (let i = 0; i < 6; i++) statuses.push((await login(target.email, `guess-${i}`)).status);
    expect(statuses.slice(0, 4)).toEqual([401, 401, 401, 401]);
    expect(statuses.slice(4)).toEqual([429, 429]);
    const blocked = await login(target.email, target.password);
    expect(blocked.status).toBe(429);
    expect(blocked.body.error).toBe('too_many_requests');
    const other = await login(people[Role.Admin].email, people[Role.Admin].password);
    expect(other.status).toBe(200);
  });

  it.each([
    ['no body', undefined],
    ['a number as e-mail', { email: 42, password: 'x' }],
    ['an empty password', { email: 'a@test.example', password: '' }],
    ['not an e-mail', { email: 'ines', password: 'x' }],
    ['a huge password', { email: 'a@test.example', password: 'x'.repeat(5000) }],
    ['an array', [1, 2, 3]],
  ])('rejects sign-in with %s as 400 naming the field', async (_label, body) => {
    const response = await api.request('POST', '/api/auth/login', { body });
    expect(response.status).toBe(400);
    expect(response.body.error).toBe('bad_input');
    expect(Array.isArray(response.body.details)).toBe(true);
    expect(response.body.details.length).toBeGreaterThan(0);
  });

  it('rejects malformed JSON with a JSON error', async () => {
    const response = await api.request('POST', '/api/auth/login', { rawBody: '{"email": ' });
    expect(response.status).toBe(400);
    expect(response.body.error).toBe('bad_input');
  });

  describe('bearer tokens', () => {
    const now = () => Math.floor(Date.now() / 1000);

    it('refuses a missing token', async () => {
      const response = await api.request('GET', '/api/auth/me');
      expect(response.status).toBe(401);
      expect(response.body.error).toBe('unauthenticated');
    });

    it('refuses an expired token, saying so', async () => {
      const token = signJwt({ sub: people[Role.Admin].id, role: 'admin', iat: now() - 7200, exp: now() - 3600 }, TEST_JWT_SECRET);
      const response = await api.request('GET', '/api/auth/me', { token });
      expect(response.status).toBe(401);
      expect(response.body.message).toMatch(/expired/);
    });

    it('refuses a token signed with another secret', async () => {
      const token = signJwt({ sub: people[Role.Admin].id, role: 'admin', iat: now(), exp: now() + 3600 }, 'another-secret-of-sufficient-length-000000');
      expect((await api.request('GET', '/api/auth/me', { token })).status).toBe(401);
    });

    it('refuses an unsigned token (alg none)', async () => {
      const token = signJwt({ sub: people[Role.Admin].id, role: 'admin', iat: now(), exp: now() + 3600 }, '', { alg: 'none', typ: 'JWT' });
      expect((await api.request('GET', '/api/auth/me', { token })).status).toBe(401);
    });

    it('refuses garbage and a validly signed token for a user that does not exist', async () => {
      expect((await api.request('GET', '/api/auth/me', { token: 'not.a.jwt' })).status).toBe(401);
      const ghost = signJwt({ sub: '00000000-0000-4000-8000-000000000000', role: 'admin', iat: now(), exp: now() + 3600 }, TEST_JWT_SECRET);
      expect((await api.request('GET', '/api/auth/me', { token: ghost })).status).toBe(401);
      const notUuid = signJwt({ sub: "1' OR '1'='1", role: 'admin', iat: now(), exp: now() + 3600 }, TEST_JWT_SECRET);
      expect((await api.request('GET', '/api/auth/me', { token: notUuid })).status).toBe(401);
    });

    it('takes the role from the database, not from the token', async () => {
      // A researcher's token claiming to be admin must not open admin routes.
      const token = signJwt({ sub: people[Role.Researcher].id, role: 'admin', iat: now(), exp: now() + 3600 }, TEST_JWT_SECRET);
      expect((await api.request('GET', '/api/users', { token })).status).toBe(403);
    });
  });

  describe('role guard on admin-only routes', () => {
    it.each([
      [Role.Admin, 200],
      [Role.Researcher, 403],
      [Role.Collaborator, 403],
    ])('GET /api/users as %s → %i', async (role, status) => {
      const person = people[role];
      const { body } = await login(person.email, person.password);
      const response = await api.request('GET', '/api/users', { token: body.accessToken });
      responses.push(response.text);
      expect(response.status).toBe(status);
      if (status === 200) expect(response.body.map((user: { email: string }) => user.email)).toContain(person.email);
      else expect(response.body.error).toBe('forbidden');
    });

    it('GET /api/users without a token → 401', async () => {
      expect((await api.request('GET', '/api/users')).status).toBe(401);
    });
  });

  it('never returns a password hash from any route', async () => {
    expect(responses.length).toBeGreaterThan(10);
    for (const text of responses) {
      expect(text).not.toMatch(/password_hash|passwordHash|\$argon2/);
    }
  });
});
