import { getDb } from '../../../lib/server/db';
import { handler, json, parseWith, requireUser } from '../../../lib/server/http';
import { NotFoundError } from '../../../lib/server/errors';
import { findJob } from '../../../lib/server/repos/jobs';
import { JobIdParamSchema, jobJson } from '../../../lib/schemas/jobs';

/** A job's state, progress 0–100, counts and errors: for the person who started it, or an admin. */
export const GET = handler(async ({ locals, params }) => {
  const user = requireUser(locals);
  const { id } = parseWith(JobIdParamSchema, params);
  const job = await findJob(getDb(), id);
  // Someone else's job is answered as not found, so ids reveal nothing.
  if (!job || (user.role !== 'admin' && job.ownerId !== user.id)) throw new NotFoundError('Job not found');
  return json(jobJson(job));
});
