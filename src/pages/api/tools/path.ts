import { handler, json, parseQuery, requirePermission } from '../../../lib/server/http';
import { PathQuerySchema } from '../../../lib/schemas/tools';
import { calculatePath, toPathResponse } from '../../../lib/server/path-tool';

export const GET = handler(async ({ locals, url }) => {
  requirePermission(locals, 'tools:use');
  const q = parseQuery(PathQuerySchema, url);
  return json(toPathResponse(await calculatePath(q, new Date())));
});
