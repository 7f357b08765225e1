// Journey 3 on a phone (390 px): a surveyor's sighting waits in the review queue; the reviewer
// approves it; the map gains the mast, the surveyor's mail is in the catcher, and the planner's
// shortlist for a farm nearby offers the new mast's cell.
import { randomUUID } from 'node:crypto';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { APP_URL, demoEmail, launchBrowser, signIn, waitForIslands, watchOutsideRequests } from '../helpers/browser';
import { appFetch, signInCookie } from '../helpers/app';
import { waitForMailTo } from '../helpers/mail';

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

// About 700 m north-east of Sorrel Farm (Quarrendale), where the demo map has no mast within 4 km.
const SITE = { lat: -47.096, lon: -128.488 };
const MAST_NAME = `Quarren Lane monopole ${Date.now().toString(36)}`;

async function submitSighting(cookie: string): Promise<string> {
  const ops = await (await appFetch('/api/operators', { cookie })).json();
  const operator = ops.items[0];
  const photo = await sharp({ create: { width: 96, height: 64, channels: 3, background: { r: 120, g: 140, b: 160 } } })
    .jpeg()
    .toBuffer();
  const form = new FormData();
  form.set(
    'sighting',
    JSON.stringify({
      client_uuid: randomUUID(),
      lat: SITE.lat,
      lon: SITE.lon,
      position_source: 'map',
      structure_type: 'monopole',
      estimated_height_m: 30,
      observed_at: new Date(Date.now() - 3600_000).toISOString(),
      operator_ids: [operator.id],
      cells: [{ operator_id: operator.id, tech: 'lte', channel: 6300, pci: 417, sector_azimuth_deg: 240, rsrp_dbm: -88 }],
      notes: 'Grey monopole by the lane, three panel antennas.',
    }),
  );
  form.append('photo', new Blob([photo], { type: 'image/jpeg' }), 'monopole.jpg');
  const res = await appFetch('/api/sightings', { method: 'POST', cookie, headers: { origin: APP_URL }, body: form });
  expect(res.status).toBe(201);
  return (await res.json()).id as string;
}

describe('reviewer journey on a phone', () => {
  it('approves a pending sighting: the map changes, the surveyor is mailed, the shortlist offers the new cell', async () => {
    const surveyorCookie = await signInCookie('surveyor');
    const sightingId = await submitSighting(surveyorCookie);

    const page = await browser.newPage({ viewport: { width: 390, height: 844 } });
    const outside = watchOutsideRequests(page);
    const errors: string[] = [];
    page.on('pageerror', (e) => errors.push(e.message));
    await signIn(page, demoEmail('reviewer'));
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Review' }).click();
    await page.waitForURL(`${APP_URL}/review`);
    await page.getByTestId(`queue-item-${sightingId}`).click();
    const detail = page.getByTestId('review-detail');
    await expect(detail.innerText()).resolves.toContain('Grey monopole by the lane');
    await expect(detail.innerText()).resolves.toContain('Masts within 300 m');
    await detail.locator('img[alt^="Photo 1"]').waitFor();
    await page.waitForFunction(() => document.querySelector('[data-testid=review-map] canvas') !== null);
    await page.screenshot({ path: 'test-results/review-phone.png', fullPage: true });

    await detail.getByRole('radio', { name: /Approve as a new mast/ }).check();
    await detail.getByLabel('Name of the new mast').fill(MAST_NAME);
    await detail.getByRole('button', { name: 'Approve as a new mast' }).click();
    const notice = page.getByTestId('review-notice');
    await page.waitForFunction(() => /Approved: new mast/.test(document.querySelector('[data-testid=review-notice]')?.textContent ?? ''));
    await expect(notice.innerText()).resolves.toContain(MAST_NAME);
    await page.getByTestId(`queue-item-${sightingId}`).waitFor({ state: 'detached' });
    await page.screenshot({ path: 'test-results/review-phone-decided.png', fullPage: true });

    // The map: the mast is there, the pending sighting is gone.
    const reviewerCookie = await signInCookie('reviewer');
    const bbox = [SITE.lon - 0.01, SITE.lat - 0.01, SITE.lon + 0.01, SITE.lat + 0.01].join(',');
    const masts = await (await appFetch(`/api/masts?bbox=${bbox}`, { cookie: reviewerCookie })).json();
    const mast = masts.features.find((f: { properties: { name: string } }) => f.properties.name === MAST_NAME);
    expect(mast).toBeDefined();
    expect(mast.geometry.coordinates[0]).toBeCloseTo(SITE.lon, 5);
    const pending = await (await appFetch('/api/sightings/pending', { cookie: reviewerCookie })).json();
    expect(pending.features.map((f: { properties: { id: string } }) => f.properties.id)).not.toContain(sightingId);

    // The surveyor's mail is in the catcher.
    const mails = await waitForMailTo(demoEmail('surveyor'));
    const mail = mails.find((m) => m.text.includes(MAST_NAME));
    expect(mail?.subject).toBe('Your sighting is on the map');

    // The planner's shortlist for Sorrel Farm offers the new mast's cell.
    const planner = await browser.newPage({ viewport: { width: 390, height: 844 } });
    await signIn(planner, demoEmail('planner'));
    await planner.goto(`${APP_URL}/plan`);
    await planner.fill('#plan-address', 'Sorrel Farm');
    await planner.getByRole('option').first().waitFor();
    await planner.keyboard.press('Enter');
    const shortlist = planner.getByRole('table', { name: 'Shortlist' });
    await shortlist.locator('tbody tr').first().waitFor();
    await expect(shortlist.innerText()).resolves.toContain(MAST_NAME);
    await planner.screenshot({ path: 'test-results/review-shortlist-phone.png', fullPage: true });

    expect(errors).toEqual([]);
    expect(outside).toEqual([]);
    await page.close();
    await planner.close();
  }, 240_000);
});

describe('accounts by e-mail in the browser', () => {
  it('signs up, follows the mailed link and arrives signed in as a contributor', async () => {
    const email = `newcomer.${Date.now().toString(36)}@example.test`;
    const page = await browser.newPage({ viewport: { width: 390, height: 844 } });
    await page.goto(`${APP_URL}/login`);
    await page.getByRole('link', { name: 'Sign up as a contributor' }).click();
    await page.waitForURL(`${APP_URL}/signup`);
    // Inline errors first, from the shared schema.
    await page.getByRole('button', { name: 'Sign up' }).click();
    await expect(page.locator('#su-name-error').innerText()).resolves.toBe('Enter your name');
    await expect(page.locator('#su-name').getAttribute('aria-invalid')).resolves.toBe('true');
    await page.fill('#su-name', 'Nia Fenwold');
    await page.fill('#su-email', email);
    await page.fill('#su-password', 'a long enough password');
    await page.keyboard.press('Enter');
    await page.getByTestId('signup-done').waitFor();
    await page.screenshot({ path: 'test-results/signup-phone.png', fullPage: true });

    const [mail] = await waitForMailTo(email);
    const link = /(https?:\/\/\S+\/verify\?token=[\w-]+)/.exec(mail!.text)![1]!;
    await page.goto(link);
    await page.getByRole('button', { name: 'Confirm my e-mail' }).click();
    await page.waitForURL(`${APP_URL}/`);
    const me = await page.evaluate(() => fetch('/api/me').then((r) => r.json()));
    expect(me).toMatchObject({ user: { email, name: 'Nia Fenwold', role: 'contributor' } });
    // The link works once.
    const again = await page.goto(link);
    expect(again?.status()).toBe(400);
    await expect(page.getByTestId('link-problem').innerText()).resolves.toMatch(/already been used/);
    await page.close();
  }, 180_000);

  it('resets a forgotten password from the mailed link', async () => {
    // A fresh contributor, so the demo accounts keep their passwords.
    const email = `forgetful.${Date.now().toString(36)}@example.test`;
    const page = await browser.newPage({ viewport: { width: 390, height: 844 } });
    await page.goto(`${APP_URL}/signup`);
    await waitForIslands(page);
    await page.fill('#su-name', 'Ovid Reth');
    await page.fill('#su-email', email);
    await page.fill('#su-password', 'the first long password');
    await page.getByRole('button', { name: 'Sign up' }).click();
    await page.getByTestId('signup-done').waitFor();
    await page.goto(/(https?:\/\/\S+\/verify\?token=[\w-]+)/.exec((await waitForMailTo(email))[0]!.text)![1]!);
    await page.getByRole('button', { name: 'Confirm my e-mail' }).click();
    await page.waitForURL(`${APP_URL}/`);
    await page.getByRole('button', { name: 'Sign out' }).click();
    await page.waitForURL(/\/login/);

    await page.getByRole('link', { name: 'Forgotten your password?' }).click();
    await page.waitForURL(/\/forgot/);
    await waitForIslands(page);
    await page.fill('#fg-email', email);
    await page.getByRole('button', { name: 'Send me a link' }).click();
    await expect(page.getByTestId('form-notice').innerText()).resolves.toMatch(/If an account uses that address/);
    const mails = await waitForMailTo(email, 2);
    const link = /(https?:\/\/\S+\/reset\?token=[\w-]+)/.exec(mails[1]!.text)![1]!;
    await page.goto(link);
    await waitForIslands(page);
    await page.fill('#sp-password', 'short');
    await page.getByRole('button', { name: 'Save the new password' }).click();
    await expect(page.locator('#sp-password-error').innerText()).resolves.toMatch(/At least 12 characters/);
    await page.fill('#sp-password', 'the second long password');
    await page.getByRole('button', { name: 'Save the new password' }).click();
    await page.waitForURL(`${APP_URL}/`);
    await page.screenshot({ path: 'test-results/reset-done-phone.png' });
    await page.close();

    const res = await appFetch('/api/auth/login', {
      method: 'POST',
      headers: { 'content-type': 'application/json', origin: APP_URL },
      body: JSON.stringify({ email, password: 'the second long password' }),
    });
    expect(res.status).toBe(200);
  }, 180_000);
});
