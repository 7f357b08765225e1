// WCAG 2.1 AA in a real browser: axe-core finds no serious or critical violation on any page,
// opened by every role that sees it (the role's navigation plus the pages reached from it), at
// desktop width, and on the field pages at phone width too. Rules are never switched off: a
// finding is fixed in the colours or the markup.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import AxeBuilder from '@axe-core/playwright';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { APP_URL, demoEmail, launchBrowser, signIn } from '../helpers/browser';
import { openPage, pagesFor, settle } from '../helpers/pages';
import { ROLES } from '../../src/lib/domain/roles';

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

/** Serious and critical findings, one line each with up to three of the elements concerned. */
async function seriousViolations(page: Page): Promise<string[]> {
  const result = await new AxeBuilder({ page }).withTags(['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa']).analyze();
  return result.violations
    .filter((v) => v.impact === 'serious' || v.impact === 'critical')
    .map(
      (v) =>
        `${v.id}: ${v.nodes
          .map((n) => `${n.target.join(' ')} ${n.failureSummary ?? ''}`)
          .slice(0, 3)
          .join(' | ')}`,
    );
}

describe.each(ROLES)('accessibility (axe-core) for the %s', (role) => {
  let context: BrowserContext;
  let page: Page;
  beforeAll(async () => {
    context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    page = await context.newPage();
    await signIn(page, demoEmail(role));
  });
  afterAll(async () => {
    await context?.close();
  });

  it.each(pagesFor(role).map((p) => [p.label, p] as const))('%s has no serious violation', async (_label, p) => {
    const res = await openPage(page, p);
    expect(res?.status()).toBe(200);
    await settle(page);
    expect(await seriousViolations(page)).toEqual([]);
  });
});

describe('accessibility (axe-core) of the pages used on a phone', () => {
  it.each([
    ['surveyor', '/schedule'],
    ['surveyor', '/sightings/new'],
    ['surveyor', '/map'],
    ['planner', '/customers?state=installed'],
  ] as const)('%s: %s at 390 px', async (role, path) => {
    const context = await browser.newContext({ viewport: { width: 390, height: 844 } });
    const page = await context.newPage();
    await signIn(page, demoEmail(role));
    await page.goto(`${APP_URL}${path}`);
    await settle(page);
    expect(await seriousViolations(page)).toEqual([]);
    await context.close();
  });

  it.each([1280, 390])('the planner with a shortlist and a chosen candidate at %d px', async (width) => {
    const context = await browser.newContext({ viewport: { width, height: 900 } });
    const page = await context.newPage();
    await signIn(page, demoEmail('planner'));
    await page.goto(`${APP_URL}/plan`);
    await page.fill('#plan-address', 'Harbour Street');
    await page.getByRole('option').first().waitFor();
    await page.keyboard.press('Enter');
    await page.locator('[data-testid=candidate-detail]').waitFor();
    await page.locator('[data-testid=terrain-legend]').waitFor();
    await settle(page);
    expect(await seriousViolations(page)).toEqual([]);
    await context.close();
  });

  it.each(['/login', '/signup', '/forgot'])('%s, signed out', async (path) => {
    const context = await browser.newContext({ viewport: { width: 390, height: 844 } });
    const page = await context.newPage();
    await page.goto(`${APP_URL}${path}`);
    await settle(page);
    expect(await seriousViolations(page)).toEqual([]);
    await context.close();
  });
});

describe('private pages', () => {
  it('keeps a signed-in page out of the browser cache', async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await signIn(page, demoEmail('planner'));
    const res = await page.goto(`${APP_URL}/plan`);
    expect(res?.headers()['cache-control']).toBe('no-store');
    await context.close();
  });
});
