import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { APP_URL, demoEmail, launchBrowser, signIn, watchOutsideRequests } from '../helpers/browser';
import { headerNavigationFor } from '../../src/lib/domain/navigation';
import { ROLES } from '../../src/lib/domain/roles';

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe('signing in through the form', () => {
  it.each(ROLES)('shows the %s the navigation of their role', async (role) => {
    const page = await browser.newPage({ viewport: { width: 1200, height: 800 } });
    const outside = watchOutsideRequests(page);
    await signIn(page, demoEmail(role));
    expect(new URL(page.url()).pathname).toBe('/');
    await expect(page.locator('[data-testid=whoami]').innerText()).resolves.toContain(
      role === 'admin' ? 'Admin' : role.charAt(0).toUpperCase() + role.slice(1),
    );
    const links = await page.locator('nav[aria-label=Main] a').allInnerTexts();
    expect(links).toEqual(headerNavigationFor(role).map((n) => n.label));
    if (role === 'admin') await page.screenshot({ path: 'test-results/home-admin.png' });
    expect(outside).toEqual([]);
    await page.close();
  });

  it('shows an error for a wrong password and keeps the user on the sign-in page', async () => {
    const page = await browser.newPage();
    await signIn(page, demoEmail('planner'), 'wrong-password');
    expect(new URL(page.url()).pathname).toBe('/login');
    await expect(page.locator('[data-testid=login-error]').innerText()).resolves.toContain('Wrong e-mail or password');
    await page.close();
  });

  it('returns to the page asked for after sign-in, and signs out', async () => {
    const page = await browser.newPage({ viewport: { width: 390, height: 844 } });
    await page.goto(`${APP_URL}/admin/users`);
    expect(new URL(page.url()).pathname).toBe('/login');
    await page.fill('#email', demoEmail('admin'));
    await page.fill('#password', 'bearline-demo');
    await Promise.all([page.waitForURL(`${APP_URL}/admin/users`), page.click('button[type=submit]')]);
    await page.getByRole('cell', { name: 'Tamsin Vey' }).waitFor();
    await page.screenshot({ path: 'test-results/users-phone.png', fullPage: true });
    await Promise.all([page.waitForURL(/\/login/), page.getByRole('button', { name: 'Sign out' }).click()]);
    const res = await page.goto(`${APP_URL}/admin/users`);
    expect(new URL(page.url()).pathname).toBe('/login');
    expect(res?.status()).toBe(200);
    await page.close();
  });
});
