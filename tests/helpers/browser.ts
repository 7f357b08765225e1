// Debian's Chromium driven by playwright-core, with the flags that keep it off the network.
import { mkdirSync } from 'node:fs';
import { afterAll, beforeAll } from 'vitest';
import { chromium, type Browser, type Page } from 'playwright-core';

export const APP_URL = process.env.APP_URL ?? 'http://127.0.0.1:4321';

export const CHROMIUM_ARGS = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--no-first-run',
  '--disable-quic',
  '--enable-unsafe-swiftshader',
];

export function launchBrowser(): Promise<Browser> {
  return chromium.launch({ executablePath: '/usr/bin/chromium', headless: true, args: CHROMIUM_ARGS });
}

/**
 * One Chromium for a test file: launched before its tests (with `test-results/` ready for
 * screenshots) and closed after them. Call at the top level; the getter gives the browser.
 */
export function useBrowser(): () => Browser {
  let browser: Browser | undefined;
  beforeAll(async () => {
    browser = await launchBrowser();
    mkdirSync('test-results', { recursive: true });
  });
  afterAll(async () => {
    await browser?.close();
  });
  return () => {
    if (!browser) throw new Error('The browser is not running: use it inside a test');
    return browser;
  };
}

export const DEMO_PASSWORD = 'bearline-demo';
export const demoEmail = (role: string) => `${role}@demo.bearline.test`;

export async function signIn(page: Page, email: string, password = DEMO_PASSWORD): Promise<void> {
  await page.goto(`${APP_URL}/login`);
  await page.fill('#email', email);
  await page.fill('#password', password);
  await Promise.all([page.waitForURL((u) => !u.pathname.startsWith('/login') || u.searchParams.has('error')), page.click('button[type=submit]')]);
}

/**
 * Waits until every island on the page has hydrated (Astro drops the `ssr` attribute then), so
 * that what a test types is not reset by React taking over the server-rendered inputs.
 */
export async function waitForIslands(page: Page): Promise<void> {
  await page.waitForFunction(() => document.querySelectorAll('astro-island[ssr]').length === 0);
}

/** Records every request that leaves 127.0.0.1 / localhost. */
export function watchOutsideRequests(page: Page): string[] {
  const outside: string[] = [];
  page.on('request', (req) => {
    const u = new URL(req.url());
    if (['data:', 'blob:'].includes(u.protocol)) return;
    if (!['127.0.0.1', 'localhost', '[::1]'].includes(u.hostname)) outside.push(req.url());
  });
  return outside;
}
