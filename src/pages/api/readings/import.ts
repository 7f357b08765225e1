import { getDb } from '../../../lib/server/db';
import { config } from '../../../lib/server/config';
import { handler, json, requirePermission } from '../../../lib/server/http';
import { withCsvUpload } from '../../../lib/server/csv-upload';
import { getJobQueue } from '../../../lib/server/jobs/runtime';
import { stageReadingsUpload } from '../../../lib/server/readings-import';
import type { ReadingsImportJson } from '../../../lib/schemas/jobs';

// Survey-log import (multipart field `file` or a text/csv body, up to IMPORT_MAX_BYTES): checked
// while it streams in; 422 with each bad line, or 202 with the job that matches and stores it.
export const POST = handler(async ({ locals, request }) => {
  const actor = requirePermission(locals, 'readings:write');
  const boss = await getJobQueue();
  const staged = await withCsvUpload(request, { maxBytes: config.importMaxBytes, describe: 'the survey-log columns of the sample file' }, (stream, fileName) =>
    getDb().transaction((trx) => stageReadingsUpload(trx, boss, stream, { fileName, ownerId: actor.id, now: new Date() })),
  );
  return json({ job_id: staged.jobId, import_id: staged.importId, rows: staged.rows } satisfies ReadingsImportJson, 202, {
    Location: `/api/jobs/${staged.jobId}`,
  });
});
