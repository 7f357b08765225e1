// Shareable state: the planner's position, kit and selected cell, and the map's selected mast and
// view, live in the URL, so that a reload or Back comes back to the same place.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { APP_URL, demoEmail, launchBrowser, signIn } from '../helpers/browser';
import { renderedMasts, settle, waitForMasts } from '../helpers/map-page';

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

const param = (page: Page, name: string) => new URL(page.url()).searchParams.get(name);

describe('planner state in the URL', () => {
  const heading = async (page: Page) => (await page.locator('#candidate-heading').textContent()) ?? '';
  /** Waits until the shortlist has arrived and the candidate heading reads `text`. */
  const waitForHeading = (page: Page, text: string) =>
    page.waitForFunction((t) => document.querySelector('[aria-busy=true]') === null && document.querySelector('#candidate-heading')?.textContent === t, text, {
      timeout: 30_000,
    });
  const waitForPick = (page: Page) =>
    page.waitForFunction(() => document.querySelector('table tbody tr button[aria-pressed=true]') !== null, undefined, { timeout: 30_000 });

  it('comes back to the same position, kit and cell after a reload and after Back', async () => {
    const context = await browser.newContext({ viewport: { width: 1300, height: 1000 } });
    const page = await context.newPage();
    try {
      await signIn(page, demoEmail('planner'));
      await page.goto(`${APP_URL}/plan`);
      await page.fill('#plan-address', 'Harbour Street');
      await page.getByRole('option').first().waitFor();
      await page.keyboard.press('Enter');
      await page.locator('table tbody tr').nth(2).waitFor();
      await waitForPick(page);

      // Not the default pick and not the default kit, so that nothing passes by luck.
      await page.fill('#kit-height', '8.5');
      await page.waitForFunction(() => new URL(location.href).searchParams.get('height_m') === '8.5');
      await page.waitForFunction(() => document.querySelector('[aria-busy=true]') === null);
      await page.locator('table tbody tr').nth(2).locator('button').first().click();
      await page.waitForFunction(() => document.querySelector('table tbody tr:nth-child(3) button[aria-pressed=true]') !== null);
      const picked = await heading(page);
      await page.waitForFunction(() => new URL(location.href).searchParams.has('cell'));
      const cell = param(page, 'cell');
      const [lat, lon] = [param(page, 'lat'), param(page, 'lon')];
      expect(cell).toMatch(/^\d+$/);
      expect(lat).toMatch(/^-?\d+\.\d{6}$/);

      await page.reload();
      await waitForHeading(page, picked);
      expect(await page.locator('#kit-height').inputValue()).toBe('8.5');
      expect([param(page, 'lat'), param(page, 'lon'), param(page, 'cell')]).toEqual([lat, lon, cell]);

      // A new position is a new history entry; Back returns to the old one with its pick.
      await page.fill('#plan-address', 'Mill Farm');
      await page.getByRole('option').first().waitFor();
      await page.keyboard.press('Enter');
      await page.waitForFunction((old) => new URL(location.href).searchParams.get('lat') !== old, lat);
      await waitForPick(page);
      await page.waitForFunction((old) => document.querySelector('#candidate-heading')?.textContent !== old, picked);

      await page.goBack();
      await waitForHeading(page, picked);
      expect([param(page, 'lat'), param(page, 'lon'), param(page, 'cell'), param(page, 'height_m')]).toEqual([lat, lon, cell, '8.5']);
      await expect(page.locator('[data-testid=plan-position]').innerText()).resolves.toContain(`${Number(lat).toFixed(5)}, ${Number(lon).toFixed(5)}`);
    } finally {
      await context.close();
    }
  });
});

describe('map selection in the URL', () => {
  interface Camera {
    lat: number;
    lon: number;
    zoom: number;
  }
  const camera = (page: Page): Promise<Camera> =>
    page.evaluate(() => {
      const m = window.bearlineMap!;
      return { lat: m.getCenter().lat, lon: m.getCenter().lng, zoom: m.getZoom() };
    });
  const urlCamera = (page: Page): Camera => ({ lat: Number(param(page, 'lat')), lon: Number(param(page, 'lon')), zoom: Number(param(page, 'zoom')) });
  /** The URL keeps 5 decimals of a degree and 2 of a zoom level. */
  const expectSameView = (a: Camera, b: Camera) => {
    expect(Math.abs(a.lat - b.lat)).toBeLessThan(2e-5);
    expect(Math.abs(a.lon - b.lon)).toBeLessThan(2e-5);
    expect(Math.abs(a.zoom - b.zoom)).toBeLessThan(0.01);
  };
  /** Waits until the map stopped moving and the URL holds where it stopped. */
  const waitForUrlView = (page: Page) =>
    page.waitForFunction(
      () => {
        const m = window.bearlineMap;
        const p = new URL(location.href).searchParams;
        return !!m && !m.isMoving() && Math.abs(Number(p.get('lat')) - m.getCenter().lat) < 1e-4 && Math.abs(Number(p.get('lon')) - m.getCenter().lng) < 1e-4;
      },
      undefined,
      { timeout: 20_000 },
    );
  const panelHeading = (page: Page, name: string) => page.getByTestId('mast-panel').getByRole('heading', { level: 2, name }).waitFor();

  it('reopens the selected mast at the same view after a reload, and Back walks the selections', async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 860 } });
    const page = await context.newPage();
    try {
      await signIn(page, demoEmail('planner'));
      await page.goto(`${APP_URL}/map`);
      await waitForMasts(page);
      await page.evaluate(() => window.bearlineMap!.setZoom(window.bearlineMap!.getZoom() + 1));
      await settle(page);
      await waitForUrlView(page);
      expect(param(page, 'mast')).toBeNull();
      const before = urlCamera(page);

      // Left of the side panel (so the map need not move) and clear of the search box and legend.
      const [first, second] = (await renderedMasts(page)).filter((m) => m.x > 80 && m.x < 600 && m.y > 150 && m.y < 520);
      expect(second).toBeTruthy();
      await page.mouse.click(first.x, first.y);
      await panelHeading(page, first.name);
      await page.waitForFunction((id) => new URL(location.href).searchParams.get('mast') === id, first.id);
      await waitForUrlView(page);
      const selectedView = urlCamera(page);

      await page.reload();
      await waitForMasts(page);
      await panelHeading(page, first.name);
      expect(param(page, 'mast')).toBe(first.id);
      expectSameView(await camera(page), selectedView);

      // Another mast, then Back: the first is open again (in the same page).
      const again = (await renderedMasts(page)).find((m) => m.id === second.id)!;
      await page.mouse.click(again.x, again.y);
      await panelHeading(page, second.name);
      await page.waitForFunction((id) => new URL(location.href).searchParams.get('mast') === id, second.id);
      await page.goBack();
      await panelHeading(page, first.name);
      expect(param(page, 'mast')).toBe(first.id);

      // Back once more: no mast selected, at the view from before the first selection.
      await page.goBack();
      await page.waitForFunction(() => !new URL(location.href).searchParams.has('mast'));
      await waitForMasts(page);
      expect(await page.getByTestId('mast-panel').count()).toBe(0);
      expectSameView(urlCamera(page), before);
      expectSameView(await camera(page), before);

      // Forward reopens it.
      await page.goForward();
      await panelHeading(page, first.name);
    } finally {
      await context.close();
    }
  }, 180_000); // two reloads and four history steps, each redrawing the map in software WebGL
});
