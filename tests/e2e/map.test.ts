// The mast map in headless Chromium with WebGL: basemap and labels from the app's own tiles and
// font, mast marks, filters, search, the mast panel (side panel and phone bottom sheet), and no
// request leaving the machine.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { APP_URL, demoEmail, launchBrowser, signIn, watchOutsideRequests } from '../helpers/browser';
import { renderedMasts, settle, waitForMasts } from '../helpers/map-page';

const PLACE_LAYERS = ['label-place-major', 'label-place-minor'];

let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});

afterAll(async () => {
  await browser?.close();
});

async function openMap(role: string, viewport = { width: 1280, height: 860 }): Promise<{ context: BrowserContext; page: Page; outside: string[] }> {
  const context = await browser.newContext({ viewport });
  const page = await context.newPage();
  const outside = watchOutsideRequests(page);
  await signIn(page, demoEmail(role));
  await page.goto(`${APP_URL}/map`);
  await waitForMasts(page);
  return { context, page, outside };
}

describe('mast map', () => {
  it('draws the basemap, place labels and mast marks with WebGL, fetching nothing from elsewhere', async () => {
    const { context, page, outside } = await openMap('planner');
    try {
      const info = await page.evaluate((placeLayers) => {
        const map = window.bearlineMap!;
        const gl = map.getCanvas().getContext('webgl2') ?? map.getCanvas().getContext('webgl');
        return {
          webgl: !!gl,
          labels: map.queryRenderedFeatures({ layers: placeLayers }).map((f) => String(f.properties?.name)),
          land: map.queryRenderedFeatures({ layers: ['land'] }).length,
          roads: map.queryRenderedFeatures({ layers: ['road-fill'] }).length,
          glyphs: map.getStyle().glyphs ?? null,
          sprite: map.getStyle().sprite ?? null,
        };
      }, PLACE_LAYERS);
      expect(info.webgl).toBe(true);
      expect(info.land).toBeGreaterThan(0);
      expect(info.roads).toBeGreaterThan(0);
      expect(info.labels.length).toBeGreaterThan(0);
      expect(info.glyphs).toBeNull();
      expect(info.sprite).toBeNull();

      const masts = await renderedMasts(page);
      expect(masts.length).toBeGreaterThan(3);
      await expect(page.getByTestId('map-legend').textContent()).resolves.toContain('Pending sighting');
      expect(outside).toEqual([]);
    } finally {
      await context.close();
    }
  });

  it('filters masts by operator and by status without reloading the page', async () => {
    const { context, page, outside } = await openMap('planner');
    try {
      await page.evaluate(() => window.bearlineMap!.setZoom(window.bearlineMap!.getZoom() + 0.5));
      await settle(page);
      const all = await renderedMasts(page);
      const opId = all.flatMap((m) => m.opIds)[0];
      expect(opId).toBeTruthy();
      await page.evaluate(() => ((window as unknown as { marker: number }).marker = 42));

      await page.getByTestId('filters-toggle').click();
      await page.getByTestId(`filter-operator-${opId}`).check({ force: true });
      await settle(page);
      const byOperator = await renderedMasts(page);
      expect(byOperator.length).toBeGreaterThan(0);
      expect(byOperator.every((m) => m.opIds.includes(opId))).toBe(true);

      await page.getByRole('button', { name: 'Clear' }).click();
      await page.getByTestId('filter-status-active').uncheck({ force: true });
      await settle(page);
      const notActive = await renderedMasts(page);
      expect(notActive.every((m) => m.status !== 'active')).toBe(true);
      expect(notActive.length).toBeLessThan(all.length);

      // Still the same document: the filters changed the map in place.
      await expect(page.evaluate(() => (window as unknown as { marker?: number }).marker)).resolves.toBe(42);
      expect(outside).toEqual([]);
    } finally {
      await context.close();
    }
  });

  it('opens a mast panel with a sortable cells table when a mast is clicked', async () => {
    const { context, page, outside } = await openMap('planner');
    try {
      await page.evaluate(() => window.bearlineMap!.setZoom(window.bearlineMap!.getZoom() + 1));
      await settle(page);
      const [mast] = (await renderedMasts(page)).filter((m) => m.status === 'active');
      await page.mouse.click(mast.x, mast.y);

      const panel = page.getByTestId('mast-panel');
      await panel.getByRole('heading', { level: 2, name: mast.name }).waitFor();
      await expect(panel.getByTestId('mast-position').textContent()).resolves.toMatch(/^-?\d+\.\d{6}, -?\d+\.\d{6}$/);

      const table = panel.getByTestId('mast-cells').locator('table');
      const rows = table.locator('tbody tr');
      expect(await rows.count()).toBeGreaterThan(0);
      const headers = await table.locator('thead th').allTextContents();
      for (const h of ['Operator', 'Band', 'Channel', 'PCI', 'Azimuth', 'Last observed']) expect(headers.join('|')).toContain(h);
      // Technology with the band, frequency under the channel number: e.g. "LTE B20", "6300 806.0 MHz".
      await expect(rows.first().textContent()).resolves.toMatch(/(GSM|UMTS|LTE|NR) \S+.*\d+\s*\d+\.\d MHz/);
      // Seven columns fit the side panel: nothing to scroll sideways for.
      const fit = await table.evaluate((t) => ({ table: t.scrollWidth, box: t.parentElement!.clientWidth }));
      expect(fit.table).toBeLessThanOrEqual(fit.box);

      await table.getByRole('button', { name: /PCI/ }).click();
      await expect(table.locator('th[aria-sort]').textContent()).resolves.toContain('PCI');
      // A planner may not edit masts.
      expect(await panel.getByRole('button', { name: 'Edit mast' }).count()).toBe(0);

      await panel.getByRole('button', { name: 'Close mast details' }).click();
      expect(await page.getByTestId('mast-panel').count()).toBe(0);
      expect(outside).toEqual([]);
    } finally {
      await context.close();
    }
  });

  it('finds a place by name with the keyboard and flies to it', async () => {
    const { context, page, outside } = await openMap('reviewer');
    try {
      const label = await page.evaluate((layers) => {
        const f = window.bearlineMap!.queryRenderedFeatures({ layers })[0];
        return String(f.properties?.name);
      }, PLACE_LAYERS);
      const before = await page.evaluate(() => window.bearlineMap!.getZoom());
      await page.keyboard.press('/');
      await page.keyboard.type(label.slice(0, 5));
      await page
        .getByRole('option', { name: new RegExp(label) })
        .first()
        .waitFor();
      await page.keyboard.press('ArrowDown');
      await page.keyboard.press('ArrowUp');
      await page.keyboard.press('Enter');
      await page.waitForFunction((z) => window.bearlineMap!.getZoom() > z + 0.5 && !window.bearlineMap!.isMoving(), before);
      expect(outside).toEqual([]);
    } finally {
      await context.close();
    }
  });

  it('lets those who may edit masts correct one in the panel, with errors beside the fields', async () => {
    const { context, page, outside } = await openMap('reviewer');
    try {
      await page.evaluate(() => window.bearlineMap!.setZoom(window.bearlineMap!.getZoom() + 1));
      await settle(page);
      const [mast] = await renderedMasts(page);
      await page.mouse.click(mast.x, mast.y);
      const panel = page.getByTestId('mast-panel');
      await panel.getByRole('heading', { level: 2, name: mast.name }).waitFor();
      await panel.getByRole('button', { name: 'Edit mast' }).click();

      const form = panel.getByTestId('mast-edit-form');
      await form.getByLabel('Latitude').fill('123');
      await form.getByRole('button', { name: 'Save mast' }).click();
      await form.locator('#mast-lat-error').waitFor();
      await expect(form.locator('#mast-lat-error').textContent()).resolves.toMatch(/between/);

      const notes = `Gate code changes monthly (${Date.now()})`;
      await form.getByRole('button', { name: 'Cancel' }).click();
      await panel.getByRole('button', { name: 'Edit mast' }).click();
      await panel.getByLabel('Access notes').fill(notes);
      await panel.getByRole('button', { name: 'Save mast' }).click();
      await panel.getByText(notes).waitFor();
      expect(outside).toEqual([]);
    } finally {
      await context.close();
    }
  });

  it('shows the mast panel as a bottom sheet on a phone, leaving the map usable', async () => {
    const { context, page, outside } = await openMap('surveyor', { width: 390, height: 844 });
    try {
      const [mast] = (await renderedMasts(page)).filter((m) => m.y > 120 && m.y < 560);
      expect(mast).toBeTruthy();
      await page.mouse.click(mast.x, mast.y);
      const panel = page.getByTestId('mast-panel');
      await panel.getByRole('heading', { level: 2, name: mast.name }).waitFor();
      const box = (await panel.boundingBox())!;
      expect(box.width).toBeGreaterThan(380);
      expect(Math.round(box.y + box.height)).toBeGreaterThanOrEqual(843);
      expect(box.height).toBeLessThan(844 * 0.65);
      // The map above the sheet still takes gestures.
      const zoom = await page.evaluate(() => window.bearlineMap!.getZoom());
      await page.getByRole('button', { name: 'Zoom in' }).click();
      await page.waitForFunction((z) => window.bearlineMap!.getZoom() > z + 0.5, zoom);
      expect(outside).toEqual([]);
    } finally {
      await context.close();
    }
  });
});

describe('operators and regions admin', () => {
  it('saves an operator colour that the map legend then uses, and shows bad input beside the field', async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 860 } });
    const page = await context.newPage();
    const outside = watchOutsideRequests(page);
    try {
      await signIn(page, demoEmail('admin'));
      await page.goto(`${APP_URL}/admin/operators`);
      const input = page.getByTestId('colour-input-3');
      await input.waitFor();
      const original = await input.inputValue();

      await input.fill('#12');
      await page.getByRole('button', { name: 'Save' }).click();
      await page.locator('#colour-3-error').waitFor();

      await input.fill('#8844cc');
      await page.getByRole('button', { name: 'Save' }).click();
      await page.getByTestId('operators-notice').filter({ hasText: '#8844cc' }).waitFor();

      await page.goto(`${APP_URL}/map`);
      const legendDots = page.getByTestId('map-legend').locator('li span[aria-hidden="true"].rounded-full');
      await legendDots.first().waitFor();
      const colours = await legendDots.evaluateAll((els) => els.map((e) => getComputedStyle(e).backgroundColor));
      expect(colours).toContain('rgb(136, 68, 204)');

      await page.goto(`${APP_URL}/admin/operators`);
      await page.getByTestId('colour-input-3').fill(original);
      await page.getByRole('button', { name: 'Save' }).click();
      await page.getByTestId('operators-notice').filter({ hasText: original }).waitFor();
      expect(outside).toEqual([]);
    } finally {
      await context.close();
    }
  });

  it('refuses a region file without a polygon, with the reason beside the file field', async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    try {
      await signIn(page, demoEmail('admin'));
      await page.goto(`${APP_URL}/admin/regions`);
      await page.getByRole('table', { name: 'Regions' }).waitFor();
      await page.setInputFiles('#region-file', {
        name: 'point.geojson',
        mimeType: 'application/geo+json',
        buffer: Buffer.from(JSON.stringify({ type: 'Point', coordinates: [-128.5, -47.2] })),
      });
      await expect(page.locator('#region-file-error').textContent()).resolves.toContain('No Polygon or MultiPolygon');
    } finally {
      await context.close();
    }
  });
});
