import { readFileSync } from 'node:fs';
import { describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD } from '../../server/db/seed';
import { screenshot, signInThroughForm, browserForThisFile, watchErrors } from './browser';

const baseUrl = inject('baseUrl');
const browser = browserForThisFile();

describe('a grower reads a lease report and the exposure map', () => {
  it('opens FB-001 from the leases table, sees ratings and reasons, and downloads the PDF', async () => {
    await browser().clearCookies();
    const page = await browser().newPage();
    const errors = watchErrors(page);
    await signInThroughForm(page, baseUrl, 'grower@brackline.test', DEMO_PASSWORD);
    await page.getByRole('heading', { name: 'Overview', exact: true, level: 1 }).waitFor();
    // The overview lists the grower's leases by their yearly rating, worst first, and says how it is set.
    const overview = page.getByRole('table', { name: 'Leases by yearly rating' });
    await overview.waitFor();
    const yearly = await overview.locator('tbody [data-rating]').evaluateAll((els) => els.map((e) => e.getAttribute('data-rating')));
    const rank = ['low', 'moderate', 'high', 'severe'];
    expect(yearly.length).toBeGreaterThan(0);
    expect([...yearly].sort((a, b) => rank.indexOf(b ?? '') - rank.indexOf(a ?? ''))).toEqual(yearly);
    await page.getByText('How the yearly rating is set').click();
    await page
      .getByRole('list', { name: 'Yearly rating cut points' })
      .getByText(/^Severe: 30 or more closure days a year/)
      .waitFor();
    await screenshot(page, 'overview-grower-ratings');

    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Leases' }).click();
    await page.getByRole('table', { name: 'Leases' }).getByRole('link', { name: 'FB-001' }).click();
    await page.getByRole('heading', { name: 'Lease FB-001' }).waitFor();
    await page.getByText('How exposed is FB-001 to flood water?').waitFor();

    const table = page.getByRole('table', { name: 'Exposure per flood' });
    await table.waitFor();
    expect(await table.locator('tbody tr').count()).toBeGreaterThan(3);
    const ratings = await table.locator('tbody [data-rating]').allTextContents();
    expect(ratings.length).toBeGreaterThan(3);
    for (const r of ratings) expect(r).toMatch(/^(Low|Moderate|High|Severe)$/);
    const reasons = await page.getByTestId('reasons').locator('li').allTextContents();
    expect(reasons.length).toBeGreaterThan(0);
    expect(reasons.join(' ')).toMatch(/salinity|indicator/i);
    expect(reasons.join(' ')).not.toMatch(/\bsafe\b/i);
    expect(await page.getByRole('complementary', { name: 'Cautions' }).first().isVisible()).toBe(true);
    await page.waitForSelector('[data-map][data-drawn]');
    await screenshot(page, 'lease-report');

    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Download PDF' }).click()]);
    expect(download.suggestedFilename()).toMatch(/^brackline-FB-001-.*\.pdf$/);
    const file = await download.path();
    const pdf = readFileSync(file);
    expect(pdf.subarray(0, 4).toString('latin1')).toBe('%PDF');
    const text = pdf.toString('latin1');
    expect(text).toContain('FB-001');
    expect(text).toContain('Saltreed Oysters');
    expect(text).toMatch(/screening-level estimates/);
    expect(errors).toEqual([]);
    await page.close();
  });

  it('moves the flow slider on the exposure map and sees the plume bands redrawn', async () => {
    const page = await browser().newPage();
    const errors = watchErrors(page);
    await page.goto(`${baseUrl}/map`);
    await page.getByRole('heading', { name: 'Exposure map', exact: true, level: 1 }).waitFor();
    const map = page.locator('[data-map][data-drawn]');
    await map.waitFor();
    const before = await map.getAttribute('data-drawn');
    const flowBefore = await page.getByTestId('flow-value').textContent();
    expect(before).toBeTruthy();
    await screenshot(page, 'exposure-map');

    const slider = page.getByRole('slider');
    await slider.focus();
    await page.keyboard.press('Home');
    await page.waitForFunction((prev) => {
      const el = document.querySelector('[data-map][data-drawn]');
      return el && el.getAttribute('data-drawn') !== prev;
    }, before);
    expect(await page.getByTestId('flow-value').textContent()).not.toBe(flowBefore);
    expect(await page.getByRole('combobox', { name: 'Flood scenario' }).inputValue()).toBe('');
    await page.getByTestId('footprint-warnings').waitFor();
    await screenshot(page, 'exposure-map-low-flow');
    expect(errors).toEqual([]);
    await page.close();
  });

  it('draws leases from vector tiles, coloured by rating, when the map is asked to tile them', async () => {
    const page = await browser().newPage();
    const errors = watchErrors(page);
    const tiles: { status: number; bytes: number }[] = [];
    page.on('response', async (r) => {
      if (r.url().includes('/api/v1/tiles/leases/')) tiles.push({ status: r.status(), bytes: (await r.body()).length });
    });
    await signInThroughForm(page, baseUrl, 'grower@brackline.test', DEMO_PASSWORD);
    await page.getByRole('heading', { name: 'Overview', exact: true, level: 1 }).waitFor();
    await page.goto(`${baseUrl}/map?leaseTiles=on`);
    await page.getByRole('heading', { name: 'Exposure map', exact: true, level: 1 }).waitFor();
    await page.locator('[data-map][data-drawn]').waitFor();
    await page.waitForFunction(() => performance.getEntriesByType('resource').some((e) => e.name.includes('/api/v1/tiles/leases/')));
    await page.waitForTimeout(500);
    expect(tiles.length, JSON.stringify(tiles)).toBeGreaterThan(0);
    expect(
      tiles.every((t) => t.status === 200),
      JSON.stringify(tiles),
    ).toBe(true);
    // At least one tile of the demo bay carries leases.
    expect(tiles.some((t) => t.bytes > 100)).toBe(true);
    await screenshot(page, 'exposure-map-lease-tiles');
    // No basemap is configured in tests: vector layers only, no switch for one, nothing fetched from outside.
    expect(await page.getByLabel('Background map (needs internet)').count()).toBe(0);
    expect(
      await page.evaluate(() => performance.getEntriesByType('resource').filter((e) => !e.name.startsWith(location.origin)).length),
    ).toBe(0);
    expect(errors).toEqual([]);
    await page.close();
  });
});
