import { getDb } from '../../../../lib/server/db';
import { handler, json, parseWith, requirePermission } from '../../../../lib/server/http';
import { findMast } from '../../../../lib/server/repos/masts';
import { listMastSurveys } from '../../../../lib/server/repos/sightings';
import { mastSurveyJson } from '../../../../lib/schemas/sightings';
import { IdParamSchema } from '../../../../lib/schemas/params';
import { can } from '../../../../lib/domain/roles';

/** Who surveyed the mast, when it was last observed, and the photos of its approved or merged sightings. */
export const GET = handler(async ({ locals, params }) => {
  const user = requirePermission(locals, 'map:view');
  const { id } = parseWith(IdParamSchema, params);
  await findMast(getDb(), id);
  return json(mastSurveyJson(await listMastSurveys(getDb(), id), { withOriginals: can(user.role, 'sightings:review') }));
});
