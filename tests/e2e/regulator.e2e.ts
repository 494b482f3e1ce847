/**
 * The regulator's workspace in chromium (issue #8): set a trigger from the model's suggestion,
 * run a closure check at a flood flow, close a zone (growers' e-mails land in the outbox and the
 * public page shows it closed), an early reopening refused, then a reopening after the minimum
 * period with a passing sample. Also draws a zone on the map and reads the audit log.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD } from '../../server/db/seed';
import { browserForThisFile, screenshot, signInThroughForm, watchErrors } from './browser';

const baseUrl = inject('baseUrl');
const browser = browserForThisFile();
const ZONE = 'Fennick Bay inner zone';
/** The zone's plan trigger in the demo files (demo-data/README.md: the Amberlin's 2-year flood, rounded down). */
const PLAN_TRIGGER = (
  JSON.parse(readFileSync(path.resolve(import.meta.dirname, '../../demo-data/zones/fennick-zones.geojson'), 'utf8')).features as {
    properties: { ZONE_NAME: string; TRIGGER_M3S: number };
  }[]
).find((z) => z.properties.ZONE_NAME === ZONE)!.properties.TRIGGER_M3S;
const DRAWN = 'Wenlow flats (drawn)';
const GROWERS = ['grower@brackline.test', 'grower2@brackline.test', 'grower3@brackline.test', 'grower4@brackline.test'];

let pool: pg.Pool;

async function mailCount(subject: string): Promise<Map<string, number>> {
  const rows = await pool.query(`select envelope_to from outbox_messages where subject = $1`, [subject]);
  const counts = new Map<string, number>();
  for (const r of rows.rows) for (const to of r.envelope_to as string[]) counts.set(to, (counts.get(to) ?? 0) + 1);
  return counts;
}

/** Waits until every grower has one e-mail with this subject (the SMTP fake stores them as they arrive). */
async function waitForGrowerMail(subject: string) {
  for (let i = 0; i < 100; i++) {
    const counts = await mailCount(subject);
    if (GROWERS.every((g) => counts.get(g) === 1)) return counts;
    await new Promise((r) => setTimeout(r, 100));
  }
  return mailCount(subject);
}

beforeAll(async () => {
  pool = new pg.Pool({ connectionString: inject('e2eDatabaseUrl'), max: 1 });
  // The file can run again: the zone starts open with its plan trigger and no samples or notice mail.
  await pool.query(`update closure_zones set status = 'open', status_since = now(), trigger_flow = $2 where name = $1`, [ZONE, PLAN_TRIGGER]);
  await pool.query(`delete from zone_samples where zone_id = (select id from closure_zones where name = $1)`, [ZONE]);
  await pool.query(`delete from closure_zones where name = $1`, [DRAWN]);
  await pool.query(`delete from notices`);
  await pool.query(`delete from outbox_messages where subject like 'Closure notice:%' or subject like 'Reopening notice:%'`);
});
afterAll(async () => {
  await pool?.end();
});

async function signInAsRegulator() {
  await browser().clearCookies();
  const page = await browser().newPage();
  const errors = watchErrors(page);
  await signInThroughForm(page, baseUrl, 'regulator@brackline.test', DEMO_PASSWORD);
  await page.getByRole('heading', { name: 'Overview', exact: true, level: 1 }).waitFor();
  return { page, errors };
}

type Page = Awaited<ReturnType<typeof signInAsRegulator>>['page'];
/** Follows a main-menu link and waits until the router has committed the new page (the link is then the current one). */
async function nav(page: Page, name: string) {
  const link = page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name, exact: true });
  await link.click();
  await page.waitForFunction((label) => {
    const current = document.querySelector('nav[aria-label="Main"] a[aria-current="page"]');
    return current?.textContent?.trim() === label;
  }, name);
}

/** "YYYY-MM-DDTHH:mm" in the browser's local time, for a datetime-local field. */
function localInput(d: Date): string {
  const p = (n: number) => String(n).padStart(2, '0');
  return `${d.getFullYear()}-${p(d.getMonth() + 1)}-${p(d.getDate())}T${p(d.getHours())}:${p(d.getMinutes())}`;
}

async function issue(page: Page, kind: 'Closure' | 'Reopening', flow?: string) {
  await nav(page, 'Notices');
  await page.getByRole('heading', { name: 'Notices', exact: true }).waitFor();
  const form = page.getByRole('form', { name: 'Issue a notice' });
  await form.getByRole('radio', { name: kind }).check();
  await form.getByRole('checkbox', { name: new RegExp(ZONE) }).check();
  if (flow) await form.getByLabel(/River flow that prompted it/).fill(flow);
  await form.getByRole('button', { name: 'Issue the notice' }).click();
}

describe('a regulator justifies a trigger, checks a flood, closes and reopens a zone', () => {
  it('runs the whole workflow through the screens', async () => {
    const { page, errors } = await signInAsRegulator();

    // 1. Zones list, then the zone: the model's suggested trigger becomes the plan's.
    await nav(page, 'Zones');
    const zones = page.getByRole('table', { name: 'Closure zones' });
    await zones.getByRole('link', { name: ZONE }).waitFor();
    await screenshot(page, 'regulator-1-zones');
    await zones.getByRole('link', { name: ZONE }).click();
    await page.getByRole('heading', { name: ZONE }).waitFor();
    await page.getByText('Model’s suggestion', { exact: true }).waitFor();
    await page.getByRole('button', { name: 'Use the model’s suggestion' }).click();
    const trigger = page.getByLabel('Trigger flow (m³/s)');
    await expect.poll(() => trigger.inputValue()).not.toBe(String(PLAN_TRIGGER));
    const suggested = Number(await trigger.inputValue());
    expect(suggested).toBeGreaterThan(0);
    expect(suggested).not.toBe(PLAN_TRIGGER);
    await page.getByRole('button', { name: 'Save plan values' }).click();
    await page.getByText('Plan values saved').waitFor();
    const saved = await pool.query(`select trigger_flow from closure_zones where name = $1`, [ZONE]);
    expect(saved.rows[0].trigger_flow).toBe(suggested);
    await page.locator('.recharts-line').first().waitFor();
    await screenshot(page, 'regulator-2-zone-trigger');

    // 2. Closure check at a flood flow: table, map and CSV.
    await nav(page, 'Closure check');
    await page.getByLabel('River', { exact: true }).selectOption({ label: 'Amberlin River' });
    await page.getByLabel('Flow (m³/s)', { exact: true }).fill('1200');
    await page.getByRole('button', { name: 'Run the check' }).click();
    const zoneRow = page.getByRole('table', { name: 'Zones at this flow' }).getByRole('row', { name: new RegExp(ZONE) });
    await zoneRow.getByText(/At or above/).waitFor();
    const leases = page.getByRole('table', { name: 'Held leases at this flow' });
    await leases.getByRole('cell', { name: 'FB-001', exact: true }).waitFor();
    expect(await leases.getByRole('cell', { name: 'FB-004', exact: true }).count()).toBe(0);
    await page.locator('[data-drawn]').waitFor();
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Export CSV' }).click()]);
    const csv = readFileSync((await download.path())!, 'utf8');
    expect(csv).toMatch(/# Model brackline-model-/);
    expect(csv).toMatch(/held lease,FB-001,Saltreed Oysters/);
    expect(csv).toMatch(/zone,Fennick Bay inner zone,/);
    await screenshot(page, 'regulator-3-closure-check');

    // 3. A closure notice: every grower with a held lease in the zone is e-mailed.
    await issue(page, 'Closure', '2000');
    await page.getByText('Closure notice issued').waitFor();
    // The four demo growers, and any other grower whose held lease in the zone joined the region (other browser
    // tests upload demo leases as new growers; a lease saved inside a region's area joins it).
    const told = (
      await pool.query(
        `select count(distinct l.owner_id)::int as n from closure_zones z join leases l on l.status = 'held' and l.jurisdiction_id = z.jurisdiction_id
            and ST_Intersects(l.geom, z.geom) join users u on u.id = l.owner_id and not u.disabled where z.name = $1`,
        [ZONE],
      )
    ).rows[0].n as number;
    expect(told).toBeGreaterThanOrEqual(4);
    await page.getByText(`${told} growers told, ${told} e-mails sent`).waitFor();
    await screenshot(page, 'regulator-4-closure-notice');
    const closureMail = await waitForGrowerMail(`Closure notice: ${ZONE}`);
    for (const g of GROWERS) expect(closureMail.get(g), g).toBe(1);

    // 4. The public page (no sign-in) shows the zone closed.
    {
      const pub = await browser().newPage();
      const pubErrors = watchErrors(pub);
      await browser().clearCookies();
      await pub.goto(`${baseUrl}/status/fennick-coast`);
      const row = pub.getByRole('table', { name: 'Zone status' }).getByRole('row', { name: new RegExp(ZONE) });
      await row.getByText('Closed').waitFor();
      await pub.getByRole('list', { name: 'Recent notices' }).getByText(`Closure: ${ZONE}`).first().waitFor();
      await screenshot(pub, 'regulator-5-public-status-closed');
      expect(pubErrors).toEqual([]);
      await pub.close();
    }
    expect(errors).toEqual([]);
    await page.close();
  });

  it('refuses an early reopening, then reopens after the minimum period and a passing sample', async () => {
    const { page, errors } = await signInAsRegulator();

    // 5. Too early: refused with the reason and the earliest date.
    await issue(page, 'Reopening');
    await page.getByText('No notice was issued').waitFor();
    await page.getByText(/cannot reopen yet: it closed on .* minimum closure is 5 days/).waitFor();
    await screenshot(page, 'regulator-6-early-reopening-refused');

    // 6. Simulate the minimum closure passing: move the closure's start six days back in the test database.
    await pool.query(`update closure_zones set status_since = now() - interval '6 days' where name = $1`, [ZONE]);
    await nav(page, 'Zones');
    await page.getByRole('table', { name: 'Closure zones' }).getByRole('link', { name: ZONE }).click();
    await page.getByRole('heading', { name: ZONE }).waitFor();
    const sample = page.getByRole('form', { name: 'Enter a sample result' });
    await sample.getByLabel('Taken at').fill(localInput(new Date(Date.now() - 3_600_000)));
    await sample.getByLabel(/Result \(per 100 mL\)/).fill('4');
    await sample.getByLabel('Notes (optional)').fill('Station FB-S2, after the flood');
    await sample.getByRole('button', { name: 'Enter the result' }).click();
    await page.getByRole('table', { name: 'Sample results' }).getByText('Passes (at or under 14)').waitFor();
    await page.getByText('Reopening pending').first().waitFor();
    await screenshot(page, 'regulator-7-zone-sample-passed');

    // 7. The reopening goes through and the growers hear about it.
    await issue(page, 'Reopening');
    await page.getByText('Reopening notice issued').waitFor();
    const reopenMail = await waitForGrowerMail(`Reopening notice: ${ZONE}`);
    for (const g of GROWERS) expect(reopenMail.get(g), g).toBe(1);
    await page.getByRole('table', { name: 'Notices issued' }).getByText(`${ZONE}: Reopening pending → Open`).waitFor();
    await screenshot(page, 'regulator-8-notices');

    // 8. The audit log shows the trigger change with before and after, and the status changes.
    await nav(page, 'Audit log');
    const audit = page.getByRole('table', { name: 'Audit log' });
    await audit.getByText('zone.trigger-change').first().waitFor();
    await audit.getByText('notice.reopening').first().waitFor();
    await screenshot(page, 'regulator-9-audit-log');
    expect(errors).toEqual([]);
    await page.close();

    const pub = await browser().newPage();
    await pub.goto(`${baseUrl}/status/fennick-coast`);
    await pub
      .getByRole('table', { name: 'Zone status' })
      .getByRole('row', { name: new RegExp(ZONE) })
      .getByText('Open')
      .waitFor();
    await pub.close();
  });

  it('draws a new zone on the map', async () => {
    const { page, errors } = await signInAsRegulator();
    await nav(page, 'Zones');
    await page.getByRole('button', { name: 'Draw a zone' }).click();
    const map = page.getByRole('application', { name: /Map for drawing the zone/ });
    await map.locator('canvas').first().waitFor();
    const box = (await map.boundingBox())!;
    const at = (fx: number, fy: number) => ({ x: box.x + box.width * fx, y: box.y + box.height * fy });
    for (const [fx, fy] of [
      [0.45, 0.45],
      [0.55, 0.45],
      [0.55, 0.55],
    ]) {
      const p = at(fx, fy);
      await page.mouse.click(p.x, p.y);
    }
    const last = at(0.45, 0.55);
    await page.mouse.dblclick(last.x, last.y);
    await page.getByText(/Outline drawn with 4 corners/).waitFor();
    await page.getByLabel('Zone name').fill(DRAWN);
    await page.getByLabel('River whose flow closes it').selectOption({ label: 'Tolley Brook' });
    await page.getByLabel('Trigger flow (m³/s)').fill('80');
    await screenshot(page, 'regulator-10-draw-zone');
    await page.getByRole('button', { name: 'Save the zone' }).click();
    await page.getByRole('heading', { name: DRAWN }).waitFor();
    const row = await pool.query(`select trigger_flow, area_m2 from closure_zones where name = $1`, [DRAWN]);
    expect(row.rows[0].trigger_flow).toBe(80);
    expect(row.rows[0].area_m2).toBeGreaterThan(0);
    expect(errors).toEqual([]);
    await page.close();
  });
});
