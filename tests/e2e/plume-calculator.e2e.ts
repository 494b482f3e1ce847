import { describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD } from '../../server/db/seed';
import { screenshot, signInThroughForm, browserForThisFile, watchErrors } from './browser';

const baseUrl = inject('baseUrl');
const browser = browserForThisFile();

describe('plume calculator', () => {
  it('computes in the browser as the grower types, and flips the turn south of the equator', async () => {
    const page = await browser().newPage();
    const errors = watchErrors(page);
    await signInThroughForm(page, baseUrl, 'grower@brackline.test', DEMO_PASSWORD);
    await page.getByRole('link', { name: 'Plume calculator' }).click();
    await page.getByRole('heading', { name: 'Plume calculator', exact: true, level: 1 }).waitFor();
    const turns = page.getByTestId('plume-Turns');
    expect(await turns.textContent()).toMatch(/right/);
    await screenshot(page, 'plume-calculator');
    await page.getByLabel('Latitude of the mouth (°)').fill('-41.2');
    await page.waitForFunction(() => document.querySelector('[data-testid="plume-Turns"]')?.textContent?.includes('left'));
    await page.getByLabel('Sea salinity (psu)').fill('55');
    const problem = page.getByRole('alert').first();
    await problem.waitFor();
    expect(await problem.textContent()).toMatch(/seaSalinity|Sea salinity|42/);
    expect(errors).toEqual([]);
    await page.close();
  });
});
