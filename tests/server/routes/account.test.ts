import { encode } from '@auth/core/jwt';
import { eq, sql } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { USER_ROW_TTL_MS } from '../../../server/auth/current-user';
import { users } from '../../../server/db/schema';
import { clearMail, createTestApp, DEMO_PASSWORD, signIn, type TestApp, waitForMail } from '../../helpers/test-app';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
  await clearMail(t.db);
});
afterAll(async () => {
  await t.close();
});

describe('GET /api/health', () => {
  it('reports the database and SMTP as reachable', async () => {
    const res = await request(t.app).get('/api/health').expect(200);
    expect(res.body).toMatchObject({ status: 'ok', database: 'ok', smtp: 'ok' });
  });
});

describe('sign-in with e-mail and password', () => {
  it.each(['grower', 'adviser', 'regulator', 'admin'])('signs in the demo %s and reports the role', async (role) => {
    const { agent, error } = await signIn(t.app, `${role}@brackline.test`);
    expect(error).toBeNull();
    const me = await agent.get('/api/v1/account/me').expect(200);
    expect(me.body.role).toBe(role);
    expect(me.body.email).toBe(`${role}@brackline.test`);
  });

  it('refuses a wrong password with the same code as an unknown e-mail (no hint that the account exists)', async () => {
    const wrong = await signIn(t.app, 'grower@brackline.test', 'not-the-password');
    const unknown = await signIn(t.app, 'nobody-here@brackline.test', 'not-the-password');
    expect(wrong.error).toBe('CredentialsSignin');
    expect(wrong.code).toBe('credentials');
    expect(unknown.error).toBe(wrong.error);
    expect(unknown.code).toBe(wrong.code);
    await wrong.agent.get('/api/v1/account/me').expect(401);
  });

  it('throttles an e-mail address after too many failures, even with the right password', async () => {
    const email = 'throttle-me@brackline.test';
    await request(t.app).post('/api/v1/account/sign-up').send({ name: 'Throttle Test', email, password: 'a-long-password-1' }).expect(201);
    for (let i = 0; i < 5; i++) {
      const r = await signIn(t.app, email, 'wrong-password');
      expect(r.code).toBe('credentials');
    }
    const blocked = await signIn(t.app, email, 'a-long-password-1');
    expect(blocked.code).toBe('too_many_attempts');
  });

  it('answers 429 with a message when one address sends too many sign-in requests', async () => {
    const limited = await createTestApp({ authRateLimit: { limit: 3, windowMs: 60_000 } });
    try {
      const agent = request.agent(limited.app);
      for (let i = 0; i < 3; i++) await agent.post('/auth/callback/credentials').type('form').send({ email: 'x@y.z', password: 'p' });
      const res = await agent.post('/auth/callback/credentials').type('form').send({ email: 'x@y.z', password: 'p' }).expect(429);
      expect(res.body.error.message).toMatch(/Too many sign-in attempts/);
    } finally {
      await limited.close();
    }
  });
});

describe('sessions', () => {
  it('refuses an expired session token', async () => {
    const [grower] = await t.db.db.select().from(users).where(eq(users.email, 'grower@brackline.test'));
    const token = await encode({
      token: { uid: grower.id, sv: grower.sessionVersion, email: grower.email },
      secret: 'test-secret-test-secret-test-secret-0123',
      salt: 'authjs.session-token',
      maxAge: -60,
    });
    const res = await request(t.app).get('/api/v1/account/me').set('Cookie', `authjs.session-token=${token}`).expect(401);
    expect(res.body.error.message).toMatch(/Sign in/);
  });

  it('accepts a fresh token made the same way (the expired test is not refused for another reason)', async () => {
    const [grower] = await t.db.db.select().from(users).where(eq(users.email, 'grower@brackline.test'));
    const token = await encode({
      token: { uid: grower.id, sv: grower.sessionVersion, email: grower.email },
      secret: 'test-secret-test-secret-test-secret-0123',
      salt: 'authjs.session-token',
      maxAge: 600,
    });
    await request(t.app).get('/api/v1/account/me').set('Cookie', `authjs.session-token=${token}`).expect(200);
  });

  it('sign-out-everywhere revokes sessions on every device', async () => {
    const email = 'two-devices@brackline.test';
    await request(t.app).post('/api/v1/account/sign-up').send({ name: 'Two Devices', email, password: 'a-long-password-2' }).expect(201);
    const phone = await signIn(t.app, email, 'a-long-password-2');
    const laptop = await signIn(t.app, email, 'a-long-password-2');
    // Both sessions have just been checked, so the user's row is in the resolver's cache: the bump must still be seen.
    await laptop.agent.get('/api/v1/account/me').expect(200);
    await phone.agent.get('/api/v1/account/me').expect(200);
    await phone.agent.post('/api/v1/account/sign-out-everywhere').expect(200);
    await phone.agent.get('/api/v1/account/me').expect(401);
    await laptop.agent.get('/api/v1/account/me').expect(401);
  });

  it('refuses a session within USER_ROW_TTL_MS when another process bumps the session version in the database', async () => {
    const email = 'other-process@brackline.test';
    await request(t.app).post('/api/v1/account/sign-up').send({ name: 'Other Process', email, password: 'a-long-password-3' }).expect(201);
    const device = await signIn(t.app, email, 'a-long-password-3');
    await device.agent.get('/api/v1/account/me').expect(200);
    // What another web server does on sign-out-everywhere; this process is not told.
    await t.db.db.execute(sql`UPDATE users SET session_version = session_version + 1 WHERE email = ${email}`);
    await new Promise((r) => setTimeout(r, USER_ROW_TTL_MS + 100));
    await device.agent.get('/api/v1/account/me').expect(401);
  });
});

describe('POST /api/v1/account/sign-up', () => {
  it('creates a grower account', async () => {
    const res = await request(t.app)
      .post('/api/v1/account/sign-up')
      .send({ name: 'New Grower', email: 'New.Grower@brackline.test', password: 'long-enough-pw', organisationName: 'Newfarm Oysters' })
      .expect(201);
    expect(res.body).toMatchObject({ email: 'new.grower@brackline.test', role: 'grower' });
  });
  it('refuses a second account for the same e-mail with 409', async () => {
    const res = await request(t.app).post('/api/v1/account/sign-up').send({ name: 'Again', email: 'grower@brackline.test', password: 'long-enough-pw' }).expect(409);
    expect(res.body.error.message).toMatch(/already exists/);
  });
  it('names the field when the password is too short', async () => {
    const res = await request(t.app).post('/api/v1/account/sign-up').send({ name: 'Short', email: 'short@brackline.test', password: 'short' }).expect(400);
    expect(res.body.error.message).toMatch(/password must be at least 10 characters/);
    expect(res.body.error.details[0].field).toBe('password');
  });
  it('refuses unknown fields, naming them', async () => {
    const res = await request(t.app)
      .post('/api/v1/account/sign-up')
      .send({ name: 'X', email: 'x@brackline.test', password: 'long-enough-pw', role: 'admin' })
      .expect(400);
    expect(res.body.error.message).toMatch(/Unknown field "role"/);
  });
  it('answers 400 with a clear message for malformed JSON', async () => {
    const res = await request(t.app).post('/api/v1/account/sign-up').set('Content-Type', 'application/json').send('{"name": ').expect(400);
    expect(res.body.error.message).toMatch(/not valid JSON/);
  });
});

describe('password reset by e-mail', () => {
  it('mails a link whose token sets a new password and ends old sessions', async () => {
    const email = 'forgetful@brackline.test';
    await request(t.app).post('/api/v1/account/sign-up').send({ name: 'Forgetful', email, password: 'first-password-1' }).expect(201);
    const old = await signIn(t.app, email, 'first-password-1');
    await request(t.app).post('/api/v1/account/password-reset').send({ email }).expect(202);
    const mail = await waitForMail(t.db, email);
    const token = mail.text?.match(/token=([A-Za-z0-9_-]+)/)?.[1];
    expect(token).toBeTruthy();
    await request(t.app).post('/api/v1/account/password-reset/confirm').send({ token, password: 'second-password-2' }).expect(200);
    await old.agent.get('/api/v1/account/me').expect(401);
    expect((await signIn(t.app, email, 'second-password-2')).error).toBeNull();
    const reused = await request(t.app).post('/api/v1/account/password-reset/confirm').send({ token, password: 'third-password-3' }).expect(400);
    expect(reused.body.error.message).toMatch(/not valid or has expired/);
  });
  it('answers the same for an address with no account', async () => {
    const res = await request(t.app).post('/api/v1/account/password-reset').send({ email: 'nobody-at-all@brackline.test' }).expect(202);
    expect(res.body.message).toMatch(/If an account uses this e-mail/);
  });
});

describe('sign-in links by e-mail', () => {
  it('e-mails a link that signs the user in', async () => {
    const agent = request.agent(t.app);
    const csrf = await agent.get('/auth/csrf');
    await agent
      .post('/auth/signin/nodemailer')
      .set('X-Auth-Return-Redirect', '1')
      .type('form')
      .send({ csrfToken: csrf.body.csrfToken, email: 'adviser@brackline.test', callbackUrl: '/' })
      .expect(200);
    const mail = await waitForMail(t.db, 'adviser@brackline.test');
    const link = mail.text?.match(/https?:\/\/\S+\/auth\/callback\/nodemailer\S+/)?.[0];
    expect(link).toBeTruthy();
    const url = new URL(link!);
    const browser = request.agent(t.app);
    await browser.get(url.pathname + url.search).expect(302);
    const me = await browser.get('/api/v1/account/me').expect(200);
    expect(me.body.role).toBe('adviser');
  });
});

describe('invitations', () => {
  it('lets an admin invite an adviser who then signs in with that role', async () => {
    const admin = await signIn(t.app, 'admin@brackline.test');
    await admin.agent.post('/api/v1/admin/invitations').send({ email: 'new.adviser@brackline.test', role: 'adviser' }).expect(201);
    const mail = await waitForMail(t.db, 'new.adviser@brackline.test');
    const token = mail.text?.match(/token=([A-Za-z0-9_-]+)/)?.[1];
    const info = await request(t.app).get(`/api/v1/invitations/${token}`).expect(200);
    expect(info.body.role).toBe('adviser');
    await request(t.app).post(`/api/v1/invitations/${token}/accept`).send({ name: 'New Adviser', password: 'adviser-password-1' }).expect(201);
    const adviser = await signIn(t.app, 'new.adviser@brackline.test', 'adviser-password-1');
    expect((await adviser.agent.get('/api/v1/account/me')).body.role).toBe('adviser');
    await request(t.app).post(`/api/v1/invitations/${token}/accept`).send({ name: 'Again', password: 'adviser-password-1' }).expect(404);
  });
  it('requires a jurisdiction for a regulator', async () => {
    const admin = await signIn(t.app, 'admin@brackline.test');
    const res = await admin.agent.post('/api/v1/admin/invitations').send({ email: 'reg2@brackline.test', role: 'regulator' }).expect(400);
    expect(res.body.error.message).toMatch(/jurisdiction/);
  });
  it('ends the sessions of a user whose role changes, and records it in the audit log', async () => {
    const email = 'role-change@brackline.test';
    await request(t.app).post('/api/v1/account/sign-up').send({ name: 'Role Change', email, password: 'role-password-1' }).expect(201);
    const user = await signIn(t.app, email, 'role-password-1');
    await user.agent.get('/api/v1/account/me').expect(200);
    const [row] = await t.db.db.select().from(users).where(eq(users.email, email));
    const admin = await signIn(t.app, 'admin@brackline.test');
    await admin.agent.patch(`/api/v1/admin/users/${row.id}`).send({ role: 'adviser' }).expect(200);
    await user.agent.get('/api/v1/account/me').expect(401);
    const audit = await admin.agent.get('/api/v1/admin/audit').expect(200);
    expect(audit.body.items.some((a: { action: string; subjectId: string }) => a.action === 'user.role-change' && a.subjectId === row.id)).toBe(true);
  });
});

describe('the audit log is append-only in the database', () => {
  it('refuses UPDATE and DELETE even from the application role', async () => {
    await t.db.pool.query("insert into audit_entries (action, subject_type) values ('test.append', 'test')");
    await expect(t.db.pool.query("update audit_entries set action = 'tampered'")).rejects.toThrow(/append-only/);
    await expect(t.db.pool.query('delete from audit_entries')).rejects.toThrow(/append-only/);
    const { rows } = await t.db.db.execute(sql`select count(*)::int as n from audit_entries where action = 'tampered'`);
    expect(rows[0].n).toBe(0);
  });
});

describe('the admin outbox', () => {
  it('lists mail caught by the SMTP fake', async () => {
    await t.mailer.send({ to: 'someone@brackline.test', subject: 'Outbox check', text: 'hello' });
    await waitForMail(t.db, 'someone@brackline.test');
    const admin = await signIn(t.app, 'admin@brackline.test');
    const list = await admin.agent.get('/api/v1/admin/outbox').expect(200);
    const item = list.body.items.find((m: { subject: string }) => m.subject === 'Outbox check');
    expect(item.to).toEqual(['someone@brackline.test']);
    const one = await admin.agent.get(`/api/v1/admin/outbox/${item.id}`).expect(200);
    expect(one.body.text.trim()).toBe('hello');
  });
});

void DEMO_PASSWORD;
