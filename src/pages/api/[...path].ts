import type { APIRoute } from 'astro';
import { errorResponse } from '../../lib/server/http';
import { NotFoundError } from '../../lib/server/errors';

// Unknown API routes answer in the API's error shape, not with the HTML 404 page.
export const ALL: APIRoute = ({ url }) => errorResponse(new NotFoundError(`No API route ${url.pathname}`));
