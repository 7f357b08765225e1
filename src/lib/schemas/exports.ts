// Exports of a map layer as a file: `GET /api/export/:layer.:format`, filtered like the map
// (bbox, operator, band, tech, status, as on /api/masts) and by region.
import { z } from 'zod';
import { BboxSchema, MastFilterSchema, type Bbox, type MastFilter } from './mast-query';
import { idParam, intParam } from './params';
import { SignalTileQuerySchema } from './signal-map';
import { HEX_LEVELS } from '../domain/signal-map';

export const EXPORT_LAYERS = ['masts', 'cells', 'readings', 'readings-hexagons'] as const;
export type ExportLayer = (typeof EXPORT_LAYERS)[number];
export const EXPORT_FORMATS = ['csv', 'geojson', 'kml'] as const;
export type ExportFormat = (typeof EXPORT_FORMATS)[number];

export const EXPORT_LAYER_LABELS: Record<ExportLayer, string> = {
  masts: 'Masts',
  cells: 'Cells',
  readings: 'Readings',
  'readings-hexagons': 'Readings by hexagon',
};
export const EXPORT_FORMAT_LABELS: Record<ExportFormat, string> = { csv: 'CSV', geojson: 'GeoJSON', kml: 'KML' };

/** `masts.csv`, `readings-hexagons.kml` … */
export const ExportFileParamSchema = z.object({
  file: z.string().transform((file, ctx) => {
    const m = /^([a-z-]+)\.([a-z]+)$/.exec(file);
    const layer = m?.[1] as ExportLayer | undefined;
    const format = m?.[2] as ExportFormat | undefined;
    if (!layer || !EXPORT_LAYERS.includes(layer)) {
      ctx.addIssue({ code: 'custom', message: `Choose a layer: ${EXPORT_LAYERS.join(', ')}` });
      return z.NEVER;
    }
    if (!format || !EXPORT_FORMATS.includes(format)) {
      ctx.addIssue({ code: 'custom', message: `Choose a format: ${EXPORT_FORMATS.join(', ')}` });
      return z.NEVER;
    }
    return { layer, format };
  }),
});

const paging = {
  /** Rows per file (at most the export cap); with `after`, the next page starts past that id. */
  limit: intParam('Limit', 1, 2_000_000_000, 0).transform((n) => (n === 0 ? undefined : n)),
  after: idParam.optional(),
};

const area = { bbox: BboxSchema.optional(), region: idParam.optional() };

/** Hexagon level of the measured signal map (lib/domain/signal-map.ts: 3 has 500 m edges). */
export const HEX_EXPORT_DEFAULT_LEVEL = 3;
const NO_HEX = { level: HEX_EXPORT_DEFAULT_LEVEL, operatorId: null, band: null };

/** Masts, cells and readings: the map's filters (lists, as on /api/masts), an area and paging. */
export const ExportQuerySchema = z
  .object({
    ...area,
    ...paging,
    operator: z.string().optional(),
    band: z.string().optional(),
    tech: z.string().optional(),
    status: z.string().optional(),
  })
  .superRefine((q, ctx) => {
    const filter = MastFilterSchema.safeParse({ operator: q.operator, band: q.band, tech: q.tech, status: q.status });
    if (!filter.success) for (const issue of filter.error.issues) ctx.addIssue(issue);
  })
  .transform((q): ExportQuery => ({
    bbox: q.bbox,
    regionId: q.region,
    filter: MastFilterSchema.parse({ operator: q.operator, band: q.band, tech: q.tech, status: q.status }),
    hex: NO_HEX,
    limit: q.limit,
    afterId: q.after,
  }));

const notForHexagons = (what: string) =>
  z
    .string()
    .optional()
    .refine((v) => v === undefined || v === '', `Hexagons are kept per operator and band only: leave out ${what}`);

/** Readings by hexagon: the signal map's precomputed hexagons, one operator and one band at most. */
export const HexExportQuerySchema = z
  .object({
    ...area,
    limit: paging.limit,
    after: notForHexagons('after (they come in one file)'),
    operator: z.string().optional(),
    band: z.string().optional(),
    level: intParam('Level', 0, HEX_LEVELS.length - 1, HEX_EXPORT_DEFAULT_LEVEL),
    tech: notForHexagons('tech'),
    status: notForHexagons('status'),
  })
  .superRefine((q, ctx) => {
    const signal = SignalTileQuerySchema.safeParse({ operator: q.operator, band: q.band });
    if (!signal.success) for (const issue of signal.error.issues) ctx.addIssue(issue);
  })
  .transform((q): ExportQuery => ({
    bbox: q.bbox,
    regionId: q.region,
    filter: {},
    hex: { level: q.level, ...SignalTileQuerySchema.parse({ operator: q.operator, band: q.band }) },
    limit: q.limit,
  }));

export interface ExportQuery {
  bbox?: Bbox;
  regionId?: string;
  /** Masts, cells and readings: as on the map. */
  filter: MastFilter;
  /** Hexagons: level, and one operator and band at most. */
  hex: { level: number; operatorId: string | null; band: string | null };
  limit?: number;
  afterId?: string;
}

export const EXPORT_CONTENT_TYPES: Record<ExportFormat, string> = {
  csv: 'text/csv; charset=utf-8',
  geojson: 'application/geo+json; charset=utf-8',
  kml: 'application/vnd.google-earth.kml+xml; charset=utf-8',
};
