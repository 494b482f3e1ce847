import pg from 'pg';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD } from '../../server/db/seed';
import { browserForThisFile, screenshot, signInThroughForm, watchErrors } from './browser';

const baseUrl = inject('baseUrl');
const browser = browserForThisFile();
const NOTE = 'Spat settles well here; check salinity after the spring floods before stocking.';

let pool: pg.Pool;
let fb004: string;

beforeAll(async () => {
  pool = new pg.Pool({ connectionString: inject('e2eDatabaseUrl'), max: 1 });
  const lease = await pool.query(
    `select l.id from leases l join users u on u.id = l.owner_id where u.email = 'grower@brackline.test' and l.lease_code = 'FB-004'`,
  );
  fb004 = lease.rows[0].id;
  // FB-004 starts private (a candidate lease the demo grower has not shared), so the file can run again.
  await pool.query(`delete from lease_shares where lease_id = $1`, [fb004]);
  await pool.query(`delete from lease_notes where lease_id = $1`, [fb004]);
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

async function openLeases(page: Awaited<ReturnType<typeof signInAs>>['page'], search: string) {
  await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Leases' }).click();
  await page.getByRole('heading', { name: 'Leases', exact: true, level: 1 }).waitFor();
  await page.getByLabel('Find a lease').fill(search);
}

describe('an adviser sees a client’s lease only after the grower shares it', () => {
  it('shares FB-004 from the leases table, then the adviser writes a note the grower reads', async () => {
    // 1. The adviser cannot find or open the grower's candidate lease FB-004.
    {
      const { page, errors } = await signInAs('adviser@brackline.test');
      await openLeases(page, 'FB-004');
      await page.getByText('No lease matches these filters').waitFor();
      await page.goto(`${baseUrl}/leases/${fb004}`);
      await page.getByText('This could not be loaded').waitFor();
      await page.getByText(/not shared with you/).waitFor();
      await screenshot(page, 'sharing-1-adviser-not-yet');
      expect(errors).toEqual([]);
      await page.close();
    }

    // 2. The grower selects FB-004 and shares it with the adviser.
    {
      const { page, errors } = await signInAs('grower@brackline.test');
      await openLeases(page, 'FB-004');
      const table = page.getByRole('table', { name: 'Leases' });
      await table.getByRole('link', { name: 'FB-004', exact: true }).waitFor();
      await page.waitForFunction(() => document.querySelectorAll('table[aria-label="Leases"] tbody tr').length === 1);
      await page.getByLabel('Select FB-004').check();
      const bar = page.getByRole('region', { name: 'Bulk actions' });
      await bar.getByText('1 selected:').waitFor();
      // A grower's e-mail is refused with the one message for every account that is not an adviser's or regulator's.
      await bar.getByRole('textbox', { name: /Share with an adviser/ }).fill('grower2@brackline.test');
      await bar.getByRole('button', { name: 'Share 1 lease' }).click();
      await bar.getByText('is not an adviser or regulator account on Brackline').waitFor();
      await screenshot(page, 'sharing-2-grower-refused');
      await bar.getByRole('textbox', { name: /Share with an adviser/ }).fill('adviser@brackline.test');
      await bar.getByRole('button', { name: 'Share 1 lease' }).click();
      await page.getByText('1 lease is now shared with').waitFor();
      expect(await page.getByRole('region', { name: 'Bulk actions' }).count()).toBe(0);
      await screenshot(page, 'sharing-3-grower-shared');
      expect(errors).toEqual([]);
      await page.close();
    }

    // 3. The adviser now sees FB-004, opens it and writes a note.
    {
      const { page, errors } = await signInAs('adviser@brackline.test');
      await openLeases(page, 'FB-004');
      await page.getByRole('table', { name: 'Leases' }).getByRole('link', { name: 'FB-004', exact: true }).click();
      await page.getByRole('heading', { name: 'Lease FB-004' }).waitFor();
      await page.getByRole('heading', { name: 'Adviser notes' }).waitFor();
      await page.getByText('No notes yet').waitFor();
      await page.getByLabel('Add a note').fill(NOTE);
      await page.getByRole('button', { name: 'Save note' }).click();
      const notes = page.getByRole('list', { name: 'Notes, newest first' });
      await notes.getByText(NOTE).waitFor();
      expect(await notes.locator('li').count()).toBe(1);
      await page.getByRole('heading', { name: 'Adviser notes' }).scrollIntoViewIfNeeded();
      await screenshot(page, 'sharing-4-adviser-note');
      expect(errors).toEqual([]);
      await page.close();
    }

    // 4. The grower opens FB-004 and reads the adviser's note.
    {
      const { page, errors } = await signInAs('grower@brackline.test');
      await openLeases(page, 'FB-004');
      await page.getByRole('table', { name: 'Leases' }).getByRole('link', { name: 'FB-004', exact: true }).click();
      await page.getByRole('heading', { name: 'Lease FB-004' }).waitFor();
      const notes = page.getByRole('list', { name: 'Notes, newest first' });
      await notes.getByText(NOTE).waitFor();
      expect(await notes.locator('li').first().textContent()).toMatch(/Adviser/);
      await screenshot(page, 'sharing-5-grower-reads-note');

      // 5. The grower stops sharing FB-004 with the adviser from the lease page.
      const people = page.getByRole('list', { name: 'People who can see FB-004' });
      await people.getByText('adviser@brackline.test', { exact: false }).waitFor();
      await people.getByRole('button', { name: /Stop sharing FB-004 with/ }).click();
      await page.getByText('Nobody: only you.', { exact: false }).waitFor();
      expect(errors).toEqual([]);
      await page.close();
    }

    // 6. The adviser no longer finds FB-004.
    {
      const { page, errors } = await signInAs('adviser@brackline.test');
      await page.getByRole('heading', { name: 'Overview', exact: true, level: 1 }).waitFor();
      const res = await page.request.get(`${baseUrl}/api/v1/leases?q=FB-004&withGeometry=false`);
      expect((await res.json()).total).toBe(0);
      expect(errors).toEqual([]);
      await page.close();
    }
  });
});
