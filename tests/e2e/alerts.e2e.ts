import pg from 'pg';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD } from '../../server/db/seed';
import { browserForThisFile, screenshot, signInThroughForm, watchErrors } from './browser';

const baseUrl = inject('baseUrl');
const feedUrl = inject('gaugeFeedUrl');
const browser = browserForThisFile();
let pool: pg.Pool;

async function waitForRow<T extends pg.QueryResultRow>(what: string, sql: string, params: unknown[], timeoutMs = 30_000): Promise<T> {
  const started = Date.now();
  for (;;) {
    const r = await pool.query<T>(sql, params);
    if (r.rows[0]) return r.rows[0];
    if (Date.now() - started > timeoutMs) throw new Error(`Timed out waiting for ${what}`);
    await new Promise((res) => setTimeout(res, 250));
  }
}

beforeAll(async () => {
  pool = new pg.Pool({ connectionString: inject('e2eDatabaseUrl'), max: 1 });
  // The grower starts on the Free plan with no alerts, so the file can run again.
  const grower = `(select id from users where email = 'grower@brackline.test')`;
  await pool.query(`delete from billing_accounts where user_id = ${grower}`);
  await pool.query(`delete from alert_rules where user_id = ${grower}`);
  await pool.query(`delete from inbox_messages where kind = 'alert' and user_id = ${grower}`);
  await pool.query(`delete from outbox_messages where envelope_to @> '["grower@brackline.test"]'::jsonb`);
  await pool.query(`delete from alert_rules where user_id = (select id from users where email = 'regulator@brackline.test')`);
});
afterAll(async () => {
  await pool?.end();
});

describe('a grower buys the Alerts plan and gets an alert from the gauge feed', () => {
  it('checkout on the payment page, a lease alert, a rising gauge → inbox and e-mail', async () => {
    const page = await browser().newPage();
    const errors = watchErrors(page);
    await signInThroughForm(page, baseUrl, 'grower@brackline.test', DEMO_PASSWORD);
    await page.getByRole('heading', { name: 'Overview', exact: true, level: 1 }).waitFor();

    // 1. On the Free plan, the Alerts page points to the plan.
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Alerts' }).click();
    await page.getByText('Lease alerts are part of the Alerts plan').waitFor();
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Plan' }).click();
    await page.getByRole('heading', { name: 'Plan', exact: true, level: 1 }).waitFor();
    await page.getByText('Subscription: No subscription').waitFor();
    await screenshot(page, 'alerts-1-plan-free');

    // 2. The payment page: the declined card first, then the good one.
    await page.getByRole('button', { name: 'Choose the Alerts plan' }).click();
    await page.getByRole('heading', { name: 'Brackline Alerts plan' }).waitFor();
    await page.getByLabel('Card number').fill('4000 0000 0000 0002');
    await page.getByRole('button', { name: 'Pay and subscribe' }).click();
    await page.getByText('Your card was declined').waitFor();
    await screenshot(page, 'alerts-2-checkout-declined');
    await page.getByLabel('Card number').fill('4242 4242 4242 4242');
    await page.getByRole('button', { name: 'Pay and subscribe' }).click();
    await page.getByText('Your Alerts plan is on').waitFor({ timeout: 20_000 });
    await page.getByText('Subscription: Active').waitFor();
    await screenshot(page, 'alerts-3-plan-active');

    // 3. A lease alert: FB-001 entering the plume edge of the Amberlin River.
    await page.getByRole('link', { name: 'Alerts', exact: true }).first().click();
    await page.getByRole('heading', { name: 'Alerts', exact: true }).waitFor();
    const form = page.getByRole('form', { name: 'New lease alert' });
    const leaseValue = await form.getByLabel('Lease').locator('option', { hasText: 'FB-001' }).getAttribute('value');
    await form.getByLabel('Lease').selectOption(leaseValue!);
    const riverValue = await form.getByLabel('River').locator('option', { hasText: 'Amberlin River' }).getAttribute('value');
    await form.getByLabel('River').selectOption(riverValue!);
    await form.getByLabel('Band').locator('option[value="plume-edge"]').waitFor({ state: 'attached', timeout: 30_000 });
    await form.getByLabel('Band').selectOption('plume-edge');
    await form.getByRole('button', { name: 'Set alert' }).click();
    await page.getByText(/Lease FB-001: Plume edge/).waitFor();
    const rule = await waitForRow<{ threshold_flow: number }>(
      'the rule',
      `select threshold_flow from alert_rules r join users u on u.id = r.user_id where u.email = 'grower@brackline.test'`,
      [],
    );

    // 4. The gauge feed: the river falls, then rises past the lease's flow.
    const high = Math.round(rule.threshold_flow * 3);
    for (const discharge of [rule.threshold_flow / 10, high]) {
      const res = await fetch(`${feedUrl}/_fake/readings`, { method: 'POST', headers: { 'Content-Type': 'application/json' }, body: JSON.stringify({ code: 'FCSA-G01', discharge }) });
      expect(res.status).toBe(201);
    }
    const inbox = await waitForRow<{ title: string; body: string }>(
      'the alert in the inbox',
      `select i.title, i.body from inbox_messages i join users u on u.id = i.user_id where u.email = 'grower@brackline.test' and i.kind = 'alert' and i.body like $1`,
      [`%read ${high} m³/s%`],
    );
    expect(inbox.title).toContain('FB-001');
    const mail = await waitForRow<{ subject: string; text_body: string }>(
      'the alert e-mail',
      `select subject, text_body from outbox_messages where envelope_to @> '["grower@brackline.test"]'::jsonb and text_body like $1`,
      [`%read ${high} m³/s%`],
    );
    expect(mail.text_body).toContain('Lease: FB-001');
    expect(mail.text_body).toContain('Cautions:');

    // 5. The alerts page shows it with its e-mail delivered.
    await page.reload();
    await page.getByRole('table').getByText(`${high} m³/s`).first().waitFor({ timeout: 20_000 });
    await page.getByText(/E-mailed/).first().waitFor();
    await screenshot(page, 'alerts-4-alert-sent');
    expect(errors).toEqual([]);
    await page.close();
  }, 120_000);

  it('a regulator sets a free closure-zone alert', async () => {
    await browser().clearCookies();
    const page = await browser().newPage();
    const errors = watchErrors(page);
    await signInThroughForm(page, baseUrl, 'regulator@brackline.test', DEMO_PASSWORD);
    await page.getByRole('heading', { name: 'Overview', exact: true, level: 1 }).waitFor();
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Alerts' }).click();
    const form = page.getByRole('form', { name: 'New closure-zone alert' });
    const zone = form.getByLabel('Closure zone');
    await zone.locator('option:not([disabled])').nth(1).waitFor({ state: 'attached' });
    const value = await zone.locator('option:not([disabled])').nth(1).getAttribute('value');
    await zone.selectOption(value!);
    await form.getByLabel('Approaching at (% of the trigger)').fill('75');
    await form.getByRole('button', { name: 'Set alert' }).click();
    await page.getByText(/Closure zone .*: trigger flow/).waitFor();
    await page.getByText(/approaching from/).waitFor();
    await screenshot(page, 'alerts-5-regulator-zone');
    expect(errors).toEqual([]);
    await page.close();
  });
});
