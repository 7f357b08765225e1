import type { Tx } from '../db';

export interface AuditEntry {
  userId: string | null;
  action: string;
  entity: string;
  entityId: string | number | null;
  before?: unknown;
  after?: unknown;
}

export async function recordAudit(db: Tx, entry: AuditEntry): Promise<void> {
  await db('audit_log').insert({
    user_id: entry.userId,
    action: entry.action,
    entity: entry.entity,
    entity_id: entry.entityId === null ? null : String(entry.entityId),
    before: entry.before === undefined ? null : JSON.stringify(entry.before),
    after: entry.after === undefined ? null : JSON.stringify(entry.after),
  });
}

export interface AuditRecord {
  id: string;
  userId: string | null;
  at: Date;
  action: string;
  entity: string;
  entityId: string | null;
  before: unknown;
  after: unknown;
}

export async function listAudit(db: Tx, entity: string, entityId?: string): Promise<AuditRecord[]> {
  const q = db('audit_log').where({ entity }).orderBy('id', 'desc').limit(200);
  if (entityId) q.andWhere({ entity_id: entityId });
  const rows = await q;
  return rows.map((r) => ({
    id: String(r.id),
    userId: r.user_id === null ? null : String(r.user_id),
    at: r.at,
    action: r.action,
    entity: r.entity,
    entityId: r.entity_id,
    before: r.before,
    after: r.after,
  }));
}
