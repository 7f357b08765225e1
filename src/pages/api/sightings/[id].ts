import { getDb } from '../../../lib/server/db';
import { handler, json, parseWith, requireUser } from '../../../lib/server/http';
import { ForbiddenError, NotFoundError } from '../../../lib/server/errors';
import { findSighting } from '../../../lib/server/repos/sightings';
import { SightingIdParamSchema, sightingJson } from '../../../lib/schemas/sightings';
import { can } from '../../../lib/domain/roles';

/** One sighting: reviewers and admins see every one, those who submit sightings their own (others' do not exist for them). */
export const GET = handler(async ({ locals, params }) => {
  const user = requireUser(locals);
  const { id } = parseWith(SightingIdParamSchema, params);
  const reviewer = can(user.role, 'sightings:review');
  if (!reviewer && !can(user.role, 'sightings:submit')) throw new ForbiddenError();
  const sighting = await findSighting(getDb(), id);
  if (!reviewer && sighting.author.id !== user.id) throw new NotFoundError('Sighting not found');
  return json(sightingJson(sighting, { withOriginals: reviewer }));
});
