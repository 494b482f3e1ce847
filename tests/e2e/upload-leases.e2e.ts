import path from 'node:path';
import { describe, expect, inject, it } from 'vitest';
import { browserForThisFile, screenshot, watchErrors } from './browser';

const baseUrl = inject('baseUrl');
const browser = browserForThisFile();

describe('uploading leases through the browser', () => {
  it('a grower uploads the demo shapefile (UTM 24N), maps attributes and sees the leases listed', async () => {
    const page = await browser().newPage();
    const errors = watchErrors(page);
    // A fresh grower, so the leases table starts empty (the demo growers hold the Fennick Bay leases).
    await browser().clearCookies();
    await page.goto(`${baseUrl}/sign-up`);
    await page.getByLabel('Your name').fill('Wren Tidewell');
    await page.getByLabel('E-mail').fill(`wren.${Date.now()}@brackline.test`);
    await page.getByLabel('Password').fill('a-good-long-password');
    await page.getByRole('button', { name: 'Create account' }).click();
    await page.getByRole('heading', { name: 'Overview', exact: true, level: 1 }).waitFor();
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Leases' }).click();
    await page.getByRole('heading', { name: 'Leases', exact: true, level: 1 }).waitFor();
    await page.getByText('No leases yet').waitFor();
    await page.getByRole('button', { name: 'Upload lease boundaries' }).click();
    await page.getByLabel('File').setInputFiles(path.resolve(import.meta.dirname, '../../demo-data/leases/gullstone-shellfish-leases.zip'));
    await page.getByRole('button', { name: 'Upload and check' }).click();
    await page.getByRole('heading', { name: '3. Check what was read' }).waitFor();
    expect(await page.getByTestId('feature-count').textContent()).toBe('10');
    expect(await page.getByText('EPSG:32624').count()).toBeGreaterThan(0);
    // The attribute mapping is guessed from the field names.
    expect(await page.getByRole('combobox', { name: 'Lease id' }).inputValue()).toBe('LEASE_ID');
    expect(await page.getByRole('combobox', { name: 'Status (held or candidate)' }).inputValue()).toBe('STATUS');
    await page.locator('canvas').first().waitFor();
    await screenshot(page, 'upload-preview');
    await page.getByRole('button', { name: /Save 10 leases/ }).click();
    await page.getByText('10 leases added').waitFor();
    const table = page.getByRole('table', { name: 'Leases' });
    await table.waitFor();
    await page.waitForFunction(() => document.querySelectorAll('table[aria-label="Leases"] tbody tr').length === 10);
    const firstId = await table.locator('tbody tr').first().getByRole('link').textContent();
    expect(firstId).toMatch(/^FB-\d{3}$/);
    await screenshot(page, 'leases-table');
    // Sorting by area through the column header: the order follows the header's aria-sort.
    const areaHeader = table.locator('th', { hasText: 'Area' });
    for (let click = 0; click < 2; click++) {
      const before = await areaHeader.getAttribute('aria-sort');
      await areaHeader.getByRole('button').click();
      await page.waitForFunction((prev) => {
        const th = [...document.querySelectorAll('table[aria-label="Leases"] th')].find((h) => h.textContent?.includes('Area'));
        return th && th.getAttribute('aria-sort') !== prev && th.getAttribute('aria-sort') !== 'none';
      }, before);
      await page.waitForTimeout(300);
      const direction = await areaHeader.getAttribute('aria-sort');
      const areas = (await table.locator('tbody tr td:nth-child(6)').allTextContents()).map((a) => Number(a.replace(/,/g, '')));
      const sorted = [...areas].sort((a, b) => (direction === 'ascending' ? a - b : b - a));
      expect(areas).toEqual(sorted);
    }
    expect(errors).toEqual([]);
    await page.close();
  });

  it('a grower uploads a KMZ from a globe viewer, picks one of its folders and saves those leases', async () => {
    const page = await browser().newPage();
    const errors = watchErrors(page);
    await browser().clearCookies();
    await page.goto(`${baseUrl}/sign-up`);
    await page.getByLabel('Your name').fill('Ossian Marl');
    await page.getByLabel('E-mail').fill(`ossian.${Date.now()}@brackline.test`);
    await page.getByLabel('Password').fill('a-good-long-password');
    await page.getByRole('button', { name: 'Create account' }).click();
    await page.getByRole('heading', { name: 'Overview', exact: true, level: 1 }).waitFor();
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Leases' }).click();
    await page.getByRole('heading', { name: 'Leases', exact: true, level: 1 }).waitFor();
    await page.getByRole('button', { name: 'Upload lease boundaries' }).click();
    // The corpus KMZ: doc.kml with folders "Held" and "Candidates", two placemarks each, attributes in ExtendedData.
    await page.getByLabel('File').setInputFiles(path.resolve(import.meta.dirname, '../fixtures/uploads/good/fennick-leases.kmz'));
    await page.getByRole('button', { name: 'Upload and check' }).click();
    await page.getByRole('heading', { name: '3. Check what was read' }).waitFor();
    expect(await page.getByTestId('feature-count').textContent()).toBe('4');
    const picker = page.getByTestId('layer-picker');
    expect(await picker.locator('option').allTextContents()).toEqual([
      'Every layer that fits',
      'Held — 2 features (Polygon)',
      'Candidates — 2 features (MultiPolygon, Polygon)',
    ]);
    await picker.selectOption('Candidates');
    await page.getByRole('button', { name: 'Read this layer' }).click();
    await page.waitForFunction(() => document.querySelector('[data-testid="feature-count"]')?.textContent === '2');
    expect(await page.getByRole('combobox', { name: 'Lease id' }).inputValue()).toBe('LEASE_ID');
    await screenshot(page, 'upload-kmz-layer');
    await page.getByRole('button', { name: /Save 2 leases/ }).click();
    await page.getByText('2 leases added').waitFor();
    await page.waitForFunction(() => document.querySelectorAll('table[aria-label="Leases"] tbody tr').length === 2);
    const ids = await page.getByRole('table', { name: 'Leases' }).locator('tbody tr a').allTextContents();
    expect(ids.sort()).toEqual(['FB-016', 'FB-021']);
    expect(await page.getByRole('link', { name: 'Export GeoPackage' }).getAttribute('href')).toBe('/api/v1/leases/export?format=gpkg');
    expect(await page.getByRole('link', { name: 'Export KML' }).getAttribute('href')).toBe('/api/v1/leases/export?format=kml');
    expect(errors).toEqual([]);
    await page.close();
  });
});
