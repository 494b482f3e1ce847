import { describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD } from '../../server/db/seed';
import { screenshot, signInThroughForm, browserForThisFile, watchErrors } from './browser';

const baseUrl = inject('baseUrl');
const browser = browserForThisFile();

const EXPECTED_NAV = {
  grower: { sees: ['Overview', 'Leases', 'Exposure map', 'Compare', 'Plume calculator', 'Rivers', 'Alerts', 'Advisers', 'Plan'], doesNotSee: ['People', 'Outbox', 'Zones', 'Closure check', 'Notices'] },
  adviser: { sees: ['Overview', 'Clients', 'Leases', 'Exposure map', 'Compare', 'Plume calculator', 'Rivers', 'Alerts', 'Plan'], doesNotSee: ['People', 'Outbox', 'Zones', 'Closure check', 'Notices'] },
  regulator: {
    sees: ['Overview', 'Leases', 'Exposure map', 'Plume calculator', 'Zones', 'Closure check', 'Notices', 'Audit log', 'Rivers', 'Alerts'],
    doesNotSee: ['People', 'Outbox', 'Plan', 'Compare'],
  },
  admin: { sees: ['Overview', 'People', 'Outbox', 'Audit log'], doesNotSee: ['Plume calculator', 'Leases', 'Exposure map', 'Compare'] },
} as const;

describe('each demo role signs in and sees its own navigation', () => {
  it.each(Object.keys(EXPECTED_NAV) as (keyof typeof EXPECTED_NAV)[])('%s', async (role) => {
    const page = await browser().newPage();
    const errors = watchErrors(page);
    await browser().clearCookies();
    await signInThroughForm(page, baseUrl, `${role}@brackline.test`, DEMO_PASSWORD);
    await page.getByRole('heading', { name: 'Overview', exact: true, level: 1 }).waitFor();
    const nav = page.getByRole('navigation', { name: 'Main' });
    for (const label of EXPECTED_NAV[role].sees) {
      expect(await nav.getByRole('link', { name: label }).count(), `${role} sees ${label}`).toBe(1);
    }
    for (const label of EXPECTED_NAV[role].doesNotSee) {
      expect(await nav.getByRole('link', { name: label }).count(), `${role} does not see ${label}`).toBe(0);
    }
    expect(await page.getByTestId('role-badge').textContent()).toMatch(new RegExp(role === 'admin' ? 'Administrator' : role, 'i'));
    // The cautions are on the overview, visible without scrolling past results.
    expect(await page.getByRole('complementary', { name: 'Cautions' }).isVisible()).toBe(true);
    // The shipped font is loaded (no font CDN).
    expect(await page.evaluate(() => document.fonts.check('16px "Merriweather Sans"'))).toBe(true);
    await screenshot(page, `overview-${role}`);
    expect(errors).toEqual([]);
    await page.close();
  });
});

describe('sign-in problems', () => {
  it('shows a clear message for a wrong password', async () => {
    await browser().clearCookies();
    const page = await browser().newPage();
    await signInThroughForm(page, baseUrl, 'grower@brackline.test', 'not-the-right-one');
    const alert = page.getByRole('alert').first();
    await alert.waitFor();
    expect(await alert.textContent()).toMatch(/do not match an account/);
    await screenshot(page, 'sign-in-wrong-password');
    await page.close();
  });

  it('sends an anonymous visitor to sign-in', async () => {
    await browser().clearCookies();
    const page = await browser().newPage();
    await page.goto(`${baseUrl}/admin/people`);
    await page.getByRole('heading', { name: 'Sign in' }).waitFor();
    expect(page.url()).toContain('/sign-in');
    await page.close();
  });
});

describe('sign-up', () => {
  it('a new grower creates an account and lands on the overview', async () => {
    await browser().clearCookies();
    const page = await browser().newPage();
    await page.goto(`${baseUrl}/sign-up`);
    await page.getByLabel('Your name').fill('Nell Brine');
    await page.getByLabel('E-mail').fill(`nell.${Date.now()}@brackline.test`);
    await page.getByLabel('Password').fill('short');
    await page.getByLabel('Your name').click();
    await page.getByText('password must be at least 10 characters').waitFor();
    await page.getByLabel('Password').fill('a-good-long-password');
    await page.getByRole('button', { name: 'Create account' }).click();
    await page.getByRole('heading', { name: 'Overview', exact: true, level: 1 }).waitFor();
    await screenshot(page, 'sign-up-done');
    await page.close();
  });
});
