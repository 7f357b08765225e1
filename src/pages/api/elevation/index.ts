import { getDb } from '../../../lib/server/db';
import { handler, json, requirePermission } from '../../../lib/server/http';
import { readElevationUpload } from '../../../lib/server/elevation-import';
import { importUploadedElevation } from '../../../lib/server/elevation-service';
import { listElevationGrids } from '../../../lib/server/repos/elevation';
import { elevationGridJson } from '../../../lib/schemas/elevation';

// Every signed-in role may see which ground has elevation data; admins import and delete.
export const GET = handler(async ({ locals }) => {
  requirePermission(locals, 'map:view');
  const items = (await listElevationGrids(getDb())).map(elevationGridJson);
  return json({ items, total: items.length });
});

// multipart/form-data with the GeoTIFF or .hgt in the field "file".
export const POST = handler(async ({ locals, request }) => {
  const actor = requirePermission(locals, 'reference:manage');
  const upload = await readElevationUpload(request);
  const grid = await importUploadedElevation(upload, actor.id);
  return json(elevationGridJson(grid), 201);
});
