// Planning: a planner picks the best mast for an address, saves the plan and prints the aim sheet.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdirSync } from 'node:fs';
import type { Browser } from 'playwright-core';
import { APP_URL, demoEmail, launchBrowser, signIn, watchOutsideRequests } from '../helpers/browser';

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
  mkdirSync('test-results', { recursive: true });
});
afterAll(async () => {
  await browser?.close();
});

describe('planner journey', () => {
  it('searches an address, ranks candidates, shows the terrain profile, saves the plan and prints the aim sheet', async () => {
    const page = await browser.newPage({ viewport: { width: 1300, height: 1000 } });
    const outside = watchOutsideRequests(page);
    const errors: string[] = [];
    page.on('pageerror', (e) => errors.push(e.message));
    await signIn(page, demoEmail('planner'));
    await page.goto(`${APP_URL}/plan`);

    await page.fill('#plan-address', 'Harbour Street');
    const option = page.getByRole('option').first();
    await option.waitFor();
    await page.keyboard.press('Enter');
    await expect(page.locator('[data-testid=plan-position]').innerText()).resolves.toMatch(/Position -?\d+\.\d+, -?\d+\.\d+/);

    // The shortlist: ranked rows, best first, each with distance, bearings, tilt, terrain and RSRP.
    const rows = page.locator('table tbody tr');
    await rows.first().waitFor();
    expect(await rows.count()).toBeGreaterThan(3);
    const rsrp = await page.locator('table tbody tr [data-testid=rsrp]').allInnerTexts();
    const values = rsrp.map(Number);
    expect(values.every(Number.isFinite)).toBe(true);
    expect(values[0]).toBeGreaterThanOrEqual(Math.max(...values.slice(1)) - 6); // rank 1 best up to the operator preference

    // Pick the second candidate and see its terrain profile and budget.
    await rows.nth(1).locator('button').first().click();
    await page.locator('[data-testid=terrain-chart] svg').first().waitFor();
    await expect(page.locator('[data-testid=budget]').innerText()).resolves.toContain('Predicted RSRP');
    await page.screenshot({ path: 'test-results/planner.png', fullPage: true });

    // The map drew the bearing lines (MapLibre with WebGL in headless Chromium).
    const lineCount = await page.evaluate(() => window.bearlinePlannerMap?.querySourceFeatures('planner-lines').length ?? -1);
    expect(lineCount).toBeGreaterThan(0);

    await page.fill('#plan-customer-name', 'Journey Test Customer');
    await Promise.all([page.waitForURL(/\/plans\/\d+\/sheet$/), page.getByRole('button', { name: /Save plan/ }).click()]);
    const sheet = page.locator('[data-testid=aim-sheet]');
    await expect(sheet.innerText()).resolves.toContain('Journey Test Customer');
    const trueAz = Number((await page.locator('[data-testid=sheet-true]').innerText()).replace('°', ''));
    const magAz = Number((await page.locator('[data-testid=sheet-magnetic]').innerText()).replace('°', ''));
    expect(trueAz).toBeGreaterThanOrEqual(0);
    expect(trueAz).toBeLessThan(360);
    expect(Math.abs(magAz - trueAz)).toBeGreaterThan(1); // the demo island lies where declination is large
    await expect(page.locator('[data-testid=safety-cautions]').innerText()).resolves.toMatch(/power lines/i);
    await page.emulateMedia({ media: 'print' });
    await page.pdf({ path: 'test-results/aim-sheet.pdf', format: 'A4', printBackground: true });
    expect(outside).toEqual([]);
    expect(errors).toEqual([]);
    await page.close();
  });
});
