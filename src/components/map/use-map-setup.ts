import { useEffect, useState } from 'react';
import type { StyleSpecification } from 'maplibre-gl';
import { ApiError } from '../../lib/client/api';
import { mapApi } from '../../lib/client/masts-api';
import { operatorsApi } from '../../lib/client/operators-api';
import { regionsApi } from '../../lib/client/regions-api';
import type { RegionJson } from '../../lib/schemas/regions';
import { readMapUrl } from '../../lib/client/map-url';
import { chooseInitialView, readSavedView, type InitialView } from '../../lib/client/map-view-state';
import { loadLabelFonts } from './label-fonts';
import type { OperatorMark } from './mast-icons';

/** Region outlines are drawn simplified to a pixel at this zoom (about 15 m): finer than the map
 * shows them at a region's scale, and a few kilobytes however detailed the imported outline. */
const REGION_OUTLINE_ZOOM = 10;

export interface MapSetup {
  style: StyleSpecification | null;
  operators: OperatorMark[] | null;
  regions: RegionJson[];
  initialView: InitialView | null;
  loadError: string | null;
}

/** Tile URLs made absolute on this page's origin (MapLibre's worker cannot resolve relative ones). */
export function rebaseStyle(style: StyleSpecification, origin: string): StyleSpecification {
  const rebase = (t: string) => {
    const u = new URL(t, origin);
    return origin + decodeURI(u.pathname) + u.search;
  };
  const sources = Object.fromEntries(Object.entries(style.sources).map(([id, s]) => [id, 'tiles' in s && s.tiles ? { ...s, tiles: s.tiles.map(rebase) } : s]));
  return { ...style, sources };
}

/** Loads what the map needs before it can be drawn: label fonts, style, operators, regions, and
 * the view to open at (the address's view, else `chooseInitialView`). */
export function useMapSetup(): MapSetup {
  const [setup, setSetup] = useState<MapSetup>({ style: null, operators: null, regions: [], initialView: null, loadError: null });
  useEffect(() => {
    const regionList = regionsApi.list(REGION_OUTLINE_ZOOM).then(
      (r) => r.items,
      () => [] as RegionJson[],
    );
    Promise.all([loadLabelFonts(), mapApi.style<StyleSpecification>(), operatorsApi.list(), regionList]).then(
      ([, s, ops, regionItems]) =>
        setSetup({
          style: rebaseStyle(s, window.location.origin),
          operators: ops.items.map((o) => ({ id: String(o.id), name: o.name, colour: o.colour })),
          regions: regionItems,
          // A view in the address (a shared, reloaded or returned-to link) comes first.
          initialView:
            readMapUrl(window.location.search).view ??
            chooseInitialView(regionItems, new URLSearchParams(window.location.search).get('region'), readSavedView()),
          loadError: null,
        }),
      (e: unknown) => setSetup((prev) => ({ ...prev, loadError: e instanceof ApiError ? e.message : 'The map could not be loaded' })),
    );
  }, []);
  return setup;
}
