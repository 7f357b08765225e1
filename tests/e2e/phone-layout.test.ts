// On a phone (390 px) no page scrolls sideways: tables become stacked cards, forms and panels
// fit. Every page, as the admin sees it (every page, with every control) and as the surveyor
// sees it (the role that works from a phone).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { demoEmail, launchBrowser, signIn } from '../helpers/browser';
import { openPage, pagesFor, settle } from '../helpers/pages';
import type { Role } from '../../src/lib/domain/roles';

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe.each(['admin', 'surveyor'] as Role[])('pages at 390 px for the %s', (role) => {
  let context: BrowserContext;
  let page: Page;
  beforeAll(async () => {
    context = await browser.newContext({ viewport: { width: 390, height: 844 } });
    page = await context.newPage();
    await signIn(page, demoEmail(role));
  });
  afterAll(async () => {
    await context?.close();
  });

  it.each(pagesFor(role).map((p) => [p.label, p] as const))('%s does not scroll sideways', async (_label, p) => {
    const res = await openPage(page, p);
    expect(res?.status()).toBe(200);
    await settle(page);
    // Elements wider than the screen, named so a failure says where to look.
    const wide = await page.evaluate(() => {
      const width = document.documentElement.clientWidth;
      if (document.documentElement.scrollWidth <= width) return [];
      return [...document.querySelectorAll('body *')]
        .filter((e) => e.getBoundingClientRect().right > width + 1 && getComputedStyle(e).position !== 'fixed')
        .slice(0, 5)
        .map(
          (e) =>
            `${e.tagName.toLowerCase()}${e.id ? `#${e.id}` : ''}.${[...e.classList].slice(0, 3).join('.')} (${Math.round(e.getBoundingClientRect().right)} px)`,
        );
    });
    expect(wide).toEqual([]);
    // Nor does any box inside the page, a table's wrapper above all (the map's canvas pans, it does not scroll).
    const scrolling = await page.locator('body *').evaluateAll((els) =>
      els
        .filter((e) => ['auto', 'scroll'].includes(getComputedStyle(e).overflowX) && e.scrollWidth > e.clientWidth + 1)
        .filter((e) => !e.closest('.maplibregl-map'))
        .map((e) => `${e.tagName.toLowerCase()}.${[...e.classList].slice(0, 3).join('.')} (${e.scrollWidth} > ${e.clientWidth} px)`),
    );
    expect(scrolling).toEqual([]);
  });
});
