// A planner erases a customer's personal data on their request: the button asks first, Cancel
// changes nothing, and after confirming the page shows the erased record.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { APP_URL, demoEmail, launchBrowser, signIn } from '../helpers/browser';

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe('erasing a customer', () => {
  it('asks for confirmation, then erases the personal data and shows it is gone', async () => {
    const page = await browser.newPage();
    await signIn(page, demoEmail('planner'));
    // A customer of this test's own, so the demo customers stay as the other tests expect them.
    const created = await page.evaluate(async () => {
      const res = await fetch('/api/customers', {
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify({ name: 'Orla Penhallow', phone: '+00 1632 960 777', address_label: 'Gull Cottage, Skerry Lane', lat: -47.21, lon: -128.52 }),
      });
      return (await res.json()) as { id: string };
    });
    await page.goto(`${APP_URL}/customers/${created.id}`);
    await page.getByText('Gull Cottage, Skerry Lane').waitFor();

    await page.getByRole('button', { name: 'Erase personal data…' }).click();
    const dialog = page.getByRole('alertdialog');
    await expect(dialog.innerText()).resolves.toMatch(/cannot be undone/);
    await dialog.getByRole('button', { name: 'Cancel' }).click();
    await expect(page.getByRole('alertdialog').count()).resolves.toBe(0);
    await expect(page.getByText('Gull Cottage, Skerry Lane').count()).resolves.toBe(1);

    await page.getByRole('button', { name: 'Erase personal data…' }).click();
    await page.getByRole('button', { name: 'Yes, erase personal data' }).click();
    await page.getByText(/Personal data erased on the customer/).waitFor();
    await expect(page.getByText('Gull Cottage, Skerry Lane').count()).resolves.toBe(0);
    await expect(page.content()).resolves.not.toContain('Penhallow');
    await expect(page.getByRole('button', { name: 'Erase personal data…' }).count()).resolves.toBe(0);
    await page.screenshot({ path: 'test-results/customer-erased.png', fullPage: true });
    await page.close();
  });

  it('offers no erasure to a surveyor', async () => {
    const page = await browser.newPage();
    await signIn(page, demoEmail('surveyor'));
    await page.goto(`${APP_URL}/customers`);
    await page.getByRole('link', { name: 'Morwen Tilley' }).first().click();
    await page.getByRole('heading', { name: 'Details' }).waitFor();
    await expect(page.getByRole('button', { name: 'Erase personal data…' }).count()).resolves.toBe(0);
    await page.close();
  });
});
