/**
 * Accessibility and tablet layout of the signed-in screens: axe-core's WCAG 2 A/AA rules (no
 * serious or critical violation), keyboard focus that shows, and no sideways scrolling on a
 * tablet held upright (820 × 1180 CSS px, common practice for a 10-inch tablet).
 */
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import type { Page } from 'playwright-core';
import { describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD } from '../../server/db/seed';
import { browserForThisFile, screenshot, signInThroughForm, watchErrors } from './browser';

const baseUrl = inject('baseUrl');
const browser = browserForThisFile();
const axeSource = readFileSync(createRequire(import.meta.url).resolve('axe-core/axe.min.js'), 'utf8');

interface AxeViolation {
  id: string;
  impact: string | null;
  help: string;
  nodes: { target: string[] }[];
}

/** Runs axe-core in the page; returns the serious and critical WCAG 2 A/AA violations. */
async function seriousViolations(page: Page): Promise<AxeViolation[]> {
  // Evaluated through the debugging protocol, which the page's content security policy rightly does not allow as a script tag.
  await page.evaluate(axeSource);
  const violations = await page.evaluate(async () => {
    // biome-ignore lint/suspicious/noExplicitAny: axe is injected as a global script.
    const axe = (window as any).axe;
    const result = await axe.run(document, { runOnly: { type: 'tag', values: ['wcag2a', 'wcag2aa'] } });
    return result.violations as AxeViolation[];
  });
  return violations.filter((v) => v.impact === 'serious' || v.impact === 'critical');
}

const describeViolations = (vs: AxeViolation[]) =>
  vs.map((v) => `${v.id} (${v.impact}): ${v.help} at ${v.nodes.map((n) => n.target.join(' ')).join(', ')}`).join('\n');

const SCREENS: { path: string; heading: string; ready?: string; shot: string }[] = [
  { path: '/', heading: 'Overview', ready: 'table[aria-label="Leases by yearly rating"]', shot: 'tablet-overview' },
  { path: '/leases', heading: 'Leases', ready: 'table[aria-label="Leases"]', shot: 'tablet-leases' },
  { path: '/map', heading: 'Exposure map', ready: '[data-map][data-drawn]', shot: 'tablet-map' },
  { path: '/compare', heading: 'Compare', shot: 'tablet-compare' },
  { path: '/plume-calculator', heading: 'Plume calculator', shot: 'tablet-calculator' },
  { path: '/inbox', heading: 'Inbox', shot: 'tablet-inbox' },
];

describe('accessibility and tablet layout', () => {
  it('every grower screen passes axe-core WCAG 2 AA checks and fits a tablet without sideways scrolling', async () => {
    await browser().clearCookies();
    const page = await browser().newPage();
    await page.setViewportSize({ width: 820, height: 1180 });
    const errors = watchErrors(page);
    await signInThroughForm(page, baseUrl, 'grower@brackline.test', DEMO_PASSWORD);
    await page.getByRole('heading', { name: 'Overview', exact: true, level: 1 }).waitFor();
    const problems: string[] = [];
    for (const screen of SCREENS) {
      await page.goto(`${baseUrl}${screen.path}`);
      await page.getByRole('heading', { name: screen.heading, level: 1 }).waitFor();
      if (screen.ready) await page.waitForSelector(screen.ready);
      const violations = await seriousViolations(page);
      if (violations.length) problems.push(`${screen.path}:\n${describeViolations(violations)}`);
      const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
      if (overflow > 1) problems.push(`${screen.path}: the page scrolls sideways by ${overflow}px on a tablet`);
      await screenshot(page, screen.shot);
    }
    // The lease report of the first lease in the table.
    await page.goto(`${baseUrl}/leases`);
    await page.getByRole('table', { name: 'Leases' }).getByRole('link').first().click();
    await page.getByRole('table', { name: 'Exposure per flood' }).waitFor();
    const reportViolations = await seriousViolations(page);
    if (reportViolations.length) problems.push(`lease report:\n${describeViolations(reportViolations)}`);
    await screenshot(page, 'tablet-lease-report');
    expect(problems, problems.join('\n\n')).toEqual([]);
    expect(errors).toEqual([]);
    await page.close();
  });

  it('moves through the main navigation and the leases table by keyboard, with the focus visible', async () => {
    const page = await browser().newPage();
    await page.goto(`${baseUrl}/leases`);
    await page.getByRole('table', { name: 'Leases' }).waitFor();
    // The first Tab reaches the skip link; following it lands in the page's main content.
    await page.keyboard.press('Tab');
    expect(await page.evaluate(() => document.activeElement?.textContent)).toBe('Skip to content');
    let reachedSort = false;
    for (let i = 0; i < 40 && !reachedSort; i++) {
      await page.keyboard.press('Tab');
      reachedSort = await page.evaluate(
        () => document.activeElement?.tagName === 'BUTTON' && Boolean(document.activeElement.closest('th')),
      );
    }
    expect(reachedSort).toBe(true);
    // The focused header button has a visible outline (index.css :focus-visible, 3px).
    const outline = await page.evaluate(() => getComputedStyle(document.activeElement as Element).outlineWidth);
    expect(outline).toBe('3px');
    // Enter on the focused header sorts by its column: its aria-sort changes (the rows may already be in that order).
    const before = await page.evaluate(() => document.activeElement?.closest('th')?.getAttribute('aria-sort'));
    await page.keyboard.press('Enter');
    await page.waitForFunction((prev) => {
      const sort = document.activeElement?.closest('th')?.getAttribute('aria-sort');
      return sort !== prev && sort !== 'none';
    }, before);
    await page.close();
  });
});
