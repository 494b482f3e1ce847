/**
 * Debian's chromium driven by playwright-core (never a downloaded browser), with the flags
 * this closed network needs (stack.md gotcha 17). Screenshots go to the git-ignored screenshots/.
 */
import { mkdirSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { type BrowserContext, chromium, type Page } from 'playwright-core';
import { afterAll, beforeAll } from 'vitest';

export const SCREENSHOT_DIR = path.resolve(import.meta.dirname, '../../screenshots');

export async function openBrowser(): Promise<BrowserContext> {
  mkdirSync(SCREENSHOT_DIR, { recursive: true });
  return chromium.launchPersistentContext(mkdtempSync(path.join(tmpdir(), 'brackline-chromium-')), {
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    headless: true,
    viewport: { width: 1280, height: 860 },
    args: [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
  });
}

export async function screenshot(page: Page, name: string): Promise<void> {
  await page.screenshot({ path: path.join(SCREENSHOT_DIR, `${name}.png`), fullPage: true });
}

/** Collects page errors so a test can assert none happened. */
export function watchErrors(page: Page): string[] {
  const errors: string[] = [];
  page.on('pageerror', (e) => errors.push(e.message));
  page.on('console', (m) => {
    if (m.type() === 'error' && !/401|Failed to load resource/.test(m.text())) errors.push(m.text());
  });
  return errors;
}

export async function signInThroughForm(page: Page, baseUrl: string, email: string, password: string): Promise<void> {
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in', exact: true }).click();
}

/** One browser per test file: opened before its tests, closed after them. */
export function browserForThisFile(): () => BrowserContext {
  let context: BrowserContext | undefined;
  beforeAll(async () => {
    context = await openBrowser();
  });
  afterAll(async () => {
    await context?.close();
  });
  return () => {
    if (!context) throw new Error('The browser is not open yet: call browser() inside a test.');
    return context;
  };
}
