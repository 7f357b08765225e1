import { handler, requirePermission } from '../../../lib/server/http';
import { buildSampleReadingCsv } from '../../../lib/domain/reading-csv';

/** A small survey log in the documented column set, to start from. */
export const GET = handler(({ locals }) => {
  requirePermission(locals, 'map:view');
  return new Response(buildSampleReadingCsv(), {
    headers: { 'Content-Type': 'text/csv; charset=utf-8', 'Content-Disposition': 'attachment; filename="bearline-readings-sample.csv"' },
  });
});
