/**
 * Signing in from a deep link lands on that page the first time (the form used to come back after
 * correct credentials, because the cached "nobody signed in" answer was read before it was fetched
 * again), and the served client is React's production build.
 */
import { describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD } from '../../server/db/seed';
import { browserForThisFile, screenshot, watchErrors } from './browser';

const baseUrl = inject('baseUrl');
const browser = browserForThisFile();

describe('sign-in from a deep link', () => {
  it.each([
    { start: '/', heading: 'Overview', shot: 'deep-link-overview' },
    { start: '/leases', heading: 'Leases', shot: 'deep-link-leases' },
  ])('starts at $start, signs in once and lands on the $heading page', async ({ start, heading, shot }) => {
    await browser().clearCookies();
    const page = await browser().newPage();
    const errors = watchErrors(page);
    await page.goto(`${baseUrl}${start}`);
    await page.getByRole('heading', { name: 'Sign in' }).waitFor();
    expect(new URL(page.url()).searchParams.get('next')).toBe(start);
    await page.getByLabel('E-mail').fill('grower@brackline.test');
    await page.getByLabel('Password').fill(DEMO_PASSWORD);
    await page.getByRole('button', { name: 'Sign in', exact: true }).click();
    await page.getByRole('heading', { name: heading, exact: true, level: 1 }).waitFor();
    expect(new URL(page.url()).pathname).toBe(start);
    // It stays there: the sign-in form does not come back.
    await page.waitForTimeout(500);
    expect(await page.getByRole('heading', { name: 'Sign in' }).count()).toBe(0);
    await screenshot(page, shot);
    expect(errors).toEqual([]);
    await page.close();
  });
});

describe('the served client is a production build', () => {
  it('serves no development JSX runtime in any chunk and React logs no development notice', async () => {
    const html = await (await fetch(`${baseUrl}/sign-in`)).text();
    const scripts = [...html.matchAll(/<script[^>]+src="([^"]+)"/g)].map((m) => m[1]);
    expect(scripts.length).toBeGreaterThan(0);
    // Every chunk the entry imports, followed from the served files themselves.
    const seen = new Set<string>();
    const queue = [...scripts];
    let bytes = 0;
    while (queue.length) {
      const src = queue.shift()!;
      if (seen.has(src)) continue;
      seen.add(src);
      const js = await (await fetch(new URL(src, baseUrl))).text();
      bytes += js.length;
      // React's development JSX runtime is `jsxDEV` (react/jsx-dev-runtime); the production one never names it.
      expect(js.includes('jsxDEV'), `${src} contains jsxDEV`).toBe(false);
      for (const m of js.matchAll(/["'(]\.?\.?\/?(assets\/[\w.-]+\.js)["')]/g)) queue.push(`/${m[1]}`);
      for (const m of js.matchAll(/["']\.\/([\w.-]+\.js)["']/g)) queue.push(`/assets/${m[1]}`);
    }
    console.log(`[production build] ${seen.size} chunks checked, ${(bytes / 1024).toFixed(0)} KB`);

    // React's development build prints its DevTools notice on start; the production build does not (react-dom source).
    await browser().clearCookies();
    const page = await browser().newPage();
    const messages: string[] = [];
    page.on('console', (m) => messages.push(m.text()));
    await page.goto(`${baseUrl}/sign-in`);
    await page.getByRole('heading', { name: 'Sign in' }).waitFor();
    expect(messages.filter((m) => /React DevTools/.test(m))).toEqual([]);
    await page.close();
  });
});
