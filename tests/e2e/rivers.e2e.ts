/**
 * Rivers in chromium (issue "Grower's app II"): an adviser sets up a river from its mouth, uploads
 * a gauge record with a few bad rows (sees them, continues without them), reads the flood-frequency
 * chart and design flows, edits a flood duration, opens the plume numbers and previews a changed
 * setting before saving it.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD } from '../../server/db/seed';
import { browserForThisFile, SCREENSHOT_DIR, screenshot, signInThroughForm, watchErrors } from './browser';

const baseUrl = inject('baseUrl');
const browser = browserForThisFile();
const RIVER = 'Wren Water';
let pool: pg.Pool;

beforeAll(async () => {
  pool = new pg.Pool({ connectionString: inject('e2eDatabaseUrl'), max: 1 });
  // The file can run again: the river it creates is removed first.
  await pool.query(`delete from rivers where name = $1`, [RIVER]);
});
afterAll(async () => {
  await pool?.end();
});

function messyRecord(): Buffer {
  const lines = readFileSync(path.resolve(import.meta.dirname, '../../demo-data/flows/tolley-brook-daily.csv'), 'utf8').split('\n');
  lines.splice(50, 0, '1990-11-18,gauge broken', '1990-11-19,-4');
  lines.splice(400, 0, '1991-13-40,12');
  return Buffer.from(lines.join('\n'));
}

describe('an adviser sets up a river from a gauge record', () => {
  it('creates the river, uploads a messy record, reads the floods and the plume numbers', async () => {
    await browser().clearCookies();
    const page = await browser().newPage();
    const errors = watchErrors(page);
    await signInThroughForm(page, baseUrl, 'adviser@brackline.test', DEMO_PASSWORD);
    await page.getByRole('heading', { name: 'Overview', exact: true, level: 1 }).waitFor();

    // The list, then a new river from its mouth alone.
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Rivers' }).click();
    await page.getByRole('heading', { name: 'Rivers', exact: true }).waitFor();
    await page.getByRole('link', { name: 'Amberlin River' }).waitFor();
    const create = page.getByRole('form', { name: 'Set up a river' });
    await create.getByRole('button', { name: 'Create river' }).click();
    await create.getByText('name is required').waitFor();
    await screenshot(page, 'rivers-1-list');
    await create.getByLabel('River name').fill(RIVER);
    await create.getByLabel('Latitude of the mouth (°)').fill('41.15');
    await create.getByLabel('Longitude of the mouth (°)').fill('-38.6');
    await create.getByLabel('Direction of outflow (° from north)').fill('270');
    await create.getByLabel('Mouth width (m)').fill('60');
    await create.getByLabel('Mouth depth (m)').fill('2.5');
    await create.getByRole('button', { name: 'Create river' }).click();

    await page.getByRole('heading', { name: RIVER }).waitFor();
    await page.getByText('11 settings still use regional defaults').waitFor();
    await page.getByTestId('default-seaSalinity').waitFor();
    await page.getByText('No flow record yet').waitFor();

    // A record with three bad rows: the rows are shown, nothing is saved until the user continues.
    await page.getByLabel('Gauge record (CSV or WaterML 2.0)').setInputFiles({ name: 'wren-water-daily.csv', mimeType: 'text/csv', buffer: messyRecord() });
    await page.getByRole('button', { name: 'Upload record' }).click();
    await page.getByText(/3 of [\d,]+ rows cannot be used/).waitFor();
    const problems = page.getByTestId('row-problems');
    await expect(problems.locator('tbody tr').count()).resolves.toBe(3);
    await problems.getByRole('cell', { name: 'gauge broken', exact: true }).waitFor();
    await screenshot(page, 'rivers-2-row-problems');
    await page.getByRole('button', { name: 'Continue without these 3 rows' }).click();
    // The upload fits the record and re-screens the region's leases in the request (inline jobs in tests).
    await page.getByText('Record saved').waitFor({ timeout: 120_000 });

    // Hydrograph, flood-frequency chart and design flows.
    await page.getByTestId('hydrograph').locator('.recharts-surface').first().waitFor();
    await page.getByLabel('Log scale for the hydrograph').check();
    await page.getByTestId('hydrograph').locator('.recharts-line-curve').first().waitFor();
    await page.getByTestId('flood-frequency-chart').locator('.recharts-surface').first().waitFor();
    await page.getByText('Return period (years) and annual exceedance probability (AEP)').waitFor();
    const design = page.getByTestId('design-flows');
    await design.getByRole('rowheader', { name: '1-in-100 years' }).waitFor();
    await design.getByRole('columnheader', { name: 'GEV (L-moments) (design)' }).waitFor();
    await page.getByText('3 rows were left out when the record was saved').waitFor();
    await screenshot(page, 'rivers-3-record-and-floods');
    await page.locator('#record').screenshot({ path: `${SCREENSHOT_DIR}/rivers-3a-record.png` });
    await page.locator('#floods').screenshot({ path: `${SCREENSHOT_DIR}/rivers-3b-floods.png` });
    await page.locator('#scenarios').screenshot({ path: `${SCREENSHOT_DIR}/rivers-3c-scenarios.png` });

    // Scenarios: from the fit and seasonal; a flood duration edited in place.
    const scenarios = page.getByTestId('scenarios-table');
    await scenarios.getByRole('rowheader', { name: /1-in-10-year flood/ }).waitFor();
    const duration = page.getByLabel(/Flood duration of 1-in-10-year flood/);
    await duration.fill('60');
    await scenarios.getByRole('row', { name: /1-in-10-year flood/ }).getByRole('button', { name: 'Save' }).click();
    await scenarios.getByRole('row', { name: /1-in-10-year flood/ }).getByRole('button', { name: 'Save' }).waitFor({ state: 'detached', timeout: 90_000 });

    // Plume numbers of the 1-in-10-year flood from the saved settings.
    const panel = page.getByTestId('plume-panel');
    await panel.getByText('for 60 hours').waitFor({ timeout: 30_000 });
    const savedG = await panel.getByTestId('saved-g').textContent();
    expect(savedG).toMatch(/m\/s²/);
    for (const key of ['f', 'regime', 'ys', 'H0', 'W0', 'U0', 'cp', 'reach']) expect(await panel.getByTestId(`saved-${key}`).textContent()).not.toBe('—');
    await panel.getByText('Assumptions these inputs break').waitFor();
    await page.getByTestId('cross-shore-chart').locator('.recharts-surface').first().waitFor();
    await page.getByTestId('alongshore-chart').locator('.recharts-surface').first().waitFor();
    // A tall window, so the panel (scrollable beside the form on smaller screens) is captured whole.
    await page.setViewportSize({ width: 1280, height: 2000 });
    await page.getByTestId('plume-panel').screenshot({ path: `${SCREENSHOT_DIR}/rivers-4-plume-numbers.png` });
    await page.setViewportSize({ width: 1280, height: 860 });

    // A changed setting shows new numbers before saving (the engine in the browser)…
    await page.getByLabel('Sea salinity (psu)').fill('30');
    await panel.getByRole('columnheader', { name: 'With your unsaved changes' }).waitFor();
    const previewG = await panel.getByTestId('preview-g').textContent();
    expect(previewG).not.toBe(savedG);
    await page.setViewportSize({ width: 1280, height: 2000 });
    await page.getByTestId('plume-panel').screenshot({ path: `${SCREENSHOT_DIR}/rivers-5-preview.png` });
    await page.setViewportSize({ width: 1280, height: 860 });
    await page.getByRole('form', { name: 'River settings' }).screenshot({ path: `${SCREENSHOT_DIR}/rivers-5b-settings-form.png` });
    // …and the server recomputes on save; the field stops being a default.
    await page.getByRole('button', { name: 'Save settings' }).click();
    // (Saving re-screens the river's leases in the request here; npm start does it in a background job.)
    await page.getByText('10 settings still use regional defaults').waitFor({ timeout: 90_000 });
    await expect(page.getByTestId('default-seaSalinity').count()).resolves.toBe(0);
    await page.getByTestId('plume-panel').getByTestId('saved-g').filter({ hasText: previewG ?? '' }).waitFor();
    const stored = await pool.query(`select settings->>'seaSalinity' as s, defaults_used from rivers where name = $1`, [RIVER]);
    expect(stored.rows[0].s).toBe('30');
    expect(stored.rows[0].defaults_used).not.toContain('seaSalinity');
    expect(errors).toEqual([]);
    await page.close();
  }, 300_000);
});
