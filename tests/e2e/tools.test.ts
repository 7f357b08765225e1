// The calculators at phone width: instant results, units shown, bad input explained inline.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { APP_URL, demoEmail, launchBrowser, signIn, watchOutsideRequests } from '../helpers/browser';

let browser: Browser;
let page: Page;
let outside: string[];
beforeAll(async () => {
  browser = await launchBrowser();
  page = await browser.newPage({ viewport: { width: 390, height: 844 } });
  outside = watchOutsideRequests(page);
  await signIn(page, demoEmail('surveyor'));
  await page.goto(`${APP_URL}/tools`);
  // The islands are hydrated once the first result (the default EARFCN) shows.
  await page.locator('[data-testid=channel-result]').waitFor();
});

const textOf = async (selector: string, pattern: RegExp) => {
  const el = page.locator(selector, { hasText: pattern });
  await el.waitFor();
  return el.innerText();
};
afterAll(async () => {
  await browser?.close();
});

describe('calculators', () => {
  it('converts an EARFCN as you type (3GPP TS 36.101: 1300 → B3, 1815.0 MHz DL)', async () => {
    await page.fill('#ch-value', '1300');
    await expect(textOf('[data-testid=ch-band]', /^B3$/)).resolves.toBe('B3');
    await expect(page.locator('[data-testid=ch-dl]').innerText()).resolves.toBe('1815.0');
    await expect(page.locator('[data-testid=ch-ul]').innerText()).resolves.toBe('1720.0');
  });

  it('lists every band a frequency could be in (2650 MHz: B7 downlink and B41)', async () => {
    await page.getByRole('radio', { name: 'Frequency' }).check();
    await page.fill('#ch-value', '2650');
    const text = await textOf('[data-testid=frequency-result]', /more than one band/);
    expect(text).toContain('B7');
    expect(text).toContain('B41');
  });

  it('explains a channel in no band next to the field', async () => {
    await page.getByRole('radio', { name: 'Channel' }).check();
    await page.fill('#ch-value', '70000');
    await expect(textOf('#ch-value-error', /no known LTE band/)).resolves.toContain('70000');
  });

  it('gives distance and bearings for a path, and flags a bad latitude inline', async () => {
    // WGS84 case G3 (geographiclib-geodesic 2.2.0 Inverse): 48,11 → 48,11.1341 is 10 007 m at 89.95° (spherical within 0.6 %)
    await page.fill('#path-from', '48, 11');
    await page.fill('#path-to', '48, 11.1341');
    await page.fill('#path-date', '2026-01-01');
    await textOf('[data-testid=path-distance]', /^99\d\d$|^100\d\d$/);
    const distance = Number(await page.locator('[data-testid=path-distance]').innerText());
    expect(Math.abs(distance - 10007.259) / 10007.259).toBeLessThan(0.006);
    const trueBearing = Number(await page.locator('[data-testid=path-true]').innerText());
    expect(Math.abs(trueBearing - 89.95)).toBeLessThan(0.2);
    const magnetic = Number(await page.locator('[data-testid=path-magnetic]').innerText());
    expect(magnetic).toBeCloseTo(trueBearing - 4.13, 0); // W2 2026-01-01: D = +4.13° (WMM2025 via geomagnetism 0.2.0)
    await page.fill('#path-from', '95, 11');
    await expect(textOf('#path-from-hint', /latitude must be between -90 and 90/)).resolves.toBeTruthy();
    await page.screenshot({ path: 'test-results/tools-phone.png', fullPage: true });
    const width = await page.evaluate(() => document.documentElement.scrollWidth);
    expect(width).toBeLessThanOrEqual(390);
    expect(outside).toEqual([]);
  });
});
