// Journey 5, region coverage, at desktop and phone width: a surveyor imports a day's survey log on
// /readings/import (progress bar, then the report), the region page counts it, and its exports download.
import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import type { Browser, Page } from 'playwright-core';
import { APP_URL, demoEmail, launchBrowser, signIn, watchOutsideRequests } from '../helpers/browser';

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

interface RegionCounts {
  id: string;
  readings: number;
  last: string | null;
}

async function regionReadings(page: Page): Promise<RegionCounts[]> {
  const list = (await (await page.request.get(`${APP_URL}/api/regions`)).json()) as { items: Array<{ id: string }> };
  return Promise.all(
    list.items.map(async (r) => {
      const s = (await (await page.request.get(`${APP_URL}/api/regions/${r.id}/summary`)).json()) as {
        readings: { total: number; last_taken_at: string | null };
      };
      return { id: r.id, readings: s.readings.total, last: s.readings.last_taken_at };
    }),
  );
}

describe.each([
  ['desktop', 1280, 900],
  ['phone', 390, 844],
])('region coverage at %s width', (_label, width, height) => {
  let page: Page;
  let outside: string[];
  beforeAll(async () => {
    page = await browser.newPage({ viewport: { width, height }, acceptDownloads: true });
    outside = watchOutsideRequests(page);
    await signIn(page, demoEmail('surveyor'));
  });
  afterAll(async () => {
    await page?.close();
  });

  it('imports a day’s survey log with a progress bar; the region page counts it and exports it', async () => {
    await page.goto(`${APP_URL}/readings/import`);
    // The sample log is made around cells on the map: every row should match one.
    const [sample] = await Promise.all([page.waitForEvent('download'), page.getByRole('link', { name: 'Download the sample CSV' }).click()]);
    const csv = readFileSync((await sample.path())!, 'utf8');
    const rows = csv.trim().split('\n').length - 1;
    expect(rows).toBeGreaterThan(0);

    const before = await regionReadings(page);
    await page.setInputFiles('#readings-file', { name: 'survey-day.csv', mimeType: 'text/csv', buffer: Buffer.from(csv) });
    const progress = page.getByRole('progressbar');
    await page.getByRole('button', { name: 'Import readings' }).click();
    await progress.first().waitFor({ state: 'attached' });
    const report = page.getByTestId('import-report');
    await report.waitFor({ timeout: 60_000 });
    await expect.poll(() => report.innerText()).toContain(`Rows ${rows} · stored ${rows} · matched to a cell ${rows}`);
    expect(await progress.last().getAttribute('aria-valuenow')).toBe('100');

    const after = await regionReadings(page);
    const grown = after.filter((r) => r.readings > (before.find((b) => b.id === r.id)?.readings ?? 0));
    expect(grown.length).toBeGreaterThan(0);
    expect(grown.reduce((sum, r) => sum + r.readings - before.find((b) => b.id === r.id)!.readings, 0)).toBe(rows);

    // The region list leads to the region, whose page shows the new total and the day of the log.
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Regions' }).click();
    await page.waitForURL(`${APP_URL}/regions`);
    // The regions page counts the same readings, whether or not the signal map has binned the new ones yet.
    for (const r of after) {
      expect((await page.locator(`[data-testid=region-row-${r.id}] td[data-label=Readings]`).innerText()).replace(/\D/g, '')).toBe(String(r.readings));
    }
    const region = grown[0]!;
    await page.locator(`[data-testid=region-row-${region.id}] a`).click();
    await page.waitForURL(`${APP_URL}/regions/${region.id}`);
    expect((await page.getByTestId('figure-readings').innerText()).replace(/,/g, '')).toBe(String(region.readings));
    expect(await page.getByTestId('region-readings').innerText()).toContain((region.last ?? '').slice(0, 10));

    const [file] = await Promise.all([page.waitForEvent('download'), page.getByTestId('export-readings-csv').click()]);
    expect(file.suggestedFilename()).toMatch(new RegExp(`^bearline-readings-region-${region.id}-\\d{8}\\.csv$`));
    const exported = Papa.parse<Record<string, string>>(readFileSync((await file.path())!, 'utf8'), { header: true, skipEmptyLines: true });
    expect(exported.errors).toEqual([]);
    expect(exported.data).toHaveLength(region.readings);

    const [kml] = await Promise.all([page.waitForEvent('download'), page.getByTestId('export-masts-kml').click()]);
    expect(kml.suggestedFilename()).toMatch(/\.kml$/);
    expect(readFileSync((await kml.path())!, 'utf8')).toContain('<kml xmlns="http://www.opengis.net/kml/2.2">');
    expect(outside).toEqual([]);
  });
});
