import { getReadDb } from '../../../../lib/server/db';
import { handler, json, parseWith, requirePermission } from '../../../../lib/server/http';
import { getRegionSummary } from '../../../../lib/server/repos/region-summary';
import { RegionSummarySchema } from '../../../../lib/schemas/region-summary';
import { IdParamSchema } from '../../../../lib/schemas/params';
import { can } from '../../../../lib/domain/roles';

/** The region's figures: masts and cells by operator, technology and band, readings, newest sightings;
 * customers, plans by state and coverage gaps only for roles that may see customers. */
export const GET = handler(async ({ locals, params }) => {
  const user = requirePermission(locals, 'map:view');
  const { id } = parseWith(IdParamSchema, params);
  const summary = await getRegionSummary(getReadDb(), id, {
    userId: user.id,
    seesCustomers: can(user.role, 'plans:view'),
    seesAllSightings: can(user.role, 'sightings:review'),
  });
  return json(RegionSummarySchema.parse(summary));
});
