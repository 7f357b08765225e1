import { handler, json, requirePermission } from '../../../lib/server/http';
import { listMailbox } from '../../../lib/server/mailbox';

export const GET = handler(async ({ locals }) => {
  requirePermission(locals, 'mail:view');
  const items = (await listMailbox()).map((m) => ({ ...m, date: m.date?.toISOString() ?? null }));
  return json({ items, total: items.length });
});
