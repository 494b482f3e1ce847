/**
 * Advisers and clients in chromium (issue "Grower's app II"): the adviser invites a grower by
 * e-mail, the grower accepts and shares two candidate sites, the adviser reads their ratings and
 * writes a note on one, the grower reads the note, then stops working with the adviser.
 */
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD } from '../../server/db/seed';
import { browserForThisFile, screenshot, signInThroughForm, watchErrors } from './browser';

const baseUrl = inject('baseUrl');
const browser = browserForThisFile();
const GROWER = 'grower2@brackline.test';
const NOTE = 'FB-010 sits in the brackish margin in a 1-in-10-year flood; FB-039 stays clear more often. I would stock FB-039 first.';
let pool: pg.Pool;
let fb010: string;

beforeAll(async () => {
  pool = new pg.Pool({ connectionString: inject('e2eDatabaseUrl'), max: 1 });
  // The file can run again: no link, shares or notes between the adviser and this grower.
  await pool.query(`delete from client_invitations where email = $1`, [GROWER]);
  await pool.query(
    `delete from lease_shares s using leases l, users g, users a
      where s.lease_id = l.id and l.owner_id = g.id and g.email = $1 and s.grantee_id = a.id and a.email = 'adviser@brackline.test'`,
    [GROWER],
  );
  const lease = await pool.query(`select l.id from leases l join users u on u.id = l.owner_id where u.email = $1 and l.lease_code = 'FB-010'`, [GROWER]);
  fb010 = lease.rows[0].id;
  await pool.query(`delete from lease_notes where lease_id = $1`, [fb010]);
});
afterAll(async () => {
  await pool?.end();
});

async function signInAs(email: string) {
  await browser().clearCookies();
  const page = await browser().newPage();
  const errors = watchErrors(page);
  await signInThroughForm(page, baseUrl, email, DEMO_PASSWORD);
  await page.getByRole('heading', { name: 'Overview', exact: true, level: 1 }).waitFor();
  return { page, errors };
}

describe('an adviser and a new client', () => {
  it('invite, accept with two candidate sites, a note the grower reads, and revoking', async () => {
    // 1. The adviser invites the grower by e-mail.
    {
      const { page, errors } = await signInAs('adviser@brackline.test');
      await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Clients' }).click();
      await page.getByRole('heading', { name: 'Clients', exact: true, level: 1 }).waitFor();
      // The demo client, Saltreed Oysters, with its shared held leases and their ratings.
      await page.getByRole('heading', { name: /Ida Marsh/ }).waitFor();
      const form = page.getByRole('form', { name: 'Invite a grower' });
      await form.getByLabel('Grower’s e-mail').fill(GROWER);
      await form.getByLabel('A short note (optional)').fill('Shall we look at your two candidate sites before the spring floods?');
      await form.getByRole('button', { name: 'Send invitation' }).click();
      await form.getByText(`Invitation sent to ${GROWER}.`).waitFor();
      await page.getByRole('heading', { name: GROWER }).waitFor();
      await page.getByText(/waiting for an answer/).waitFor();
      await screenshot(page, 'clients-1-adviser-invited');
      expect(errors).toEqual([]);
      await page.close();
    }
    const mail = await pool.query(`select subject, text_body from outbox_messages where envelope_to ? $1 order by received_at desc limit 1`, [GROWER]);
    expect(mail.rows[0].subject).toMatch(/invites you to share your leases/);
    expect(mail.rows[0].text_body).toContain('/advisers');

    // 2. The grower accepts and ticks the two candidate sites.
    {
      const { page, errors } = await signInAs(GROWER);
      await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Advisers' }).click();
      await page.getByRole('heading', { name: 'Advisers', exact: true, level: 1 }).waitFor();
      const card = page.getByTestId('adviser').filter({ hasText: 'Tomas Quill' });
      await card.getByText('Shall we look at your two candidate sites').waitFor();
      await card.getByRole('checkbox', { name: /FB-010/ }).check();
      await card.getByRole('checkbox', { name: /FB-039/ }).check();
      await screenshot(page, 'clients-2-grower-chooses');
      await card.getByRole('button', { name: 'Accept and share 2 leases' }).click();
      await page.getByTestId('adviser').filter({ hasText: 'sees 2 of your leases' }).waitFor();
      expect(errors).toEqual([]);
      await page.close();
    }

    // 3. The adviser sees the client's two sites with ratings and writes a note on one report.
    {
      const { page, errors } = await signInAs('adviser@brackline.test');
      await page.goto(`${baseUrl}/clients`);
      const client = page.getByTestId('client').filter({ hasText: 'Owen Carrick' });
      await client.getByRole('rowheader', { name: 'FB-010' }).waitFor();
      await client.getByRole('rowheader', { name: 'FB-039' }).waitFor();
      await expect(client.getByRole('rowheader', { name: 'FB-007' }).count()).resolves.toBe(0);
      await screenshot(page, 'clients-3-adviser-clients');
      await client.getByRole('link', { name: 'Report and notes for FB-010' }).click();
      await page.getByRole('heading', { name: 'Adviser notes' }).waitFor();
      await page.getByLabel('Add a note').fill(NOTE);
      await page.getByRole('button', { name: 'Save note' }).click();
      await page.getByRole('list', { name: 'Notes, newest first' }).getByText(NOTE).waitFor();
      expect(errors).toEqual([]);
      await page.close();
    }

    // 4. The grower reads the note on the lease page, then stops working with the adviser.
    {
      const { page, errors } = await signInAs(GROWER);
      await page.goto(`${baseUrl}/leases/${fb010}`);
      await page.getByRole('list', { name: 'Notes, newest first' }).getByText(NOTE).waitFor();
      await page.getByRole('heading', { name: 'Adviser notes' }).scrollIntoViewIfNeeded();
      await screenshot(page, 'clients-4-grower-reads-note');
      await page.goto(`${baseUrl}/advisers`);
      const card = page.getByTestId('adviser').filter({ hasText: 'Tomas Quill' });
      await card.getByRole('button', { name: 'Stop working with this adviser' }).click();
      await card.getByRole('button', { name: /Yes, stop working with/ }).click();
      await page.getByText('No advisers').waitFor();
      await screenshot(page, 'clients-5-grower-ended');
      expect(errors).toEqual([]);
      await page.close();
    }
    const shares = await pool.query(
      `select count(*)::int as n from lease_shares s join leases l on l.id = s.lease_id join users g on g.id = l.owner_id join users a on a.id = s.grantee_id
        where g.email = $1 and a.email = 'adviser@brackline.test'`,
      [GROWER],
    );
    expect(shares.rows[0].n).toBe(0);
  }, 180_000);
});
