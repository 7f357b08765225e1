import { getDb } from '../../../lib/server/db';
import { handler, json, parseWith, requirePermission } from '../../../lib/server/http';
import { removeElevationGrid } from '../../../lib/server/elevation-service';
import { elevationGridJson, findElevationGrid } from '../../../lib/server/repos/elevation';
import { ElevationIdParamSchema } from '../../../lib/schemas/elevation';

export const GET = handler(async ({ locals, params }) => {
  requirePermission(locals, 'map:view');
  const { id } = parseWith(ElevationIdParamSchema, params);
  return json(elevationGridJson(await findElevationGrid(getDb(), id)));
});

export const DELETE = handler(async ({ locals, params }) => {
  const actor = requirePermission(locals, 'reference:manage');
  const { id } = parseWith(ElevationIdParamSchema, params);
  await removeElevationGrid(id, actor.id);
  return new Response(null, { status: 204 });
});
