/**
 * Advisers and their clients (issue "Grower's app II"): an adviser invites a grower by e-mail
 * (through the SMTP fake), the grower accepts and chooses leases, changes the choice, ends the
 * link; every route refuses the wrong role and the wrong person.
 */
import { sql } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, signIn, type TestApp } from '../../helpers/test-app';

type Agent = Awaited<ReturnType<typeof signIn>>['agent'];
let t: TestApp;
let adviser: Agent;
let grower3: Agent;
let grower4: Agent;
let regulator: Agent;
let leases: Record<string, string>;

async function userId(email: string): Promise<string> {
  const r = await t.db.pool.query('select id from users where email = $1', [email]);
  return r.rows[0].id;
}

async function addLease(email: string, code: string): Promise<string> {
  const r = await t.db.pool.query(
    `insert into leases (lease_code, holder, species, status, owner_id, geom, area_m2)
     select $1, 'Client test', 'pacific-oyster', 'candidate'::lease_status, $2, g, ST_Area(g::geography)
       from (select ST_Multi(ST_MakeEnvelope(-38.75, 41.15, -38.748, 41.152, 4326)) as g) x
     returning id`,
    [code, await userId(email)],
  );
  return r.rows[0].id;
}

async function mailTo(email: string) {
  const r = await t.db.pool.query(`select subject, text_body from outbox_messages where envelope_to ? $1 order by received_at desc limit 1`, [email]);
  return r.rows[0] as { subject: string; text_body: string } | undefined;
}

async function auditCount(action: string): Promise<number> {
  const r = await t.db.pool.query('select count(*)::int as n from audit_entries where action = $1', [action]);
  return r.rows[0].n;
}

beforeAll(async () => {
  t = await createTestApp();
  await t.db.db.execute(sql`DELETE FROM client_invitations WHERE email IN ('grower3@brackline.test', 'grower4@brackline.test', 'nobody-yet@brackline.test')`);
  await t.db.db.execute(sql`DELETE FROM leases WHERE lease_code LIKE 'CL-%'`);
  adviser = (await signIn(t.app, 'adviser@brackline.test')).agent;
  grower3 = (await signIn(t.app, 'grower3@brackline.test')).agent;
  grower4 = (await signIn(t.app, 'grower4@brackline.test')).agent;
  regulator = (await signIn(t.app, 'regulator@brackline.test')).agent;
  leases = {
    a: await addLease('grower3@brackline.test', 'CL-001'),
    b: await addLease('grower3@brackline.test', 'CL-002'),
    c: await addLease('grower3@brackline.test', 'CL-003'),
    other: await addLease('grower4@brackline.test', 'CL-901'),
  };
}, 120_000);
afterAll(async () => {
  await t.close();
});

describe('an adviser invites a grower, who accepts and chooses leases', () => {
  let invitationId: string;

  it('sends the invitation by e-mail and to the grower’s in-app inbox', async () => {
    const before = await auditCount('client.invite');
    const res = await adviser.post('/api/v1/clients/invitations').send({ email: 'Grower3@Brackline.test', message: 'Shall we look at your two candidate sites?' }).expect(201);
    invitationId = res.body.invitationId;
    expect(res.body.email).toBe('grower3@brackline.test');
    expect(await auditCount('client.invite')).toBe(before + 1);
    const mail = await mailTo('grower3@brackline.test');
    expect(mail?.subject).toMatch(/invites you to share your leases/);
    expect(mail?.text_body).toMatch(/\/advisers/);
    expect(mail?.text_body).toMatch(/two candidate sites/);
    const inbox = await t.db.pool.query(`select title, link from inbox_messages where user_id = $1 and kind = 'invitation'`, [await userId('grower3@brackline.test')]);
    expect(inbox.rows.map((r) => r.link)).toContain('/advisers');
  });

  it('answers the same for an e-mail without an account (nothing is revealed)', async () => {
    const res = await adviser.post('/api/v1/clients/invitations').send({ email: 'nobody-yet@brackline.test' }).expect(201);
    expect(Object.keys(res.body).sort()).toEqual(['email', 'invitationId']);
    expect((await mailTo('nobody-yet@brackline.test'))?.text_body).toMatch(/sign-up/);
  });

  it('refuses a second open invitation to the same grower, one to oneself, and a bad e-mail', async () => {
    const again = await adviser.post('/api/v1/clients/invitations').send({ email: 'grower3@brackline.test' }).expect(409);
    expect(again.body.error.message).toMatch(/already invited/);
    const self = await adviser.post('/api/v1/clients/invitations').send({ email: 'adviser@brackline.test' }).expect(422);
    expect(self.body.error.message).toMatch(/your own e-mail/);
    const bad = await adviser.post('/api/v1/clients/invitations').send({ email: 'not an address' }).expect(400);
    expect(bad.body.error.message).toMatch(/email must be an address/);
  });

  it('the adviser sees the invitation waiting, with no leases', async () => {
    const res = await adviser.get('/api/v1/clients').expect(200);
    const line = res.body.items.find((c: { invitationId: string }) => c.invitationId === invitationId);
    expect(line).toMatchObject({ status: 'pending', grower: { email: 'grower3@brackline.test' }, leases: [] });
  });

  it('only the grower it is addressed to sees and answers it', async () => {
    const mine = await grower3.get('/api/v1/advisers').expect(200);
    expect(mine.body.items.find((i: { invitationId: string }) => i.invitationId === invitationId)).toMatchObject({
      status: 'pending',
      adviser: { email: 'adviser@brackline.test' },
      message: 'Shall we look at your two candidate sites?',
    });
    const theirs = await grower4.get('/api/v1/advisers').expect(200);
    expect(theirs.body.items.find((i: { invitationId: string }) => i.invitationId === invitationId)).toBeUndefined();
    await grower4.post(`/api/v1/advisers/${invitationId}/accept`).send({ leaseIds: [] }).expect(404);
    await grower4.post(`/api/v1/advisers/${invitationId}/decline`).expect(404);
  });

  it('refuses to share a lease the grower does not hold', async () => {
    const res = await grower3.post(`/api/v1/advisers/${invitationId}/accept`).send({ leaseIds: [leases.a, leases.other] }).expect(404);
    expect(res.body.error.message).toMatch(/No lease that you can see/);
    // Nothing changed: still waiting, nothing shared.
    const still = await grower3.get('/api/v1/advisers').expect(200);
    expect(still.body.items.find((i: { invitationId: string }) => i.invitationId === invitationId).status).toBe('pending');
    await adviser.get(`/api/v1/leases/${leases.a}`).expect(404);
  });

  it('accepting shares exactly the chosen leases; the adviser sees them with their ratings', async () => {
    const before = await auditCount('client.accept');
    const res = await grower3.post(`/api/v1/advisers/${invitationId}/accept`).send({ leaseIds: [leases.a, leases.b] }).expect(200);
    const link = res.body.items.find((i: { invitationId: string }) => i.invitationId === invitationId);
    expect(link.status).toBe('accepted');
    expect([...link.leaseIds].sort()).toEqual([leases.a, leases.b].sort());
    expect(await auditCount('client.accept')).toBe(before + 1);
    await adviser.get(`/api/v1/leases/${leases.a}`).expect(200);
    await adviser.get(`/api/v1/leases/${leases.c}`).expect(404);
    const clients = await adviser.get('/api/v1/clients').expect(200);
    const line = clients.body.items.find((c: { invitationId: string }) => c.invitationId === invitationId);
    expect(line.status).toBe('accepted');
    expect(line.grower.name).toMatch(/Bea Lowry/);
    expect(line.leases.map((l: { leaseId: string }) => l.leaseId)).toEqual(['CL-001', 'CL-002']);
    expect(line.leases[0]).toHaveProperty('worstRating');
    await grower3.post(`/api/v1/advisers/${invitationId}/accept`).send({ leaseIds: [] }).expect(409);
  });

  it('the adviser writes a note on a shared lease; the grower reads it', async () => {
    await adviser.post(`/api/v1/leases/${leases.a}/notes`).send({ body: 'CL-001 sits in the plume edge in a 1-in-10-year flood; consider CL-002.' }).expect(201);
    const notes = await grower3.get(`/api/v1/leases/${leases.a}/notes`).expect(200);
    expect(notes.body.items[0]).toMatchObject({ body: expect.stringMatching(/consider CL-002/), author: { role: 'adviser' } });
    const inbox = await t.db.pool.query(`select title, link from inbox_messages where user_id = $1 and kind = 'note'`, [await userId('grower3@brackline.test')]);
    expect(inbox.rows).toContainEqual({ title: expect.stringMatching(/wrote a note on lease CL-001/), link: `/leases/${leases.a}` });
    await adviser.post(`/api/v1/leases/${leases.c}/notes`).send({ body: 'not shared' }).expect(404);
  });

  it('the grower changes which leases are shared: one is granted, one revoked', async () => {
    const res = await grower3.put(`/api/v1/advisers/${invitationId}/leases`).send({ leaseIds: [leases.b, leases.c] }).expect(200);
    expect([...res.body.items.find((i: { invitationId: string }) => i.invitationId === invitationId).leaseIds].sort()).toEqual([leases.b, leases.c].sort());
    await adviser.get(`/api/v1/leases/${leases.a}`).expect(404);
    await adviser.get(`/api/v1/leases/${leases.c}`).expect(200);
    await grower4.put(`/api/v1/advisers/${invitationId}/leases`).send({ leaseIds: [] }).expect(404);
    await grower3.put(`/api/v1/advisers/${invitationId}/leases`).send({ leaseIds: [leases.other] }).expect(404);
  });

  it('the grower ends the link at any time: the adviser stops seeing every lease', async () => {
    await grower4.delete(`/api/v1/advisers/${invitationId}`).expect(404);
    await grower3.delete(`/api/v1/advisers/${invitationId}`).expect(204);
    await adviser.get(`/api/v1/leases/${leases.b}`).expect(404);
    await adviser.get(`/api/v1/leases/${leases.c}`).expect(404);
    const clients = await adviser.get('/api/v1/clients').expect(200);
    expect(clients.body.items.find((c: { invitationId: string }) => c.invitationId === invitationId)).toBeUndefined();
    await grower3.delete(`/api/v1/advisers/${invitationId}`).expect(409);
    // A new invitation can follow.
    await adviser.post('/api/v1/clients/invitations').send({ email: 'grower3@brackline.test' }).expect(201);
  });

  it('a grower declines; an adviser cancels only their own waiting invitations', async () => {
    const inv = await adviser.post('/api/v1/clients/invitations').send({ email: 'grower4@brackline.test' }).expect(201);
    await grower3.post(`/api/v1/advisers/${inv.body.invitationId}/decline`).expect(404);
    await grower4.post(`/api/v1/advisers/${inv.body.invitationId}/decline`).expect(204);
    await grower4.post(`/api/v1/advisers/${inv.body.invitationId}/accept`).send({ leaseIds: [] }).expect(409);
    await adviser.delete(`/api/v1/clients/invitations/${inv.body.invitationId}`).expect(409);
    const waiting = (await adviser.get('/api/v1/clients').expect(200)).body.items.find((c: { grower: { email: string } }) => c.grower.email === 'nobody-yet@brackline.test');
    await adviser.delete(`/api/v1/clients/invitations/${waiting.invitationId}`).expect(204);
  });
});

describe('role checks on every client route', () => {
  const someId = '00000000-0000-4000-8000-000000000000';
  it.each([
    ['get', '/api/v1/clients'],
    ['post', '/api/v1/clients/invitations'],
    ['delete', `/api/v1/clients/invitations/${someId}`],
  ] as const)('%s %s: advisers only', async (method, url) => {
    for (const agent of [grower3, regulator]) {
      const res = await agent[method](url).send({ email: 'grower4@brackline.test' });
      expect(res.status).toBe(403);
    }
    await request(t.app)[method](url).expect(401);
  });

  it.each([
    ['get', '/api/v1/advisers'],
    ['post', `/api/v1/advisers/${someId}/accept`],
    ['post', `/api/v1/advisers/${someId}/decline`],
    ['put', `/api/v1/advisers/${someId}/leases`],
    ['delete', `/api/v1/advisers/${someId}`],
  ] as const)('%s %s: growers only', async (method, url) => {
    for (const agent of [adviser, regulator]) {
      const res = await agent[method](url).send({ leaseIds: [] });
      expect(res.status).toBe(403);
    }
    await request(t.app)[method](url).expect(401);
  });
});
