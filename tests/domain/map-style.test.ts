import { describe, expect, it } from 'vitest';
import { featureFilter, validateStyleMin } from '@maplibre/maplibre-gl-style-spec';
import type { LayerSpecification, StyleSpecification } from 'maplibre-gl';
import { buildBasemapStyle, BASEMAP_SOURCE_ID } from '../../src/components/map/map-style';
import {
  MAST_LABEL_LAYER,
  MAST_SOURCE_ID,
  MAST_SYMBOL_LAYER,
  NO_MAST_FILTER,
  REGION_LABEL_LAYER,
  REGION_LINE_LAYER,
  REGION_SOURCE_ID,
  buildMastFilter,
  mastSource,
  selectedMastLayer,
  type MastFilterState,
} from '../../src/components/map/layers';
import { mastIconId, operatorDots, parseMastIconId } from '../../src/components/map/mast-icons';

const ORIGIN = 'http://127.0.0.1:4321';

function fullStyle(): StyleSpecification {
  const base = buildBasemapStyle(ORIGIN);
  return {
    ...base,
    sources: {
      ...base.sources,
      [MAST_SOURCE_ID]: mastSource(ORIGIN),
      [REGION_SOURCE_ID]: { type: 'geojson', data: { type: 'FeatureCollection', features: [] } },
    },
    layers: [
      ...base.layers,
      { ...REGION_LINE_LAYER, source: REGION_SOURCE_ID } as LayerSpecification,
      { ...REGION_LABEL_LAYER, source: REGION_SOURCE_ID } as LayerSpecification,
      { ...selectedMastLayer('7'), source: MAST_SOURCE_ID } as LayerSpecification,
      { ...MAST_LABEL_LAYER, source: MAST_SOURCE_ID } as LayerSpecification,
      {
        ...MAST_SYMBOL_LAYER,
        source: MAST_SOURCE_ID,
        filter: buildMastFilter({ operators: ['1'], techs: ['nr'], bands: ['n78'], statuses: ['active'] }),
      } as LayerSpecification,
    ],
  };
}

describe('map style', () => {
  it('is a valid MapLibre style with the mast and region layers added', () => {
    expect(validateStyleMin(fullStyle())).toEqual([]);
  });

  it('uses absolute tile URLs and no glyph or sprite URL, so nothing is fetched from elsewhere', () => {
    const style = buildBasemapStyle(ORIGIN);
    expect(style.glyphs).toBeUndefined();
    expect(style.sprite).toBeUndefined();
    const source = style.sources[BASEMAP_SOURCE_ID] as { tiles: string[] };
    expect(source.tiles).toEqual([`${ORIGIN}/api/tiles/basemap/{z}/{x}/{y}.mvt`]);
    expect(mastSource(ORIGIN).tiles).toEqual([`${ORIGIN}/api/tiles/masts/{z}/{x}/{y}.mvt`]);
  });

  it('sends the mast filter with the tile requests, so the zoomed-out clusters count only what it keeps', () => {
    const filtered = mastSource(ORIGIN, 3, { operators: ['4', '2'], techs: ['nr'], bands: ['n78', 'B20'], statuses: ['planned', 'active'] });
    const url = new URL(filtered.tiles![0]!.replace(/[{}]/g, ''));
    expect(url.pathname).toBe('/api/tiles/masts/z/x/y.mvt');
    expect(Object.fromEntries(url.searchParams)).toEqual({ operator: '2,4', tech: 'nr', band: 'B20,n78', status: 'active,planned', v: '3' });
    // Every status ticked is no status filter at all.
    expect(mastSource(ORIGIN, 0, { operators: [], techs: [], bands: [], statuses: ['active', 'planned', 'decommissioned'] }).tiles).toEqual([
      `${ORIGIN}/api/tiles/masts/{z}/{x}/{y}.mvt`,
    ]);
  });

  it('labels only with the shipped Noto Sans family', () => {
    for (const layer of fullStyle().layers) {
      const font = layer.type === 'symbol' ? layer.layout?.['text-font'] : undefined;
      if (!font) continue;
      const text = JSON.stringify(font);
      expect(text).toMatch(/"Noto Sans"\]/);
      expect(text.match(/"[^"]*"/g)!.filter((s) => !/^"(Noto Sans( \w+)?|match|literal|get|kind|class|coalesce|village|)"$/.test(s))).toEqual([]);
    }
  });
});

describe('mast filter', () => {
  const mast = (props: Record<string, unknown>) => ({ type: 1 as const, properties: props, geometry: [] });
  const a = { id: 1, status: 'active', op_ids: '1,3', bands: 'B20,B3,n78', techs: 'lte,nr' };
  const b = { id: 2, status: 'planned', op_ids: '2', bands: 'B1', techs: 'lte' };
  const c = { id: 3, status: 'decommissioned', op_ids: '13', bands: 'B20', techs: 'gsm,lte' };
  const matches = (f: MastFilterState) => [a, b, c].filter((p) => featureFilter(buildMastFilter(f)).filter({ zoom: 12 }, mast(p))).map((p) => p.id);

  it.each<[string, Partial<MastFilterState>, number[]]>([
    ['no filter shows every mast', {}, [1, 2, 3]],
    ['operator 1 matches whole ids only, not 13', { operators: ['1'] }, [1]],
    ['operators are OR-ed', { operators: ['2', '13'] }, [2, 3]],
    ['technology', { techs: ['nr'] }, [1]],
    ['band B20', { bands: ['B20'] }, [1, 3]],
    ['band B2 does not match B20', { bands: ['B2'] }, []],
    ['status', { statuses: ['planned', 'decommissioned'] }, [2, 3]],
    ['groups are AND-ed', { bands: ['B20'], statuses: ['active'] }, [1]],
  ])('%s', (_, patch, ids) => {
    expect(matches({ ...NO_MAST_FILTER, ...patch })).toEqual(ids);
  });
});

describe('mast marks', () => {
  const ops = [
    { id: '1', name: 'A', colour: '#0072b2' },
    { id: '2', name: 'B', colour: '#e69f00' },
    { id: '3', name: 'C', colour: '#009e73' },
  ];

  it('round-trips the image id', () => {
    expect(parseMastIconId(mastIconId('planned', '1,3'))).toEqual({ status: 'planned', opIds: ['1', '3'] });
    expect(parseMastIconId('something-else')).toBeNull();
  });

  it('gives each operator a fixed place round the hub, whatever else is on the mast', () => {
    const [alone] = operatorDots(['3'], ops);
    const withOthers = operatorDots(['1', '3'], ops)[1];
    expect(alone).toEqual(withOthers);
    expect(alone.colour).toBe('#009e73');
    expect(operatorDots(['1'], ops)[0].angle).toBeCloseTo(-Math.PI / 2);
  });
});
