import { handler, json, parseQuery, requirePermission } from '../../../lib/server/http';
import { getElevationAt } from '../../../lib/server/elevation-service';
import { ElevationSampleQuerySchema, type ElevationSampleJson } from '../../../lib/schemas/elevation';

// Ground height at a point; height_m is null where no imported grid has data.
export const GET = handler(async ({ locals, url }) => {
  requirePermission(locals, 'map:view');
  const { lat, lon } = parseQuery(ElevationSampleQuerySchema, url);
  const { heightM, gridId } = await getElevationAt({ lat, lon });
  const body: ElevationSampleJson = { lat, lon, height_m: heightM === null ? null : Math.round(heightM * 100) / 100, grid_id: gridId };
  return json(body);
});
