import { getReadDb } from '../../../lib/server/db';
import { handler, parseQuery, parseWith, requirePermission } from '../../../lib/server/http';
import { exportLayer } from '../../../lib/server/exporter';
import { config } from '../../../lib/server/config';
import { ExportFileParamSchema, ExportQuerySchema, HexExportQuerySchema } from '../../../lib/schemas/exports';
import { can } from '../../../lib/domain/roles';

/** `GET /api/export/{masts|cells|readings|readings-hexagons}.{csv|geojson|kml}`, filtered like the map
 * (bbox, operator, band, tech, status; hexagons by level, one operator and one band) and by `region`,
 * streamed; readings taken at customers' homes only for roles that may see customers. */
export const GET = handler(async ({ locals, params, url }) => {
  const user = requirePermission(locals, 'map:view');
  const { file } = parseWith(ExportFileParamSchema, params);
  const query = parseQuery(file.layer === 'readings-hexagons' ? HexExportQuerySchema : ExportQuerySchema, url);
  const { body, headers } = await exportLayer(getReadDb(), {
    ...file,
    query,
    viewer: { seesCustomers: can(user.role, 'plans:view') },
    maxRows: config.exportMaxRows,
    now: new Date(),
  });
  return new Response(body, { status: 200, headers });
});
