// After the install: an installer records after-install readings and speed tests against the plan,
// sees measured gain against predicted, and the planner marks the install verified.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { APP_URL, demoEmail, launchBrowser, signIn, watchOutsideRequests } from '../helpers/browser';

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

async function openInstalledCustomer(role: string) {
  const page = await browser.newPage({ viewport: { width: 390, height: 900 } });
  await signIn(page, demoEmail(role));
  await page.goto(`${APP_URL}/customers`);
  await page.getByRole('link', { name: 'Morwen Tilley' }).first().click();
  await page.getByText('Install checks: measured against predicted').waitFor();
  return page;
}

describe('install checks', () => {
  it('lets a surveyor record an after-install check on a phone and see the measured gain', async () => {
    const page = await openInstalledCustomer('surveyor');
    const outside = watchOutsideRequests(page);
    const form = page.locator("form[aria-label='Record an install check']");
    await form.getByLabel('RSRP dBm').fill('-70');
    await form.getByLabel('SINR dB').fill('18');
    await form.getByRole('button', { name: 'Add a speed test' }).click();
    await form.getByLabel('Down Mbit/s').fill('61.5');
    await form.getByLabel('Up Mbit/s').fill('12');
    await form.getByRole('button', { name: 'Save after check' }).click();
    // The comparison now uses the new after check for the planned PCI: −70 dBm after.
    await page.locator('td', { hasText: '-70.0 dBm' }).first().waitFor();
    await page.screenshot({ path: 'test-results/install-check-phone.png', fullPage: true });
    expect(outside).toEqual([]);
    await page.close();
  });

  it('refuses a reading out of range with the message beside the field', async () => {
    const page = await openInstalledCustomer('surveyor');
    const form = page.locator("form[aria-label='Record an install check']");
    await form.getByLabel('RSRP dBm').fill('-20');
    await form.getByRole('button', { name: 'Save after check' }).click();
    await expect(
      form
        .locator('.field-error', { hasText: /RSRP must be between/ })
        .first()
        .innerText(),
    ).resolves.toMatch(/−156 and −31 dBm/);
    await page.close();
  });

  it('lets the planner mark the install verified', async () => {
    const page = await openInstalledCustomer('planner');
    await page.getByRole('button', { name: 'Mark verified' }).first().click();
    await page.locator('[data-testid=customer-notice]', { hasText: /is now verified/ }).waitFor();
    await page.close();
  });
});
