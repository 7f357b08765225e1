import { getDb } from '../../../../lib/server/db';
import { handler, json, parseBody, parseWith, requirePermission } from '../../../../lib/server/http';
import { decideSighting } from '../../../../lib/server/repos/sighting-review';
import { notifySubmitter } from '../../../../lib/server/review-mail';
import { linkOrigin } from '../../../../lib/server/accounts';
import { DecisionSchema, decisionResultJson } from '../../../../lib/schemas/review';
import { IdParamSchema } from '../../../../lib/schemas/params';

/**
 * A reviewer's decision: approve (a new mast with the sighting's cells), merge (new cells added to
 * `mast_id`, the others marked observed) or reject (with a reason). One transaction; a sighting
 * already decided answers 409 and nothing changes. The submitter is told by e-mail.
 */
export const POST = handler(async ({ locals, params, request, url }) => {
  const actor = requirePermission(locals, 'sightings:review');
  const { id } = parseWith(IdParamSchema, params);
  const input = await parseBody(DecisionSchema, request);
  const result = await getDb().transaction((trx) => decideSighting(trx, id, input, actor.id));
  await notifySubmitter(getDb(), result, linkOrigin(url));
  return json(decisionResultJson(result));
});
