// Journey 2: a surveyor records a mast from a phone (390 px), with the position from a photo's GPS
// tags, then records another with no signal; it waits on the phone and goes when the signal returns.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { APP_URL, demoEmail, launchBrowser, signIn, watchOutsideRequests } from '../helpers/browser';
import { makeJpeg } from '../helpers/photos';

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

interface Mine {
  items: Array<{
    id: string;
    status: string;
    lat: number;
    lon: number;
    structure_type: string;
    photos: unknown[];
    cells: Array<{ pci: number | null }>;
    position_source: string;
  }>;
}

async function phone(): Promise<{ context: BrowserContext; page: Page }> {
  const context = await browser.newContext({ viewport: { width: 390, height: 860 }, serviceWorkers: 'allow' });
  const page = await context.newPage();
  await signIn(page, demoEmail('surveyor'));
  return { context, page };
}

const mine = async (page: Page): Promise<Mine> => (await page.request.get(`${APP_URL}/api/sightings?mine=1`)).json();

describe('sightings on a phone', () => {
  it('records a mast with the position from a photo, shows field errors inline, and lists it as pending', async () => {
    const { context, page } = await phone();
    const outside = watchOutsideRequests(page);
    await page.goto(`${APP_URL}/sightings/new`);
    const form = page.locator("form[aria-label='New sighting']");
    await form.waitFor();
    const before = (await mine(page)).items.length;

    // Nothing filled in: the schema's messages appear beside the fields.
    await form.getByRole('button', { name: 'Submit sighting' }).click();
    await page.locator('#structure_type-error').waitFor();
    await expect(page.locator('#lat-error').innerText()).resolves.toMatch(/Latitude/);

    // Invented position on the demo island's waters; EXIF written by piexifjs in the test.
    const jpeg = await makeJpeg({ gps: { lat: -47.2311, lon: -128.4702 }, takenAt: '2026:11:30 09:58:00' });
    await page.getByTestId('photo-input').setInputFiles({ name: 'IMG_2041.jpg', mimeType: 'image/jpeg', buffer: jpeg });
    await page.getByTestId('position-source').getByText("from the photo's GPS").waitFor();
    await expect(page.locator('#lat').inputValue()).resolves.toBe('-47.231100');
    await form.getByLabel('Monopole').check();
    await form.getByLabel('Estimated height (m)').fill('24');
    await form.getByRole('button', { name: 'Add a cell' }).click();
    await form.locator('#cell-0-operator').selectOption({ index: 1 });
    await form.locator('#cell-0-channel').fill('6300');
    await form.locator('#cell-0-pci').fill('999');
    await form.locator('#cell-0-rsrp').fill('-97');
    await form.getByRole('button', { name: 'Submit sighting' }).click();
    // LTE PCI is 0–503 (3GPP TS 36.211 §6.11): refused before anything is sent.
    await form.locator('.field-error', { hasText: 'LTE PCI must be 0–503' }).waitFor();
    await form.locator('#cell-0-pci').fill('101');
    await page.screenshot({ path: 'test-results/sighting-form-phone.png', fullPage: true });
    await form.getByRole('button', { name: 'Submit sighting' }).click();
    await page.getByRole('status').getByText('Sent.').waitFor();

    const after = await mine(page);
    expect(after.items.length).toBe(before + 1);
    const s = after.items[0]!;
    expect(s).toMatchObject({ status: 'pending', structure_type: 'monopole', position_source: 'photo' });
    expect(s.lat).toBeCloseTo(-47.2311, 4);
    expect(s.photos).toHaveLength(1);
    expect(s.cells[0]!.pci).toBe(101);

    await page.goto(`${APP_URL}/sightings`);
    await page.getByTestId('my-sighting').first().getByText('Waiting for review').waitFor();
    await page.screenshot({ path: 'test-results/my-sightings-phone.png', fullPage: true });

    // The map's pending layer has it, for its author.
    const pending = await (await page.request.get(`${APP_URL}/api/sightings/pending`)).json();
    expect(pending.features.some((f: { properties: { id: string; mine: boolean } }) => f.properties.id === s.id && f.properties.mine)).toBe(true);
    expect(outside).toEqual([]);
    await context.close();
  });

  it('keeps a sighting made with no signal and sends it once the signal returns', async () => {
    const { context, page } = await phone();
    await page.goto(`${APP_URL}/sightings/new`);
    await page.locator("form[aria-label='New sighting']").waitFor();
    // The service worker takes over this page and keeps the page and its assets.
    await page.waitForFunction(() => navigator.serviceWorker?.controller !== null, undefined, { timeout: 30_000 });
    await page.waitForTimeout(5000);
    const before = (await mine(page)).items.length;

    await context.setOffline(true);
    await page.reload();
    const form = page.locator("form[aria-label='New sighting']");
    await form.waitFor();
    await form.getByLabel('Latitude').fill('-47.25');
    await form.getByLabel('Longitude').fill('-128.52');
    await form.getByLabel('Rooftop').check();
    await form.getByRole('button', { name: 'Submit sighting' }).click();
    await page.getByRole('status').getByText('waiting to send').waitFor();
    await page.getByTestId('outbox').getByText('Waiting to send').waitFor();
    await page.screenshot({ path: 'test-results/sighting-offline-phone.png', fullPage: true });

    await context.setOffline(false);
    await page.getByTestId('outbox').waitFor({ state: 'detached', timeout: 30_000 });
    const after = await mine(page);
    expect(after.items.length).toBe(before + 1);
    expect(after.items[0]).toMatchObject({ status: 'pending', structure_type: 'rooftop', position_source: 'map' });
    expect(after.items[0]!.lat).toBeCloseTo(-47.25, 6);
    await context.close();
  });
});
