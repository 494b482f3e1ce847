/**
 * The authority's monitoring screen in chromium: a bad samples file is refused row by row; the demo
 * stations and samples are uploaded again (the demo loader put them there first, so the upload updates
 * them, as a re-delivery of the same monitoring data would); the Amberlin's plume is compared with them,
 * fitted, applied (which re-screens its leases) and rolled back, so the file can run again.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD } from '../../server/db/seed';
import { browserForThisFile, screenshot, signInThroughForm, watchErrors } from './browser';

const baseUrl = inject('baseUrl');
const browser = browserForThisFile();
const DEMO = path.resolve(import.meta.dirname, '../../demo-data/monitoring');
// The demo's own counts: its stations, its sample rows and those written as <2 or >1600 (demo-data/README.md).
const DEMO_STATIONS = JSON.parse(readFileSync(path.join(DEMO, 'stations.geojson'), 'utf8')).features.length as number;
const DEMO_SAMPLES = readFileSync(path.join(DEMO, 'samples.csv'), 'utf8').trim().split('\n').slice(1);
const DEMO_CENSORED = DEMO_SAMPLES.filter((row) => /,[<>]\d/.test(row)).length;
let pool: pg.Pool;

beforeAll(async () => {
  pool = new pg.Pool({ connectionString: inject('e2eDatabaseUrl'), max: 1 });
});
afterAll(async () => {
  await pool?.end();
});

const amberlinSettings = async () => (await pool.query(`SELECT settings FROM rivers WHERE name = 'Amberlin River'`)).rows[0].settings;

describe('monitoring and calibration', () => {
  it('uploads the demo stations and samples, compares, fits, applies and rolls back', async () => {
    const original = await amberlinSettings();
    await browser().clearCookies();
    const page = await browser().newPage();
    const errors = watchErrors(page);
    await signInThroughForm(page, baseUrl, 'regulator@brackline.test', DEMO_PASSWORD);
    await page.getByRole('heading', { name: 'Overview', exact: true, level: 1 }).waitFor();
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Monitoring' }).click();
    await page.getByRole('heading', { name: 'Monitoring and calibration', exact: true, level: 1 }).waitFor();

    // A samples file with bad rows: each is listed with its row number, nothing is saved.
    const samplesForm = page.getByRole('form', { name: 'Upload samples' });
    const bad =
      'station_id,sampled_at,salinity,e_coli_per_100ml,method\nFB-S01,2024-02-30T10:00:00Z,31,4,MPN\nFB-S02,2024-03-01T10:00:00Z,31,many,MPN\nFB-S02,2024-03-02T10:00:00Z,31,<2,MPN';
    await samplesForm
      .getByLabel('Samples file (CSV)')
      .setInputFiles({ name: 'bad-samples.csv', mimeType: 'text/csv', buffer: Buffer.from(bad) });
    await samplesForm.getByRole('button', { name: 'Upload samples' }).click();
    const problems = page.getByRole('table', { name: 'Problems in the samples file' });
    await problems.waitFor();
    await page.getByText('2 of 3 rows have problems; nothing was saved').waitFor();
    expect(await problems.locator('tbody tr').count()).toBe(2);
    await screenshot(page, 'monitoring-1-row-problems');

    // The demo stations (GeoJSON) and samples (CSV).
    const stationsForm = page.getByRole('form', { name: 'Upload stations' });
    await stationsForm.getByLabel('Stations file').setInputFiles(path.join(DEMO, 'stations.geojson'));
    await stationsForm.getByRole('button', { name: 'Upload stations' }).click();
    await stationsForm.getByText(`0 new, ${DEMO_STATIONS} updated (geojson).`).waitFor();
    await samplesForm.getByLabel('Samples file (CSV)').setInputFiles(path.join(DEMO, 'samples.csv'));
    await samplesForm.getByRole('button', { name: 'Upload samples' }).click();
    await samplesForm.getByText(`0 new, ${DEMO_SAMPLES.length} updated, at ${DEMO_STATIONS} stations`, { exact: false }).waitFor();
    await samplesForm.getByText(`${DEMO_CENSORED} indicator results kept as detection limits`, { exact: false }).waitFor();
    await screenshot(page, 'monitoring-2-uploaded');

    // The comparison for the Amberlin (the first river in the list).
    await page.getByLabel('River', { exact: true }).selectOption({ label: 'Amberlin River' });
    await page.getByRole('table', { name: 'Agreement of the plume with the samples' }).waitFor();
    await page.getByRole('figure', { name: /Faecal indicator: measured against predicted/ }).waitFor();
    await page
      .getByText(/^Rests on \d+ samples over 6 years/)
      .first()
      .waitFor();
    await page.waitForFunction(() => document.querySelectorAll('.recharts-scatter-symbol').length > 100);
    await screenshot(page, 'monitoring-3-comparison');

    // Fit (entrainment coefficient, T90 and the near-field fraction), then apply.
    await page.getByLabel('Also fit the river water leaving the mouth region').check();
    await page.getByRole('button', { name: 'Run the fit' }).click();
    const result = page.getByRole('article', { name: 'Calibration result' }).first();
    await result.getByText('Fitted, not applied').waitFor();
    await result.getByRole('table', { name: 'Settings before and after the fit' }).waitFor();
    await result.getByText('What this fit rests on').waitFor();
    await result.scrollIntoViewIfNeeded();
    await screenshot(page, 'monitoring-4-fitted');
    await result.getByRole('button', { name: 'Apply to Amberlin River' }).click();
    await result.getByText('Applied to the river').waitFor({ timeout: 60_000 });
    const applied = await amberlinSettings();
    expect(applied.entrainmentCoefficient).not.toBe(original.entrainmentCoefficient);
    expect(applied.nearFieldFreshwaterFraction).not.toBe(original.nearFieldFreshwaterFraction);
    // The comparison above is redrawn with the applied values.
    await page.getByText(new RegExp(`Settings now: entrainment coefficient (?!${(original.entrainmentCoefficient as number).toExponential(2).replace('.', '\\.')})`)).waitFor();
    const audit = await pool.query(`SELECT count(*)::int AS n FROM audit_entries WHERE action = 'calibration.apply'`);
    expect(audit.rows[0].n).toBeGreaterThan(0);
    await screenshot(page, 'monitoring-5-applied');

    // Roll back: the river's values are as before.
    await result.getByRole('button', { name: 'Roll back to the previous values' }).click();
    await result.getByText('Rolled back').waitFor({ timeout: 60_000 });
    expect(await amberlinSettings()).toEqual(original);
    expect(errors).toEqual([]);
    await page.close();
  }, 180_000);
});
