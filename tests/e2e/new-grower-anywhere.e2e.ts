/**
 * Issue #15 in chromium: a new grower on a coast nobody has set up (not the demo region) signs up
 * with no region, places a river by pressing on the built-in world coastline and dragging the
 * outflow arrow, uploads the gauge record and a lease file, and reads the ratings. The only GIS
 * file is the leases. The place is only coordinates on a straight, west-facing sandy coast.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, inject, it } from 'vitest';
import { browserForThisFile, screenshot, watchErrors } from './browser';

const baseUrl = inject('baseUrl');
const browser = browserForThisFile();
const PLACE = { lat: 44.5, lon: -1.25 };
/** About 2 km north of the mouth and half a kilometre offshore: to the right of a westward outflow. */
const LEASES = {
  type: 'FeatureCollection',
  features: [
    {
      type: 'Feature',
      properties: { LEASE_ID: 'DUNE-1', SPECIES: 'pacific-oyster' },
      geometry: {
        type: 'Polygon',
        coordinates: [
          [
            [-1.262, 44.518],
            [-1.258, 44.518],
            [-1.258, 44.521],
            [-1.262, 44.521],
            [-1.262, 44.518],
          ],
        ],
      },
    },
  ],
};

describe('a new grower anywhere gets an answer', () => {
  it('signs up with no region, places a river on the built-in coast, uploads a record and leases, and reads ratings', async () => {
    await browser().clearCookies();
    const page = await browser().newPage();
    const errors = watchErrors(page);
    await page.goto(`${baseUrl}/sign-up`);
    await page.getByRole('heading', { name: 'Create a grower account', level: 1 }).waitFor();
    await page.getByLabel('Your name').fill('Dune Oyster Test');
    await page.getByLabel('E-mail').fill(`dune.${Date.now()}@brackline.test`);
    await page.getByLabel('Password').fill('a-good-long-password');
    // No region: the list offers the demo region, the grower keeps "None".
    const region = page.getByLabel('Region (optional)');
    await region.locator('option', { hasText: 'Fennick Coast Shellfish Authority' }).waitFor({ state: 'attached' });
    expect(await region.inputValue()).toBe('');
    await page.getByRole('button', { name: 'Create account' }).click();

    // The Overview lists the steps to an answer, none done yet.
    await page.getByRole('heading', { name: 'Overview', exact: true, level: 1 }).waitFor();
    const steps = page.getByRole('list', { name: 'Steps to an answer' });
    await steps.waitFor();
    expect(await steps.locator('li[data-done="no"]').count()).toBe(4);
    await screenshot(page, 'anywhere-1-first-steps');

    // A river placed on the map: go to the coast, press on it and drag the arrow out to sea (west).
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Rivers' }).click();
    await page.getByRole('heading', { name: 'Rivers', exact: true, level: 1 }).waitFor();
    const form = page.getByRole('form', { name: 'Set up a river' });
    await form.getByLabel('Go to latitude (°)').fill(String(PLACE.lat));
    await form.getByLabel('Go to longitude (°)').fill(String(PLACE.lon));
    await form.getByRole('button', { name: 'Show the coast here' }).click();
    const map = page.getByRole('application', { name: /Map for placing the river mouth/ });
    // The built-in coast is read on the server on first use (a few seconds).
    await page.waitForSelector('[data-coast="drawn"]', { timeout: 60_000 });
    await form.getByText(/© OpenStreetMap contributors/).waitFor();
    await form.getByRole('button', { name: 'Place the mouth' }).click();
    const box = (await map.boundingBox())!;
    const cx = box.x + box.width / 2;
    const cy = box.y + box.height / 2;
    await page.mouse.move(cx, cy);
    await page.mouse.down();
    await page.waitForSelector('[data-mouth="placed"]');
    // The server's check of the placed mouth (its caution) arrives while the button is held; then drag
    // relative to where the map is now.
    await form.getByText(/vertices lie about 0\.4 to 1 km apart/).waitFor();
    const now = (await map.boundingBox())!;
    const y = now.y + now.height / 2;
    const x = now.x + now.width / 2;
    await page.mouse.move(x - 50, y, { steps: 5 });
    await page.mouse.move(x - 100, y, { steps: 5 });
    await page.mouse.up();
    // The map's centre is the place typed (within a pixel, about 60 m here).
    expect(Number(await form.getByLabel('Latitude of the mouth (°)').inputValue())).toBeCloseTo(PLACE.lat, 2);
    expect(Number(await form.getByLabel('Longitude of the mouth (°)').inputValue())).toBeCloseTo(PLACE.lon, 2);
    const azimuth = Number(await form.getByLabel('Direction of outflow (° from north)').inputValue());
    expect(Math.abs(azimuth - 270)).toBeLessThanOrEqual(2);
    // The first plume numbers appear as soon as the mouth is placed (the shared engine in the browser).
    const preview = page.getByTestId('plume-preview');
    await preview.getByText(/turns right of the outflow/).waitFor();
    await form.getByLabel('River name').fill('Dune Water');
    await form.getByLabel('Mouth width (m)').fill('40');
    await form.getByLabel('Mouth depth (m)').fill('2.5');
    await preview.getByText(/bulge about [\d.]+ km offshore/).waitFor();
    await screenshot(page, 'anywhere-2-river-on-the-map');
    await form.getByRole('button', { name: 'Create river' }).click();

    // The gauge record (a CSV, not a GIS file).
    await page.getByRole('heading', { name: 'Dune Water', level: 1 }).waitFor();
    const csv = readFileSync(path.resolve(import.meta.dirname, '../../demo-data/flows/tolley-brook-daily.csv'));
    await page.getByLabel(/Gauge record/).setInputFiles({ name: 'dune-water-daily.csv', mimeType: 'text/csv', buffer: csv });
    await page.getByRole('button', { name: 'Upload record' }).click();
    await page.getByText('Record saved').waitFor({ timeout: 120_000 });

    // The lease file, the one GIS file.
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Leases' }).click();
    await page.getByRole('heading', { name: 'Leases', exact: true, level: 1 }).waitFor();
    await page.getByRole('button', { name: 'Upload lease boundaries' }).click();
    await page.getByLabel('File').setInputFiles({ name: 'dune-leases.geojson', mimeType: 'application/geo+json', buffer: Buffer.from(JSON.stringify(LEASES)) });
    await page.getByRole('button', { name: 'Upload and check' }).click();
    await page.getByRole('heading', { name: '3. Check what was read' }).waitFor();
    await page.getByRole('button', { name: /Save 1 lease/ }).click();
    await page.getByText('1 lease added').waitFor({ timeout: 120_000 });

    // The ratings on the Overview; every step is done, so the list of steps is gone.
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Overview' }).click();
    await page.getByRole('heading', { name: 'Overview', exact: true, level: 1 }).waitFor();
    const table = page.getByRole('table', { name: 'Leases by yearly rating' });
    await table.waitFor();
    const row = table.locator('tbody tr', { hasText: 'DUNE-1' });
    await row.waitFor();
    // Listed at once; its yearly rating arrives when the queued screening is done (the page looks again every 10 s).
    await row.locator('[data-rating]').waitFor({ timeout: 120_000 });
    expect(await row.textContent()).toMatch(/Low|Moderate|High|Severe/);
    // The Overview combines every river; the lease's own page names the river that rated it.
    await row.getByRole('link', { name: 'DUNE-1' }).click();
    await page.getByRole('table', { name: 'Exposure per flood' }).waitFor({ timeout: 30_000 });
    expect(await page.locator('main').textContent()).toContain('Dune Water');
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Overview' }).click();
    await page.getByRole('heading', { name: 'Overview', exact: true, level: 1 }).waitFor();
    expect(await page.getByRole('list', { name: 'Steps to an answer' }).count()).toBe(0);
    await screenshot(page, 'anywhere-3-ratings');

    // The built-in coast can be replaced by one traced on the map.
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Rivers' }).click();
    await page.getByRole('heading', { name: 'Rivers', exact: true, level: 1 }).waitFor();
    await page.getByRole('link', { name: 'Dune Water' }).click();
    await page.getByRole('heading', { name: 'Dune Water', level: 1 }).waitFor();
    await page.getByText('On the built-in world coastline').waitFor();
    await page.getByRole('button', { name: 'Trace the coast on the map' }).click();
    const trace = page.getByRole('application', { name: /Map for tracing the coast/ });
    await trace.waitFor();
    const t = (await trace.boundingBox())!;
    const tx = t.x + t.width / 2;
    await page.mouse.click(tx, t.y + 30);
    await page.mouse.click(tx - 2, t.y + t.height / 2);
    await page.mouse.dblclick(tx - 4, t.y + t.height - 30);
    await page.waitForSelector('[data-traced="yes"]');
    await page.getByRole('button', { name: 'Save the traced coast and use it' }).click();
    // The river now walks the traced coast (its leases are screened again), so the built-in notice goes.
    await page.getByText('On the built-in world coastline').waitFor({ state: 'detached', timeout: 120_000 });
    expect(errors).toEqual([]);
  }, 300_000);
});
