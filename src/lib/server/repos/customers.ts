// Customers: who they are, where the antenna goes, and what they use today.
import type { Knex } from 'knex';
import type { Tx } from '../db';
import { PLAN_STATES } from '../../domain/plan-state';
import { CUSTOMER, type Customer, type CustomerChange, type CustomerInput, type CustomerListQuery, type HistoryEntryJson } from '../../schemas/customers';
import { ConflictError, NotFoundError, ValidationError } from '../errors';
import { recordAudit } from './audit';
import { escapeLike } from './masts';
import { recordColumns } from './record-sql';

export type { Customer };

function selectCustomers(db: Tx): Knex.QueryBuilder {
  return db('customers as c')
    .leftJoin('operators as o', 'o.id', 'c.current_operator_id')
    .leftJoin('antennas as a', 'a.id', 'c.current_antenna_id')
    .select(recordColumns(db, CUSTOMER, 'c'));
}

const toCustomer = (row: Record<string, unknown>): Customer => CUSTOMER.fromRow(row);

const SEARCH_TEXT = "(c.name || ' ' || c.address_label || ' ' || coalesce(c.postcode, ''))";

export async function listCustomers(db: Tx, query: CustomerListQuery): Promise<{ items: Customer[]; total: number }> {
  const filtered = (q: Knex.QueryBuilder) => {
    if (query.q) {
      const like = `%${escapeLike(query.q)}%`;
      const digits = query.q.replace(/\D/g, '');
      q.where((w) => {
        w.whereRaw(`${SEARCH_TEXT} ILIKE ?`, [like]).orWhereRaw('c.email ILIKE ?', [like]);
        // Phone numbers match on their digits, however they were spaced.
        if (digits.length >= 3) w.orWhereRaw("regexp_replace(coalesce(c.phone, ''), '[^0-9]', '', 'g') LIKE ?", [`%${digits}%`]);
      });
    }
    if (query.state) q.whereExists((e) => e.select(db.raw('1')).from('plans as sp').whereRaw('sp.customer_id = c.id').where('sp.state', query.state));
    return q;
  };
  const [{ count }] = await filtered(db('customers as c')).count<{ count: string }[]>('* as count');
  const dir = query.dir ?? (query.sort === 'updated_at' || query.sort === 'created_at' ? 'desc' : 'asc');
  const order: Record<typeof query.sort, string> = {
    name: 'lower(c.name)',
    address: 'lower(c.address_label)',
    postcode: 'c.postcode',
    // Follow the workflow order, customers without a plan last.
    state: `array_position(ARRAY[${PLAN_STATES.map((s) => `'${s}'`).join(',')}]::text[], (SELECT p.state FROM plans p WHERE p.customer_id = c.id ORDER BY p.updated_at DESC, p.id DESC LIMIT 1))`,
    created_at: 'c.created_at',
    updated_at: 'c.updated_at',
  };
  const rows = await filtered(selectCustomers(db)).orderByRaw(`${order[query.sort]} ${dir} NULLS LAST, c.id ${dir}`).limit(query.limit).offset(query.offset);
  return { items: rows.map(toCustomer), total: Number(count) };
}

export async function findCustomer(db: Tx, id: string): Promise<Customer> {
  const row = await selectCustomers(db).where('c.id', id).first();
  if (!row) throw new NotFoundError('Customer not found');
  return toCustomer(row);
}

async function assertReferences(db: Tx, refs: { currentOperatorId?: string | null; currentAntennaId?: string | null }) {
  const fields: Record<string, string[]> = {};
  if (refs.currentOperatorId && !(await db('operators').where({ id: refs.currentOperatorId }).first('id'))) {
    fields.current_operator_id = ['No such operator'];
  }
  if (refs.currentAntennaId && !(await db('antennas').where({ id: refs.currentAntennaId }).first('id'))) {
    fields.current_antenna_id = ['No such antenna in the catalogue'];
  }
  if (Object.keys(fields).length) throw new ValidationError('Some fields need attention', fields);
}

const point = (db: Tx, lat: number, lon: number) => db.raw('ST_SetSRID(ST_MakePoint(?, ?), 4326)', [lon, lat]);

const auditView = (c: Customer) => CUSTOMER.auditView(c);

export async function createCustomer(db: Tx, input: CustomerInput, actorId: string | null): Promise<Customer> {
  await assertReferences(db, input);
  const [row] = await db('customers')
    .insert({ ...CUSTOMER.insertRow(input), geom: point(db, input.lat, input.lon), created_by: actorId, updated_by: actorId })
    .returning('id');
  const customer = await findCustomer(db, String(row.id));
  await recordAudit(db, { userId: actorId, action: 'create', entity: 'customer', entityId: customer.id, after: auditView(customer) });
  return customer;
}

export async function updateCustomer(db: Tx, id: string, change: CustomerChange, actorId: string): Promise<Customer> {
  const current = await db('customers').where({ id }).forUpdate().first('row_version', 'erased_at');
  if (!current) throw new NotFoundError('Customer not found');
  if (current.erased_at) throw new ConflictError("This customer's personal data was erased on their request; record a new customer instead");
  if (change.rowVersion !== undefined && change.rowVersion !== current.row_version) {
    throw new ConflictError('Someone else changed this customer since you opened it; reload to see their change');
  }
  const before = await findCustomer(db, id);
  await assertReferences(db, change);
  const patch: Record<string, unknown> = {
    ...CUSTOMER.patchRow(change),
    updated_at: db.fn.now(),
    updated_by: actorId,
    row_version: db.raw('row_version + 1'),
  };
  if (change.lat !== undefined && change.lon !== undefined) patch.geom = point(db, change.lat, change.lon);
  await db('customers').where({ id }).update(patch);
  const after = await findCustomer(db, id);
  await recordAudit(db, { userId: actorId, action: 'update', entity: 'customer', entityId: id, before: auditView(before), after: auditView(after) });
  return after;
}

// --- history ------------------------------------------------------------------------------

function diff(before: unknown, after: unknown): HistoryEntryJson['changes'] {
  const b = (before && typeof before === 'object' ? before : {}) as Record<string, unknown>;
  const a = (after && typeof after === 'object' ? after : {}) as Record<string, unknown>;
  if (!before) return [];
  const keys = [...new Set([...Object.keys(b), ...Object.keys(a)])];
  return keys
    .filter((k) => JSON.stringify(b[k] ?? null) !== JSON.stringify(a[k] ?? null))
    .map((k) => ({ field: k, before: b[k] ?? null, after: a[k] ?? null }));
}

/** Changes to the customer and to each of their plans (including checks), newest first. */
export async function listCustomerHistory(db: Tx, id: string): Promise<HistoryEntryJson[]> {
  await findCustomer(db, id);
  const rows = await db('audit_log as l')
    .leftJoin('users as u', 'u.id', 'l.user_id')
    .where((w) =>
      w
        .where((c) => c.where('l.entity', 'customer').andWhere('l.entity_id', id))
        .orWhere((p) => p.where('l.entity', 'plan').whereIn('l.entity_id', db('plans').where('customer_id', id).select(db.raw('id::text')))),
    )
    .orderBy('l.id', 'desc')
    .limit(500)
    .select('l.id', 'l.at', 'l.user_id', 'u.name as user_name', 'l.action', 'l.entity', 'l.entity_id', 'l.before', 'l.after');
  return rows.map((r) => ({
    id: String(r.id),
    at: (r.at as Date).toISOString(),
    user_id: r.user_id === null ? null : String(r.user_id),
    user_name: r.user_name,
    action: r.action,
    entity: r.entity,
    entity_id: r.entity_id,
    changes: diff(r.before, r.after),
    details: r.before ? null : r.after,
  }));
}
