import { getDb } from '../../../lib/server/db';
import { config } from '../../../lib/server/config';
import { handler, json, requirePermission } from '../../../lib/server/http';
import { withCsvUpload } from '../../../lib/server/csv-upload';
import { importAddressCsv } from '../../../lib/server/address-import';

// Gazetteer import, streamed (multipart field `file` or a text/csv body, up to IMPORT_MAX_BYTES):
// all rows or none. Each bad row is reported by its line number.
export const POST = handler(async ({ locals, request }) => {
  const actor = requirePermission(locals, 'reference:manage');
  const summary = await withCsvUpload(request, { maxBytes: config.importMaxBytes, describe: 'columns label, postcode, lat, lon' }, (stream, fileName) =>
    getDb().transaction((trx) => importAddressCsv(trx, stream, { fileName, actorId: actor.id })),
  );
  return json(summary);
});
