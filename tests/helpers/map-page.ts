// The mast map in a browser test: waiting for it to draw, and the masts it shows.
import type { Page } from 'playwright-core';
import type { Map as MaplibreMap } from 'maplibre-gl';

declare global {
  interface Window {
    bearlineMap?: MaplibreMap;
  }
}

export const MAST_LAYER = 'masts-symbol';

export interface RenderedMast {
  id: string;
  name: string;
  status: string;
  opIds: string[];
  /** Page coordinates of the mark. */
  x: number;
  y: number;
}

/** Waits until the map is idle with at least one mast mark drawn. */
export async function waitForMasts(page: Page): Promise<void> {
  await page.waitForFunction(
    (layer) => {
      const map = window.bearlineMap;
      return !!map && map.loaded() && map.areTilesLoaded() && map.queryRenderedFeatures({ layers: [layer] }).length > 0;
    },
    MAST_LAYER,
    { timeout: 30_000 },
  );
}

/** Waits for the map to finish rendering after a change. */
export async function settle(page: Page): Promise<void> {
  await page.evaluate(
    () =>
      new Promise<void>((resolve) => {
        const map = window.bearlineMap!;
        map.triggerRepaint();
        map.once('idle', () => resolve());
      }),
  );
}

export async function renderedMasts(page: Page): Promise<RenderedMast[]> {
  return page.evaluate((layer) => {
    const map = window.bearlineMap!;
    const rect = map.getCanvas().getBoundingClientRect();
    const seen = new Map<string, RenderedMast>();
    for (const f of map.queryRenderedFeatures({ layers: [layer] })) {
      const p = f.properties ?? {};
      const id = String(p.id);
      if (seen.has(id) || f.geometry.type !== 'Point') continue;
      const pt = map.project(f.geometry.coordinates as [number, number]);
      seen.set(id, {
        id,
        name: String(p.name),
        status: String(p.status),
        opIds: String(p.op_ids ?? '')
          .split(',')
          .filter(Boolean),
        x: rect.left + pt.x,
        y: rect.top + pt.y,
      });
    }
    return [...seen.values()];
  }, MAST_LAYER);
}
