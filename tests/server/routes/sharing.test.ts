/** Sharing leases with an adviser, revoking, and notes on a lease (issue "Grower's app I"). */
import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, signIn, type TestApp } from '../../helpers/test-app';

type Agent = Awaited<ReturnType<typeof signIn>>['agent'];
let t: TestApp;
let grower: Agent;
let grower2: Agent;
let adviser: Agent;
let regulator: Agent;
let ids: Record<string, string>;
let adviserId: string;

async function userId(email: string): Promise<string> {
  const r = await t.db.pool.query('select id from users where email = $1', [email]);
  return r.rows[0].id;
}

/** A small square lease owned by `email`, outside any jurisdiction (so a regulator sees it only when shared). */
async function addLease(email: string, code: string, status: 'held' | 'candidate' = 'candidate'): Promise<string> {
  const owner = await userId(email);
  const r = await t.db.pool.query(
    `insert into leases (lease_code, holder, species, status, owner_id, geom, area_m2)
     select $1, 'Test holder', 'pacific-oyster', $2::lease_status, $3, g, ST_Area(g::geography)
       from (select ST_Multi(ST_MakeEnvelope(-38.75, 41.15, -38.748, 41.152, 4326)) as g) x
     returning id`,
    [code, status, owner],
  );
  return r.rows[0].id;
}

async function auditCount(action: string): Promise<number> {
  const r = await t.db.pool.query('select count(*)::int as n from audit_entries where action = $1', [action]);
  return r.rows[0].n;
}

beforeAll(async () => {
  t = await createTestApp();
  await t.db.db.execute(sql`DELETE FROM leases`);
  grower = (await signIn(t.app, 'grower@brackline.test')).agent;
  grower2 = (await signIn(t.app, 'grower2@brackline.test')).agent;
  adviser = (await signIn(t.app, 'adviser@brackline.test')).agent;
  regulator = (await signIn(t.app, 'regulator@brackline.test')).agent;
  ids = {
    a: await addLease('grower@brackline.test', 'SH-001'),
    b: await addLease('grower@brackline.test', 'SH-002'),
    c: await addLease('grower@brackline.test', 'SH-003'),
    other: await addLease('grower2@brackline.test', 'G2-001'),
  };
  adviserId = await userId('adviser@brackline.test');
});
afterAll(async () => {
  await t.close();
});

describe('sharing leases with an adviser', () => {
  it('the adviser sees a lease only after the grower shares it', async () => {
    await adviser.get(`/api/v1/leases/${ids.a}`).expect(404);
    expect((await adviser.get('/api/v1/leases?q=SH-').expect(200)).body.total).toBe(0);

    const before = await auditCount('lease.share');
    const res = await grower.post('/api/v1/leases/shares').send({ leaseIds: [ids.a, ids.b], email: 'Adviser@Brackline.test' }).expect(200);
    expect(res.body).toEqual({ shared: 2, grantee: { id: adviserId, name: expect.any(String), email: 'adviser@brackline.test' } });
    expect(await auditCount('lease.share')).toBe(before + 1);

    const lease = await adviser.get(`/api/v1/leases/${ids.a}`).expect(200);
    expect(lease.body.leaseId).toBe('SH-001');
    const list = await adviser.get('/api/v1/leases?q=SH-&withGeometry=false').expect(200);
    expect(list.body.items.map((l: { leaseId: string }) => l.leaseId)).toEqual(['SH-001', 'SH-002']);
    // Still not the third, nor another grower's.
    await adviser.get(`/api/v1/leases/${ids.c}`).expect(404);
  });

  it('is idempotent: sharing again changes nothing and still answers how many are shared', async () => {
    const res = await grower.post('/api/v1/leases/shares').send({ leaseIds: [ids.a, ids.a, ids.b], email: 'adviser@brackline.test' }).expect(200);
    expect(res.body.shared).toBe(2);
    const rows = await t.db.pool.query('select count(*)::int as n from lease_shares where grantee_id = $1', [adviserId]);
    expect(rows.rows[0].n).toBe(2);
  });

  it('lists and revokes shares (holder only), and revoking removes access', async () => {
    const shares = await grower.get(`/api/v1/leases/${ids.b}/shares`).expect(200);
    expect(shares.body.items).toEqual([{ userId: adviserId, name: expect.any(String), email: 'adviser@brackline.test', role: 'adviser', grantedAt: expect.any(String) }]);
    // The adviser sees the lease but does not hold it; another grower does not see it at all.
    const forbidden = await adviser.get(`/api/v1/leases/${ids.b}/shares`).expect(403);
    expect(forbidden.body.error.message).toMatch(/holds lease SH-002/);
    await grower2.get(`/api/v1/leases/${ids.b}/shares`).expect(404);
    await adviser.delete(`/api/v1/leases/${ids.b}/shares/${adviserId}`).expect(403);

    const before = await auditCount('lease.unshare');
    await grower.delete(`/api/v1/leases/${ids.b}/shares/${adviserId}`).expect(204);
    expect(await auditCount('lease.unshare')).toBe(before + 1);
    await adviser.get(`/api/v1/leases/${ids.b}`).expect(404);
    expect((await grower.get(`/api/v1/leases/${ids.b}/shares`).expect(200)).body.items).toEqual([]);
    await grower.delete(`/api/v1/leases/${ids.b}/shares/${adviserId}`).expect(404);
  });

  it('refuses leases the caller does not hold: 403 naming them when visible, 404 when not', async () => {
    // The adviser sees SH-001 (shared) but does not hold it.
    const res = await adviser.post('/api/v1/leases/shares').send({ leaseIds: [ids.a], email: 'regulator@brackline.test' }).expect(403);
    expect(res.body.error.message).toContain(ids.a);
    expect(res.body.error.message).toContain('SH-001');
    // grower2 cannot see grower's leases at all.
    const hidden = await grower2.post('/api/v1/leases/shares').send({ leaseIds: [ids.c], email: 'adviser@brackline.test' }).expect(404);
    expect(hidden.body.error.message).toContain(ids.c);
    // A mix of own and hidden leases shares nothing.
    await grower.post('/api/v1/leases/shares').send({ leaseIds: [ids.c, ids.other], email: 'adviser@brackline.test' }).expect(404);
    await adviser.get(`/api/v1/leases/${ids.c}`).expect(404);
  });

  it('shares only with advisers and regulators, with one answer for every other e-mail', async () => {
    const grower2Email = await grower.post('/api/v1/leases/shares').send({ leaseIds: [ids.c], email: 'grower2@brackline.test' }).expect(422);
    const unknown = await grower.post('/api/v1/leases/shares').send({ leaseIds: [ids.c], email: 'nobody@example.org' }).expect(422);
    const admin = await grower.post('/api/v1/leases/shares').send({ leaseIds: [ids.c], email: 'admin@brackline.test' }).expect(422);
    const message = (r: typeof unknown, email: string) => r.body.error.message.replace(email, '<e-mail>');
    expect(message(grower2Email, 'grower2@brackline.test')).toBe(message(unknown, 'nobody@example.org'));
    expect(message(admin, 'admin@brackline.test')).toBe(message(unknown, 'nobody@example.org'));
    expect(unknown.body.error.message).toBe(
      'nobody@example.org is not an adviser or regulator account on Brackline. Ask them to accept an invitation first.',
    );
    // A regulator can be given access to a candidate lease outside its jurisdiction.
    await regulator.get(`/api/v1/leases/${ids.c}`).expect(404);
    await grower.post('/api/v1/leases/shares').send({ leaseIds: [ids.c], email: 'regulator@brackline.test' }).expect(200);
    await regulator.get(`/api/v1/leases/${ids.c}`).expect(200);
  });

  it('refuses unknown fields, bad ids, empty and oversized selections (400)', async () => {
    const extra = await grower.post('/api/v1/leases/shares').send({ leaseIds: [ids.a], email: 'adviser@brackline.test', role: 'admin' }).expect(400);
    expect(extra.body.error.message).toMatch(/role/);
    await grower.post('/api/v1/leases/shares').send({ leaseIds: ['FB-004'], email: 'adviser@brackline.test' }).expect(400);
    await grower.post('/api/v1/leases/shares').send({ leaseIds: [], email: 'adviser@brackline.test' }).expect(400);
    const many = Array.from({ length: 501 }, () => ids.a);
    await grower.post('/api/v1/leases/shares').send({ leaseIds: many, email: 'adviser@brackline.test' }).expect(400);
    await grower.post('/api/v1/leases/shares').send({ leaseIds: [ids.a], email: 'not-an-address' }).expect(400);
    await adviser.post(`/api/v1/leases/${ids.a}/notes`).send({ body: 'x', pinned: true }).expect(400);
  });
});

describe('notes on a lease', () => {
  it('an adviser with a share writes, the grower reads newest first, others cannot', async () => {
    expect((await grower.get(`/api/v1/leases/${ids.a}/notes`).expect(200)).body.items).toEqual([]);
    const first = await adviser.post(`/api/v1/leases/${ids.a}/notes`).send({ body: '  Move the spat lines north before the wet season.  ' }).expect(201);
    expect(first.body).toMatchObject({ leaseId: ids.a, body: 'Move the spat lines north before the wet season.', author: { id: adviserId, role: 'adviser' } });
    await grower.post(`/api/v1/leases/${ids.a}/notes`).send({ body: 'Done on 3 March.' }).expect(201);

    const notes = await grower.get(`/api/v1/leases/${ids.a}/notes`).expect(200);
    expect(notes.body.items.map((n: { body: string }) => n.body)).toEqual(['Done on 3 March.', 'Move the spat lines north before the wet season.']);
    expect(notes.body.items[1].author.name).toBeTruthy();
    expect((await adviser.get(`/api/v1/leases/${ids.a}/notes`).expect(200)).body.items).toHaveLength(2);

    await grower2.get(`/api/v1/leases/${ids.a}/notes`).expect(404);
    await grower2.post(`/api/v1/leases/${ids.a}/notes`).send({ body: 'hello' }).expect(404);
    const reg = await regulator.post(`/api/v1/leases/${ids.c}/notes`).send({ body: 'hello' }).expect(403);
    expect(reg.body.error.message).toMatch(/cannot do this/);
    // The regulator can read the notes of a lease shared with it.
    await regulator.get(`/api/v1/leases/${ids.c}/notes`).expect(200);
  });

  it('refuses a note from an adviser once the share is revoked, and empty or oversized notes', async () => {
    await adviser.post(`/api/v1/leases/${ids.b}/notes`).send({ body: 'hello' }).expect(404);
    await adviser.post(`/api/v1/leases/${ids.a}/notes`).send({ body: '   ' }).expect(400);
    await adviser.post(`/api/v1/leases/${ids.a}/notes`).send({ body: 'x'.repeat(4001) }).expect(400);
  });

  it('notes go with a deleted lease', async () => {
    await grower.delete(`/api/v1/leases/${ids.a}`).expect(204);
    const r = await t.db.pool.query('select count(*)::int as n from lease_notes where lease_id = $1', [ids.a]);
    expect(r.rows[0].n).toBe(0);
  });
});
