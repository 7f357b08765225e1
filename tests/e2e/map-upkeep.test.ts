// Map upkeep from the panel: a reviewer adds a mast by clicking the map, then adds, edits and
// removes a cell; a removal the API refuses (a plan uses the cell) shows its reason and offers
// decommissioning; other roles see no edit controls.
import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { APP_URL, demoEmail, signIn, useBrowser, watchOutsideRequests } from '../helpers/browser';
import { MAST_LAYER, settle, waitForMasts } from '../helpers/map-page';

const browser = useBrowser();

/** A point (page px) left of the panel with no mast mark or cluster within 40 px. */
async function emptySpot(page: Page): Promise<{ x: number; y: number }> {
  const spot = await page.evaluate((layer) => {
    const map = window.bearlineMap!;
    const rect = map.getCanvas().getBoundingClientRect();
    const layers = [layer, 'mast-clusters', 'pending-sightings-symbol'].filter((id) => map.getLayer(id));
    for (let y = 260; y < 520; y += 40)
      for (let x = 120; x < 620; x += 40) {
        const near = map.queryRenderedFeatures(
          [
            [x - 40, y - 40],
            [x + 40, y + 40],
          ],
          { layers },
        );
        if (near.length === 0) return { x: rect.left + x, y: rect.top + y, lngLat: map.unproject([x, y]) };
      }
    return null;
  }, MAST_LAYER);
  expect(spot).not.toBeNull();
  return spot!;
}

async function api<T>(page: Page, method: string, path: string): Promise<{ status: number; body: T }> {
  return page.evaluate(
    async ([m, p]) => {
      const res = await fetch(p, { method: m, headers: { Accept: 'application/json' } });
      return { status: res.status, body: res.status === 204 ? null : await res.json() };
    },
    [method, path] as const,
  );
}

describe('map upkeep', () => {
  it('adds a mast by map click, then adds, edits and removes a cell with the API’s checks beside the fields', async () => {
    const context = await browser().newContext({ viewport: { width: 1280, height: 860 } });
    const page = await context.newPage();
    const outside = watchOutsideRequests(page);
    const errors: string[] = [];
    page.on('pageerror', (e) => errors.push(e.message));
    let createdId: string | null = null;
    try {
      await signIn(page, demoEmail('reviewer'));
      await page.goto(`${APP_URL}/map`);
      await waitForMasts(page);
      await page.evaluate(() => window.bearlineMap!.setZoom(window.bearlineMap!.getZoom() + 1));
      await settle(page);

      await page.getByRole('button', { name: 'Add mast' }).click();
      await page.getByTestId('add-mast-prompt').waitFor();
      const spot = await emptySpot(page);
      const clicked = await page.evaluate(
        ([x, y]) => {
          const rect = window.bearlineMap!.getCanvas().getBoundingClientRect();
          const p = window.bearlineMap!.unproject([x - rect.left, y - rect.top]);
          return { lat: p.lat.toFixed(6), lon: p.lng.toFixed(6) };
        },
        [spot.x, spot.y] as const,
      );
      await page.mouse.click(spot.x, spot.y);

      const panel = page.getByTestId('new-mast-panel');
      await panel.getByRole('heading', { level: 2, name: 'New mast' }).waitFor();
      await page.getByTestId('new-mast-marker').waitFor();
      expect(await panel.getByLabel('Latitude').inputValue()).toBe(clicked.lat);
      expect(await panel.getByLabel('Longitude').inputValue()).toBe(clicked.lon);
      await page.screenshot({ path: 'test-results/map-new-mast-1280.png' });

      // The ground height under the marker comes from the elevation data (the demo grid of seed 08),
      // follows the marker when it is dragged, and stays as typed once someone types it.
      const ground = panel.getByLabel('Ground (m)');
      const groundAt = async () => {
        const at = { lat: await panel.getByLabel('Latitude').inputValue(), lon: await panel.getByLabel('Longitude').inputValue() };
        const sample = await api<{ height_m: number | null }>(page, 'GET', `/api/elevation/sample?lat=${at.lat}&lon=${at.lon}`);
        return sample.body.height_m === null ? '' : String(Math.round(sample.body.height_m * 10) / 10);
      };
      await page.locator('#new-mast-ground_elevation_m-hint').waitFor();
      expect(await ground.inputValue()).toBe(await groundAt());
      const marker = (await page.getByTestId('new-mast-marker').boundingBox())!;
      const dragFrom = { x: marker.x + marker.width / 2, y: marker.y + marker.height / 2 };
      const dragTo = { x: dragFrom.x + 60, y: dragFrom.y - 50 };
      const latBefore = await panel.getByLabel('Latitude').inputValue();
      await page.mouse.move(dragFrom.x, dragFrom.y);
      await page.mouse.down();
      await page.mouse.move(dragTo.x, dragTo.y, { steps: 8 });
      await page.mouse.up();
      await page.waitForFunction((before) => (document.querySelector('#new-mast-lat') as HTMLInputElement).value !== before, latBefore);
      const expected = await groundAt();
      await page.waitForFunction((want) => (document.querySelector('#new-mast-ground_elevation_m') as HTMLInputElement).value === want, expected);
      await expect(page.locator('#new-mast-ground_elevation_m-hint').textContent()).resolves.toMatch(/elevation data/);
      await ground.fill('123.5');
      expect(await page.locator('#new-mast-ground_elevation_m-hint').count()).toBe(0);
      await page.mouse.move(dragTo.x, dragTo.y);
      await page.mouse.down();
      await page.mouse.move(dragFrom.x, dragFrom.y, { steps: 8 });
      await page.mouse.up();
      await page.waitForFunction((before) => (document.querySelector('#new-mast-lat') as HTMLInputElement).value === before, latBefore);
      await page.waitForTimeout(500);
      expect(await ground.inputValue()).toBe('123.5');

      // The API's checks, in the browser, beside the fields.
      await panel.getByLabel('Height (m)').fill('tall');
      await panel.getByRole('button', { name: 'Add mast' }).click();
      await expect(panel.locator('#new-mast-name-error').textContent()).resolves.toBe('Required');
      await expect(panel.locator('#new-mast-structure_height_m-error').textContent()).resolves.toMatch(/must be a number/);
      await expect(panel.getByLabel('Name').getAttribute('aria-invalid')).resolves.toBe('true');

      const name = `Upkeep Test Mast ${Date.now()}`;
      await panel.getByLabel('Name').fill(name);
      await panel.getByLabel('Height (m)').fill('24');
      await panel.getByLabel('Structure').selectOption('monopole');
      await panel.getByRole('button', { name: 'Add mast' }).click();

      const mastPanel = page.getByTestId('mast-panel');
      await mastPanel.getByRole('heading', { level: 2, name }).waitFor();
      await page.waitForFunction(() => new URL(location.href).searchParams.has('mast'));
      createdId = new URL(page.url()).searchParams.get('mast');
      await expect(mastPanel.getByTestId('mast-position').textContent()).resolves.toBe(`${clicked.lat}, ${clicked.lon}`);
      await expect(mastPanel.getByRole('heading', { level: 3, name: 'Cells (0)' }).count()).resolves.toBe(1);

      // Add a cell: a channel outside the chosen band is refused beside the channel field.
      await mastPanel.getByRole('button', { name: 'Add cell' }).click();
      const form = mastPanel.getByTestId('cell-form');
      await form.getByLabel('Band', { exact: true }).selectOption('B20');
      await form.getByLabel('Channel (EARFCN)').fill('1300');
      await form.getByLabel('PCI').fill('504');
      await form.getByRole('button', { name: 'Add cell' }).click();
      await expect(form.locator('#cell-channel-error').textContent()).resolves.toMatch(/not in band B20/);
      await expect(form.locator('#cell-pci-error').textContent()).resolves.toBe('LTE PCI must be 0–503');

      await form.getByLabel('Band', { exact: true }).selectOption('');
      await form.getByLabel('Channel (EARFCN)').fill('6300');
      await expect(form.locator('#cell-channel-hint').textContent()).resolves.toBe('Band B20 · 806.0 MHz down');
      await form.getByLabel('PCI').fill('101');
      await form.getByLabel('Azimuth (°)').fill('120');
      await page.screenshot({ path: 'test-results/map-cell-form-1280.png' });
      await form.getByRole('button', { name: 'Add cell' }).click();
      await mastPanel.getByRole('heading', { level: 3, name: 'Cells (1)' }).waitFor();
      const rows = mastPanel.getByTestId('mast-cells').locator('tbody tr');
      await expect(rows.first().textContent()).resolves.toMatch(/B20.*6300.*806\.0.*101.*120°/);
      // Every column of the cells table fits the side panel, edit buttons included: no sideways scroll.
      const fit = await mastPanel
        .getByTestId('mast-cells')
        .locator('table')
        .evaluate((t) => ({ table: t.scrollWidth, box: t.parentElement!.clientWidth }));
      expect(fit.table).toBeLessThanOrEqual(fit.box);

      // Edit it.
      await mastPanel.getByRole('button', { name: 'Edit LTE B20 cell on channel 6300 (PCI 101)' }).click();
      await form.getByLabel('PCI').fill('102');
      await form.getByRole('button', { name: 'Save cell' }).click();
      await mastPanel.getByRole('button', { name: 'Edit LTE B20 cell on channel 6300 (PCI 102)' }).waitFor();
      expect(await mastPanel.getByTestId('cell-form').count()).toBe(0);

      // Remove it from its edit form: asked first, "Keep it" keeps it, then removed.
      const edit102 = mastPanel.getByRole('button', { name: 'Edit LTE B20 cell on channel 6300 (PCI 102)' });
      await edit102.click();
      await form.getByRole('button', { name: 'Remove cell…' }).click();
      const confirm = mastPanel.getByTestId('cell-remove-confirm');
      await expect(confirm.textContent()).resolves.toContain(`Remove the LTE B20 cell on channel 6300 (PCI 102) from ${name}?`);
      await expect(page.evaluate(() => document.activeElement?.getAttribute('data-testid'))).resolves.toBe('cell-remove-confirm');
      await page.screenshot({ path: 'test-results/map-cell-remove-1280.png' });
      await confirm.getByRole('button', { name: 'Keep it' }).click();
      await expect(mastPanel.getByRole('heading', { level: 3, name: 'Cells (1)' }).count()).resolves.toBe(1);
      await edit102.click();
      await form.getByRole('button', { name: 'Remove cell…' }).click();
      await confirm.getByRole('button', { name: 'Remove cell', exact: true }).click();
      await mastPanel.getByRole('heading', { level: 3, name: 'Cells (0)' }).waitFor();

      expect(outside).toEqual([]);
      expect(errors).toEqual([]);
    } finally {
      if (createdId) {
        const mast = await api<{ row_version: number }>(page, 'GET', `/api/masts/${createdId}`);
        await api(page, 'DELETE', `/api/masts/${createdId}?row_version=${mast.body.row_version}`);
      }
      await context.close();
    }
    // A long journey (two saves of a mast and three of a cell) on a busy machine.
  }, 180_000);

  it('shows why a cell that a plan uses cannot be removed and offers decommissioning the mast', async () => {
    const context = await browser().newContext({ viewport: { width: 390, height: 844 } });
    const page = await context.newPage();
    try {
      await signIn(page, demoEmail('admin'));
      await page.goto(`${APP_URL}/map`);
      const plans = await api<{ items: { cell_id: string | null }[] }>(page, 'GET', '/api/plans');
      const cellId = plans.body.items.find((p) => p.cell_id)?.cell_id;
      expect(cellId).toBeTruthy();
      const cell = await api<{ mast_id: string; tech: string; band: string; channel: number; pci: number | null }>(page, 'GET', `/api/cells/${cellId}`);
      const label = `${cell.body.tech.toUpperCase()} ${cell.body.band} cell on channel ${cell.body.channel}${cell.body.pci === null ? '' : ` (PCI ${cell.body.pci})`}`;

      await page.goto(`${APP_URL}/map?mast=${cell.body.mast_id}`);
      const panel = page.getByTestId('mast-panel');
      await panel.getByTestId('mast-cells').waitFor();
      const mastName = (await panel.getByRole('heading', { level: 2 }).textContent()) ?? '';
      await panel.getByRole('button', { name: `Edit ${label}`, exact: true }).click();
      await page.screenshot({ path: 'test-results/map-cell-form-390.png' });
      await panel.getByTestId('cell-form').getByRole('button', { name: 'Remove cell…' }).click();
      await panel.getByTestId('cell-remove-confirm').getByRole('button', { name: 'Remove cell', exact: true }).click();

      const refused = panel.getByTestId('cell-refused');
      await refused.waitFor();
      await expect(refused.textContent()).resolves.toMatch(/is the chosen cell of \d+ plans?: #\d+/);
      await refused.getByRole('button', { name: `Mark ${mastName} decommissioned` }).waitFor();
      await page.screenshot({ path: 'test-results/map-cell-refused-390.png' });
      // The cell is still there.
      await panel.getByRole('button', { name: `Edit ${label}`, exact: true }).waitFor();

      // Without a pointer: "Add mast", then "Use the map centre", by keyboard.
      await panel.getByRole('button', { name: 'Close mast details' }).click();
      await page.getByRole('button', { name: 'Add mast' }).focus();
      await page.keyboard.press('Enter');
      await page.getByRole('button', { name: 'Use the map centre' }).focus();
      await page.keyboard.press('Enter');
      const newPanel = page.getByTestId('new-mast-panel');
      await newPanel.getByRole('heading', { level: 2, name: 'New mast' }).waitFor();
      // On a phone: the middle of the map above the bottom sheet, where the marker can be seen.
      const marker = (await page.getByTestId('new-mast-marker').boundingBox())!;
      const sheet = (await newPanel.boundingBox())!;
      expect(marker.y + marker.height).toBeLessThan(sheet.y);
      const centre = await page.evaluate(() => {
        const m = window.bearlineMap!;
        const c = m.getCanvas().getBoundingClientRect();
        return m.unproject([c.width / 2, c.height * 0.21]);
      });
      expect(Number(await newPanel.getByLabel('Latitude').inputValue())).toBeCloseTo(centre.lat, 3);
      expect(Number(await newPanel.getByLabel('Longitude').inputValue())).toBeCloseTo(centre.lng, 3);
      await page.screenshot({ path: 'test-results/map-new-mast-390.png' });
      await newPanel.getByRole('button', { name: 'Cancel', exact: true }).click();
      expect(await page.getByTestId('new-mast-panel').count()).toBe(0);
    } finally {
      await context.close();
    }
  });

  it('shows no edit controls to roles that may not edit masts', async () => {
    const context = await browser().newContext({ viewport: { width: 1280, height: 860 } });
    const page = await context.newPage();
    try {
      await signIn(page, demoEmail('surveyor'));
      await page.goto(`${APP_URL}/map`);
      const list = await api<{ features: { properties: { id: string; name: string; cell_count: number } }[] }>(page, 'GET', '/api/masts?status=active');
      const mast = list.body.features.find((f) => f.properties.cell_count > 0)!.properties;
      await page.goto(`${APP_URL}/map?mast=${mast.id}`);
      const panel = page.getByTestId('mast-panel');
      await panel.getByRole('heading', { level: 2, name: mast.name }).waitFor();
      await panel.getByTestId('mast-cells').waitFor();
      for (const name of ['Add mast', 'Add cell', 'Edit mast', 'Edit', 'Remove']) expect(await page.getByRole('button', { name }).count()).toBe(0);
      await page.screenshot({ path: 'test-results/map-panel-surveyor-1280.png' });
    } finally {
      await context.close();
    }
  });
});
