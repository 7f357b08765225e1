import { getReadDb } from '../../../lib/server/db';
import { handler, requirePermission } from '../../../lib/server/http';
import { listSampleLogCells } from '../../../lib/server/repos/readings';
import { buildSampleReadingCsv } from '../../../lib/domain/reading-csv';

/** Cells the sample log is made around (two readings each). */
const SAMPLE_CELLS = 4;

/** A small survey log in the documented column set, to start from: readings near cells on the map,
 * so that importing it as it is matches every row. */
export const GET = handler(async ({ locals }) => {
  requirePermission(locals, 'map:view');
  const cells = await listSampleLogCells(getReadDb(), SAMPLE_CELLS);
  return new Response(buildSampleReadingCsv(cells), {
    headers: { 'Content-Type': 'text/csv; charset=utf-8', 'Content-Disposition': 'attachment; filename="bearline-readings-sample.csv"' },
  });
});
