// The measured signal layer on /map in headless Chromium: switched on from the keyboard, hexagons
// drawn from the app's own tiles, the legend with each grade's range, a change of metric and
// operator, and the same at phone width.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import type { Map as MaplibreMap } from 'maplibre-gl';
import { APP_URL, demoEmail, launchBrowser, signIn, watchOutsideRequests } from '../helpers/browser';

declare global {
  interface Window {
    bearlineMap?: MaplibreMap;
  }
}

const FILL_LAYER = 'signal-fill';

let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});

afterAll(async () => {
  await browser?.close();
});

async function openMap(page: Page, role: string): Promise<void> {
  await signIn(page, demoEmail(role));
  await page.goto(`${APP_URL}/map`);
  await page.waitForFunction(() => !!window.bearlineMap && window.bearlineMap.isStyleLoaded(), undefined, { timeout: 60_000 });
}

/** The hexagons drawn on screen once the map is idle: their RSRP / SINR medians and counts. */
async function drawnHexagons(page: Page): Promise<Array<Record<string, number>>> {
  await page.waitForFunction(
    (layer) => {
      const map = window.bearlineMap!;
      return !!map.getLayer(layer) && map.areTilesLoaded() && map.queryRenderedFeatures({ layers: [layer] }).length > 0;
    },
    FILL_LAYER,
    { timeout: 60_000 },
  );
  return page.evaluate(
    (layer) => window.bearlineMap!.queryRenderedFeatures({ layers: [layer] }).map((f) => f.properties as Record<string, number>),
    FILL_LAYER,
  );
}

describe('measured signal layer', () => {
  it('switches on from the keyboard, draws hexagons with a graded legend, and follows metric and operator', async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 860 } });
    const page = await context.newPage();
    const outside = watchOutsideRequests(page);
    await openMap(page, 'planner');

    const toggle = page.getByTestId('signal-toggle');
    await expect(toggle.getAttribute('aria-checked')).resolves.toBe('false');
    expect(await page.getByTestId('signal-legend').count()).toBe(0);
    await toggle.focus();
    await page.keyboard.press('Space');
    await expect(toggle.getAttribute('aria-checked')).resolves.toBe('true');

    const legend = page.getByTestId('signal-legend');
    await legend.waitFor();
    // Installers' grades (common practice): RSRP ≥ −80 dBm excellent … < −110 dBm unusable.
    expect((await page.getByTestId('signal-class-excellent').innerText()).replace(/\s+/g, ' ')).toBe('≥ −80 dBm Excellent');
    expect((await page.getByTestId('signal-class-unusable').innerText()).replace(/\s+/g, ' ')).toBe('< −110 dBm Unusable');
    expect(await legend.innerText()).toContain('Faint: fewer than 5 RSRP readings');

    const all = await drawnHexagons(page);
    expect(all.length).toBeGreaterThan(10);
    expect(all.every((p) => p.rsrp_median_dbm <= -44 && p.rsrp_median_dbm >= -140 && p.readings >= 1)).toBe(true);
    // The demo's drive survey spans good and poor coverage.
    const medians = all.map((p) => p.rsrp_median_dbm);
    expect(Math.max(...medians) - Math.min(...medians)).toBeGreaterThan(15);

    // SINR, chosen with the arrow keys: the legend changes to dB and its four grades.
    await page.getByRole('radio', { name: 'RSRP' }).focus();
    await page.keyboard.press('ArrowRight');
    await page.keyboard.press('ArrowRight');
    expect(await page.getByRole('radio', { name: 'SINR' }).isChecked()).toBe(true);
    await expect(page.getByTestId('signal-class-unusable').count()).resolves.toBe(0);
    expect((await page.getByTestId('signal-class-excellent').innerText()).replace(/\s+/g, ' ')).toBe('≥ 20 dB Excellent');
    expect(await page.evaluate((layer) => JSON.stringify(window.bearlineMap!.getLayer(layer)?.filter), FILL_LAYER)).toContain('sinr_median_db');

    // One operator: fewer readings per hexagon than all operators together.
    const total = (list: Array<Record<string, number>>) => list.reduce((n, p) => n + p.readings, 0);
    const operatorSelect = page.getByTestId('signal-operator');
    const firstOperator = await operatorSelect.locator('option').nth(1).getAttribute('value');
    await operatorSelect.selectOption(firstOperator!);
    await page.waitForFunction(
      () => {
        const tiles = (window.bearlineMap!.getSource('signal') as unknown as { tiles?: string[] } | undefined)?.tiles ?? [];
        return tiles.some((t) => t.includes('operator='));
      },
      undefined,
      { timeout: 10_000 },
    );
    const one = await drawnHexagons(page);
    expect(total(one)).toBeLessThan(total(all));

    // Off again: no hexagons, no legend.
    await toggle.click();
    expect(await page.evaluate((layer) => !!window.bearlineMap!.getLayer(layer), FILL_LAYER)).toBe(false);
    expect(await page.getByTestId('signal-legend').count()).toBe(0);
    expect(outside).toEqual([]);
    await context.close();
  }, 180_000);

  it('keeps its choices in the address (reload and Back restore them) and shows a hexagon’s figures on click or from the keyboard', async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 860 } });
    const page = await context.newPage();
    await openMap(page, 'planner');
    const param = (name: string) => new URL(page.url()).searchParams.get(name);
    await page.getByTestId('signal-toggle').click();
    await page.waitForFunction(() => new URL(location.href).searchParams.get('signal') === 'rsrp');
    await page.getByRole('radio', { name: 'SINR' }).check({ force: true });
    const operatorSelect = page.getByTestId('signal-operator');
    const operatorId = (await operatorSelect.locator('option').nth(1).getAttribute('value'))!;
    await operatorSelect.selectOption(operatorId);
    await page.waitForFunction((id) => new URL(location.href).searchParams.get('signal_operator') === id, operatorId);
    expect(param('signal')).toBe('sinr');

    // A reload shows the same layer.
    await page.reload();
    await page.waitForFunction(() => !!window.bearlineMap && window.bearlineMap.isStyleLoaded(), undefined, { timeout: 60_000 });
    await expect(page.getByTestId('signal-toggle').getAttribute('aria-checked')).resolves.toBe('true');
    expect(await page.getByRole('radio', { name: 'SINR' }).isChecked()).toBe(true);
    expect(await page.getByTestId('signal-operator').inputValue()).toBe(operatorId);

    // Back undoes one choice at a time: first the operator, then the metric.
    await page.goBack();
    await page.waitForFunction(() => !new URL(location.href).searchParams.has('signal_operator'));
    await page.waitForFunction(() => (document.querySelector('[data-testid=signal-operator]') as HTMLSelectElement | null)?.value === '');
    expect(await page.getByRole('radio', { name: 'SINR' }).isChecked()).toBe(true);
    await page.goBack();
    await page.waitForFunction(() => new URL(location.href).searchParams.get('signal') === 'rsrp');
    await page.waitForFunction(() => (document.querySelector('input[type=radio][value=rsrp]') as HTMLInputElement | null)?.checked === true);

    // A click on a hexagon (away from mast marks) shows its readings and medians.
    await drawnHexagons(page);
    const spot = await page.evaluate((layer) => {
      const map = window.bearlineMap!;
      const rect = map.getCanvas().getBoundingClientRect();
      const avoid = ['masts-symbol', 'mast-clusters', 'pending-sightings-symbol'].filter((id) => map.getLayer(id));
      for (let y = 200; y < rect.height - 100; y += 23)
        for (let x = 320; x < rect.width - 120; x += 23) {
          const [hex] = map.queryRenderedFeatures([x, y], { layers: [layer] });
          const marks = map.queryRenderedFeatures(
            [
              [x - 30, y - 30],
              [x + 30, y + 30],
            ],
            { layers: avoid },
          );
          if (hex && marks.length === 0)
            return {
              x: rect.left + x,
              y: rect.top + y,
              readings: Number(hex.properties!.readings),
              rsrp: hex.properties!.rsrp_median_dbm as number | undefined,
            };
        }
      return null;
    }, FILL_LAYER);
    expect(spot).not.toBeNull();
    await page.mouse.click(spot!.x, spot!.y);
    const popup = page.getByTestId('signal-hex-popup');
    await popup.waitFor();
    expect((await page.getByTestId('signal-hex-readings').innerText()).replace(/,/g, '')).toBe(
      `${spot!.readings} ${spot!.readings === 1 ? 'reading' : 'readings'}`,
    );
    // RSRP median to a tenth of a dB, graded like the legend; RSRQ and SINR beside it.
    if (spot!.rsrp !== undefined) expect(await page.getByTestId('signal-hex-rsrp').innerText()).toContain(spot!.rsrp.toFixed(1).replace('-', ''));
    for (const m of ['rsrq', 'sinr']) await page.getByTestId(`signal-hex-${m}`).waitFor();
    expect(new URL(page.url()).searchParams.has('mast')).toBe(false);

    // From the keyboard: the figures of the hexagon at the map centre, with the focus on them.
    await page.keyboard.press('Escape');
    await page.getByTestId('signal-centre').focus();
    await page.keyboard.press('Enter');
    await popup.waitFor();
    await expect(page.evaluate(() => !!document.activeElement?.closest('[data-testid=signal-hex-popup]'))).resolves.toBe(true);
    await context.close();
  }, 180_000);

  it('fits a 390 px phone: the legend folds away and opens on demand', async () => {
    const context = await browser.newContext({ viewport: { width: 390, height: 844 }, isMobile: true, hasTouch: true });
    const page = await context.newPage();
    await openMap(page, 'reviewer');
    await page.getByTestId('signal-toggle').click();
    expect(await page.getByTestId('signal-panel').isHidden()).toBe(true);
    await page.getByTestId('signal-legend-toggle').click();
    const panel = page.getByTestId('signal-panel');
    await panel.waitFor();
    const box = (await panel.boundingBox())!;
    expect(box.x).toBeGreaterThanOrEqual(0);
    expect(box.x + box.width).toBeLessThanOrEqual(390);
    expect(await drawnHexagons(page)).not.toHaveLength(0);
    await context.close();
  });

  it('keeps the open signal panel and the map legend apart at 1280 px', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } });
    await openMap(page, 'reviewer');
    await page.getByTestId('signal-toggle').click();
    const panel = (await page.getByTestId('signal-panel').boundingBox())!;
    const legend = (await page.getByTestId('map-legend').boundingBox())!;
    // Common practice: overlays of a map do not cover one another.
    expect(legend.y).toBeGreaterThanOrEqual(panel.y + panel.height);
    await page.close();
  });

  it('shows what a link with bad signal choices can show: no refused tiles, no errors, the choices it could not use left out', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } });
    const problems: string[] = [];
    page.on('console', (m) => m.type() === 'error' && problems.push(m.text()));
    page.on('pageerror', (e) => problems.push(String(e)));
    page.on('response', (r) => r.status() >= 400 && problems.push(`${r.status()} ${r.url()}`));
    await signIn(page, demoEmail('reviewer'));
    const operator = await page.evaluate(() =>
      fetch('/api/operators')
        .then((r) => r.json())
        .then((b) => b.items[0].id as string),
    );
    for (const [query, shown] of [
      // A band no band table has, for a real operator: the operator stays, the band goes.
      [`signal=rsrp&signal_operator=${operator}&signal_band=ZZ999`, { operator, band: '' }],
      // An operator id that is well formed but not on the map: all operators.
      ['signal=rsrq&signal_operator=999999&signal_band=B20', { operator: '', band: '' }],
    ] as const) {
      await page.goto(`${APP_URL}/map?${query}`);
      await page.waitForFunction(() => !!window.bearlineMap && window.bearlineMap.isStyleLoaded(), undefined, { timeout: 60_000 });
      await page.getByTestId('signal-panel').waitFor();
      expect({ operator: await page.getByTestId('signal-operator').inputValue(), band: await page.getByTestId('signal-band').inputValue() }).toEqual(shown);
      await page.waitForFunction(() => window.bearlineMap!.areTilesLoaded(), undefined, { timeout: 60_000 });
      expect(await drawnHexagons(page)).not.toHaveLength(0);
    }
    expect(problems).toEqual([]);
    await page.close();
  });
});
