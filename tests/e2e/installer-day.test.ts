// Journey 6, the installer's day on a phone (390 px): the week's booked visits → the aim sheet →
// mark installed → record the install check. Nothing on the way scrolls sideways.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { APP_URL, demoEmail, launchBrowser, signIn, watchOutsideRequests } from '../helpers/browser';

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

const PHONE = { width: 390, height: 844 };

/** The page is no wider than the phone: nothing needs sideways scrolling. */
async function expectNoSidewaysScroll(page: Page) {
  const { scroll, client } = await page.evaluate(() => ({ scroll: document.documentElement.scrollWidth, client: document.documentElement.clientWidth }));
  expect(scroll).toBeLessThanOrEqual(client);
}

describe("installer's day", () => {
  it('goes from the schedule to the aim sheet, marks the plan installed and records the install check', async () => {
    const page = await browser.newPage({ viewport: PHONE });
    const outside = watchOutsideRequests(page);
    const errors: string[] = [];
    page.on('pageerror', (e) => errors.push(e.message));
    await signIn(page, demoEmail('surveyor'));

    // The schedule is in the surveyor's navigation.
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Schedule' }).click();
    await page.waitForURL(/\/schedule$/);
    const visits = page.getByTestId('visit');
    await visits.first().waitFor();
    await expectNoSidewaysScroll(page);
    await page.screenshot({ path: 'test-results/schedule-phone.png', fullPage: true });

    // Groups come in working order, and every visit offers its aim sheet.
    const groups = await page.locator('section[data-testid^=visits-]').evaluateAll((els) => els.map((e) => e.getAttribute('data-testid')));
    const order = ['visits-past-due', 'visits-this-week', 'visits-later'];
    expect(groups.length).toBeGreaterThan(0);
    expect([...groups].sort((a, b) => order.indexOf(a!) - order.indexOf(b!))).toEqual(groups);
    expect(await visits.count()).toBe(await page.getByTestId('open-aim-sheet').count());
    // The demo books its visits from the day it is loaded: one past due, one today, one later.
    expect(groups).toEqual(order);
    // A past due visit still to be installed says so; one installed this week stays beside it, as installed.
    const pastDue = page.getByTestId('visits-past-due').getByTestId('visit');
    await expect(pastDue.filter({ hasNotText: '✓ Installed' }).first().innerText()).resolves.toMatch(/Past due: \d+ days? overdue/);
    for (const text of await pastDue.filter({ hasText: '✓ Installed' }).allInnerTexts()) expect(text).not.toMatch(/Past due/);
    // Address and postcode read "…, Town, AB-1234": no stray space before a comma.
    for (const text of await visits.allInnerTexts()) expect(text).not.toMatch(/\s,/);

    // Take this week's first visit still to be installed.
    const visit = page
      .getByTestId('visits-this-week')
      .locator('[data-testid=visit]', { has: page.getByRole('button', { name: 'Mark installed' }) })
      .first();
    const planId = await visit.getAttribute('data-plan-id');
    const customer = (await visit.getByRole('heading', { level: 3 }).innerText()).trim();
    expect(planId).toMatch(/^\d+$/);

    // One tap to the aim sheet: the bearing to set on the compass, then the safety cautions.
    await Promise.all([page.waitForURL(new RegExp(`/plans/${planId}/sheet$`)), visit.getByTestId('open-aim-sheet').click()]);
    const sheet = page.getByTestId('aim-sheet');
    await expect(sheet.innerText()).resolves.toContain(customer);
    await expect(page.getByTestId('sheet-magnetic').innerText()).resolves.toMatch(/^\d{1,3}\.\d°$/);
    await expect(page.getByTestId('safety-cautions').innerText()).resolves.toMatch(/power lines/i);
    await expectNoSidewaysScroll(page);
    await page.screenshot({ path: 'test-results/aim-sheet-phone.png', fullPage: true });

    // Mark installed asks once more before it moves the job on.
    await page.getByRole('button', { name: 'Mark installed' }).click();
    await page.getByRole('button', { name: 'Yes, mark installed' }).click();
    await page.getByTestId('marked-installed').waitFor();

    // The record of the install check is on the customer's page, at this plan.
    await Promise.all([page.waitForURL(/\/customers\/\d+#plan-\d+$/), page.getByRole('link', { name: 'Record the install check' }).click()]);
    const plan = page.locator(`#plan-${planId}`);
    await expect(plan.getByTestId('plan-state').innerText()).resolves.toMatch(/Installed/);
    const form = plan.locator("form[aria-label='Record an install check']");
    await form.getByLabel('RSRP dBm').fill('-84');
    await form.getByLabel('SINR dB').fill('12');
    await form.getByRole('button', { name: 'Add a speed test' }).click();
    await form.getByLabel('Down Mbit/s').fill('38');
    await form.getByLabel('Up Mbit/s').fill('9');
    await form.getByRole('button', { name: 'Save after check' }).click();
    await plan.locator('td', { hasText: '-84.0 dBm' }).first().waitFor();
    await expectNoSidewaysScroll(page);
    await page.screenshot({ path: 'test-results/install-check-after-schedule-phone.png', fullPage: true });

    // Back on the schedule the visit shows as done, with its check recorded.
    await page.goto(`${APP_URL}/schedule`);
    const done = page.locator(`[data-testid=visit][data-plan-id="${planId}"]`);
    await expect(done.innerText()).resolves.toMatch(/Installed[\s\S]*Install check recorded/);

    expect(outside).toEqual([]);
    expect(errors).toEqual([]);
    await page.close();
  });

  it('refuses to mark installed from a page loaded before someone else changed the plan', async () => {
    const page = await browser.newPage({ viewport: PHONE });
    await signIn(page, demoEmail('surveyor'));
    await page.goto(`${APP_URL}/schedule`);
    const visit = page.locator('[data-testid=visit]', { has: page.getByRole('button', { name: 'Mark installed' }) }).first();
    const planId = await visit.getAttribute('data-plan-id');

    // A second phone marks the same visit installed first.
    const other = await browser.newPage({ viewport: PHONE });
    await signIn(other, demoEmail('surveyor'));
    await other.goto(`${APP_URL}/plans/${planId}/sheet`);
    await other.getByRole('button', { name: 'Mark installed' }).click();
    await other.getByRole('button', { name: 'Yes, mark installed' }).click();
    await other.getByTestId('marked-installed').waitFor();
    await other.close();

    await visit.getByRole('button', { name: 'Mark installed' }).click();
    await visit.getByRole('button', { name: 'Yes, mark installed' }).click();
    await expect(visit.getByRole('alert').innerText()).resolves.toMatch(/Someone else changed this plan[\s\S]*Reload/);
    await page.close();
  });

  it('links the home page counters to the customers with plans in that state', async () => {
    const page = await browser.newPage({ viewport: PHONE });
    await signIn(page, demoEmail('planner'));
    await page.goto(`${APP_URL}/`);
    const count = Number(await page.getByTestId('plans-installed').locator('.text-2xl').innerText());
    expect(count).toBeGreaterThan(0);
    await Promise.all([page.waitForURL(/\/customers\?state=installed$/), page.getByTestId('plans-installed').click()]);
    await expect(page.getByTestId('customer-state-filter').inputValue()).resolves.toBe('installed');
    const rows = page.locator('table.data-table tbody tr');
    await rows.first().waitFor();
    // Customers, not plans: one customer may hold several installed plans.
    expect(await rows.count()).toBeGreaterThan(0);
    expect(await rows.count()).toBeLessThanOrEqual(count);
    await expectNoSidewaysScroll(page);

    // Changing the filter rewrites the address, so the list can be shared and reloaded.
    await page.getByTestId('customer-state-filter').selectOption('scheduled');
    await page.waitForURL(/\/customers\?state=scheduled$/);
    await page.reload();
    await expect(page.getByTestId('customer-state-filter').inputValue()).resolves.toBe('scheduled');
    await page.close();
  });
});
