import { getDb } from '../../../lib/server/db';
import { handler, json, parseQuery, requireUser } from '../../../lib/server/http';
import { listJobs } from '../../../lib/server/repos/jobs';
import { JobListQuerySchema, jobJson } from '../../../lib/schemas/jobs';

/** Recent jobs, newest first: an admin sees everyone's, anyone else their own. */
export const GET = handler(async ({ locals, url }) => {
  const user = requireUser(locals);
  const q = parseQuery(JobListQuerySchema, url);
  const { items, total } = await listJobs(getDb(), { ...q, ownerId: user.role === 'admin' ? undefined : user.id });
  return json({ items: items.map(jobJson), total });
});
