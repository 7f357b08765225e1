import { getDb } from '../../../lib/server/db';
import { handler, json, parseWith, requirePermission } from '../../../lib/server/http';
import { removeElevationGrid } from '../../../lib/server/elevation-service';
import { findElevationGrid } from '../../../lib/server/repos/elevation';
import { elevationGridJson } from '../../../lib/schemas/elevation';
import { IdParamSchema } from '../../../lib/schemas/params';

export const GET = handler(async ({ locals, params }) => {
  requirePermission(locals, 'map:view');
  const { id } = parseWith(IdParamSchema, params);
  return json(elevationGridJson(await findElevationGrid(getDb(), id)));
});

export const DELETE = handler(async ({ locals, params }) => {
  const actor = requirePermission(locals, 'reference:manage');
  const { id } = parseWith(IdParamSchema, params);
  await removeElevationGrid(id, actor.id);
  return new Response(null, { status: 204 });
});
