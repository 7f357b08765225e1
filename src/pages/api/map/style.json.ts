import { handler, json, requirePermission } from '../../../lib/server/http';
import { buildBasemapStyle } from '../../../components/map/map-style';

// The basemap style, with tile URLs made absolute for the origin the browser used.
export const GET = handler(({ locals, url }) => {
  requirePermission(locals, 'map:view');
  return json(buildBasemapStyle(url.origin), 200, { 'Cache-Control': 'private, max-age=300' });
});
