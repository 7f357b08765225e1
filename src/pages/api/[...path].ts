import type { APIRoute } from 'astro';
import { json } from '../../lib/server/http';

// Unknown API routes answer in the API's error shape, not with the HTML 404 page.
export const ALL: APIRoute = ({ url }) =>
  json({ error: { code: 'NOT_FOUND', message: `No API route ${url.pathname}` } }, 404);
