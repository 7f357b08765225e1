import { getReadDb } from '../../../lib/server/db';
import { handler, json, parseQuery, requirePermission } from '../../../lib/server/http';
import { ShortlistQuerySchema } from '../../../lib/schemas/shortlist';
import { buildShortlist } from '../../../lib/server/shortlist-service';
import { shortlistJson } from '../../../lib/server/shortlist-json';
import { getAreaProfileSampler } from '../../../lib/server/elevation-service';
import { getSearchBox } from '../../../lib/server/repos/candidates';
import { DEFAULT_SEARCH_RADIUS_M } from '../../../lib/domain/shortlist';

// Ranked candidate cells for a customer position with the chosen kit.
export const GET = handler(async ({ locals, url }) => {
  requirePermission(locals, 'map:view');
  const q = parseQuery(ShortlistQuerySchema, url);
  const at = { lat: q.lat, lon: q.lon };
  // Calibration readings lie within the radius too, so one box serves every profile.
  const profileFor = await getAreaProfileSampler(getSearchBox(at, q.radius_m ?? DEFAULT_SEARCH_RADIUS_M));
  const result = await buildShortlist(
    getReadDb(),
    {
      at,
      heightM: q.height_m,
      antennaId: q.antenna_id,
      cableId: q.cable_id,
      cableM: q.cable_m,
      currentAntennaId: q.current_antenna_id,
      preferredOperatorId: q.operator,
      requiredOperatorId: q.sim_operator,
      radiusM: q.radius_m,
      date: q.date ?? new Date(),
    },
    profileFor,
  );
  return json(shortlistJson(result, at, q.sim_operator ?? null));
});
