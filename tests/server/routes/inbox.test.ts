/** The in-app inbox: each user reads and marks only their own messages; a repeated dedupe key is delivered once. */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { deliverToInbox } from '../../../server/services/inbox.service';
import { createTestApp, signIn, type TestApp } from '../../helpers/test-app';

type Agent = Awaited<ReturnType<typeof signIn>>['agent'];
let t: TestApp;
let grower: Agent;
let grower2: Agent;
let growerId: string;

async function userId(email: string): Promise<string> {
  const r = await t.db.pool.query('select id from users where email = $1', [email]);
  return r.rows[0].id;
}

beforeAll(async () => {
  t = await createTestApp();
  await t.db.pool.query('delete from inbox_messages');
  grower = (await signIn(t.app, 'grower@brackline.test')).agent;
  grower2 = (await signIn(t.app, 'grower2@brackline.test')).agent;
  growerId = await userId('grower@brackline.test');
});
afterAll(async () => {
  await t.close();
});

describe('inbox', () => {
  it('delivers once per dedupe key and lists newest first with the unread count', async () => {
    const first = await deliverToInbox(t.db.db, [
      { userId: growerId, kind: 'notice', title: 'Zone closed', body: 'The inner zone closed.', dedupeKey: 'notice-1' },
    ]);
    const again = await deliverToInbox(t.db.db, [
      { userId: growerId, kind: 'notice', title: 'Zone closed', body: 'The inner zone closed.', dedupeKey: 'notice-1' },
      { userId: growerId, kind: 'alert', title: 'Flow rising', body: 'Gauge passed 500 m³/s.', link: '/leases', dedupeKey: 'alert-1' },
    ]);
    expect(first).toBe(1);
    expect(again).toBe(1);
    const res = await grower.get('/api/v1/inbox').expect(200);
    expect(res.body.unread).toBe(2);
    expect(res.body.items.map((m: { title: string }) => m.title)).toEqual(['Flow rising', 'Zone closed']);
  });

  it('marks a message read for its owner only; another user gets 404', async () => {
    const { body } = await grower.get('/api/v1/inbox').expect(200);
    const id = body.items[0].id;
    await grower2.post(`/api/v1/inbox/${id}/read`).expect(404);
    expect((await grower2.get('/api/v1/inbox').expect(200)).body.items).toEqual([]);
    await grower.post(`/api/v1/inbox/${id}/read`).expect(204);
    const after = await grower.get('/api/v1/inbox').expect(200);
    expect(after.body.unread).toBe(1);
    expect(after.body.items[0].readAt).not.toBeNull();
    // The count is over every message, not only the page: the unread one is beyond a one-message page.
    const page = await grower.get('/api/v1/inbox?limit=1').expect(200);
    expect(page.body.items.map((m: { readAt: string | null }) => m.readAt !== null)).toEqual([true]);
    expect(page.body.unread).toBe(1);
  });

  it('refuses a malformed id and a limit out of range with messages naming the field', async () => {
    const bad = await grower.post('/api/v1/inbox/not-a-uuid/read').expect(400);
    expect(JSON.stringify(bad.body)).toContain('message id');
    const big = await grower.get('/api/v1/inbox?limit=1000').expect(400);
    expect(JSON.stringify(big.body)).toContain('at most 200');
  });
});
