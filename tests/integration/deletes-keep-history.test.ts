// Deletes never destroy history silently: a mast or cell that plans use is refused (409, naming
// the plans), the readings a delete unlinks are listed in its audit entry, and catalogue kit that
// customers use today cannot be deleted.
import { beforeEach, describe, expect, it } from 'vitest';
import { DELETE as deleteMast, PATCH as patchMast } from '../../src/pages/api/masts/[id]';
import { DELETE as deleteCell } from '../../src/pages/api/cells/[id]';
import { DELETE as deleteAntenna } from '../../src/pages/api/catalogue/antennas/[id]';
import { createOperator } from '../../src/lib/server/repos/operators';
import { createMast } from '../../src/lib/server/repos/masts';
import { createCell } from '../../src/lib/server/repos/cells';
import { CellInputSchema, MastInputSchema } from '../../src/lib/schemas/masts';
import { call } from '../helpers/endpoint';
import { testDb, truncateAll } from '../helpers/db';
import { asSessionUser, makeUser } from '../helpers/factories';
import type { SessionUser } from '../../src/lib/server/session-user';

interface Fixture {
  mast: string;
  cellA: string;
  cellB: string;
  readingIds: string[];
  customer: string;
}

async function buildFixture(): Promise<Fixture> {
  const db = testDb();
  const op = (await createOperator(db, { name: 'Test Mobile A', mcc: '001', mnc: '01' }, null)).id;
  const mast = (await createMast(db, MastInputSchema.parse({ name: 'Test Hill', lat: -47.2, lon: -128.5 }), null)).id;
  // 3GPP TS 36.101 Table 5.7.3-1: EARFCN 6300 is band 20, 1300 is band 3.
  const cellA = (await createCell(db, mast, CellInputSchema.parse({ operator_id: op, tech: 'lte', channel: 6300, pci: 101 }), null)).id;
  const cellB = (await createCell(db, mast, CellInputSchema.parse({ operator_id: op, tech: 'lte', channel: 1300, pci: 7 }), null)).id;
  const rows = await db('readings')
    .insert(
      [cellA, cellA, cellB].map((cellId, i) => ({
        taken_at: new Date(Date.UTC(2026, 0, 1 + i)),
        geom: db.raw('ST_SetSRID(ST_MakePoint(?, ?), 4326)', [-128.51 - i * 0.001, -47.21]),
        tech: 'lte',
        channel: cellId === cellA ? 6300 : 1300,
        pci: cellId === cellA ? 101 : 7,
        rsrp_dbm: -95 - i,
        cell_id: cellId,
      })),
    )
    .returning('id');
  const [customer] = await db('customers')
    .insert({ name: 'Test customer', address_label: 'Test farm', geom: db.raw('ST_SetSRID(ST_MakePoint(-128.52, -47.21), 4326)') })
    .returning('id');
  return { mast, cellA, cellB, readingIds: rows.map((r) => String(r.id)), customer: String(customer.id) };
}

const auditOf = (entity: string, id: string) => testDb()('audit_log').where({ entity, entity_id: id, action: 'delete' }).first();

describe('deleting masts and cells', () => {
  let f: Fixture;
  let reviewer: SessionUser;
  beforeEach(async () => {
    await truncateAll();
    f = await buildFixture();
    reviewer = asSessionUser(await makeUser('reviewer'));
  });

  it('refuses to delete a mast while a plan uses one of its cells (409 naming the plan), and changes nothing', async () => {
    const [plan] = await testDb()('plans').insert({ customer_id: f.customer, cell_id: f.cellB, state: 'installed' }).returning('id');
    const res = await call(deleteMast, { method: 'DELETE', user: reviewer, params: { id: f.mast } });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('CONFLICT');
    expect(res.body.error.message).toContain(`#${plan.id} (installed)`);
    expect(res.body.error.message).toMatch(/decommissioned/);
    expect(await testDb()('cells').where({ mast_id: f.mast }).count<{ count: string }[]>('* as count').first()).toEqual({ count: '2' });
    expect((await testDb()('plans').where({ id: plan.id }).first()).cell_id).toBe(f.cellB);
    expect(await testDb()('readings').whereNotNull('cell_id').count<{ count: string }[]>('* as count').first()).toEqual({ count: '3' });
    expect(await auditOf('mast', f.mast)).toBeUndefined();
  });

  it('lets the mast be decommissioned instead, keeping its cells and plans', async () => {
    await testDb()('plans').insert({ customer_id: f.customer, cell_id: f.cellA, state: 'verified' });
    const res = await call(patchMast, { method: 'PATCH', user: reviewer, params: { id: f.mast }, json: { status: 'decommissioned', row_version: 1 } });
    expect(res.status).toBe(200);
    expect(res.body.status).toBe('decommissioned');
    expect(await testDb()('plans').whereNotNull('cell_id').count<{ count: string }[]>('* as count').first()).toEqual({ count: '1' });
  });

  it('deletes an unused mast and audits every cell and every reading it unlinked', async () => {
    const res = await call(deleteMast, { method: 'DELETE', user: reviewer, params: { id: f.mast } });
    expect(res.status).toBe(204);
    const audit = await auditOf('mast', f.mast);
    expect(audit.before.name).toBe('Test Hill');
    expect(audit.before.cells_deleted.map((c: { id: string }) => c.id).sort()).toEqual([f.cellA, f.cellB].sort());
    expect(audit.before.cells_deleted[0]).toHaveProperty('channel');
    expect(audit.before.readings_unlinked).toEqual({ [f.cellA]: f.readingIds.slice(0, 2), [f.cellB]: [f.readingIds[2]] });
    // The readings stay (survey history), unmatched.
    const readings = await testDb()('readings').whereIn('id', f.readingIds).select('cell_id');
    expect(readings.map((r) => r.cell_id)).toEqual([null, null, null]);
  });

  it('refuses to delete a cell a plan has chosen (409), and audits the readings of one it deletes', async () => {
    const [plan] = await testDb()('plans').insert({ customer_id: f.customer, cell_id: f.cellA, state: 'scheduled' }).returning('id');
    const refused = await call(deleteCell, { method: 'DELETE', user: reviewer, params: { id: f.cellA } });
    expect(refused.status).toBe(409);
    expect(refused.body.error.message).toContain(`#${plan.id} (scheduled)`);
    expect(await testDb()('cells').where({ id: f.cellA }).first()).toBeDefined();

    expect((await call(deleteCell, { method: 'DELETE', user: reviewer, params: { id: f.cellB } })).status).toBe(204);
    const audit = await auditOf('cell', f.cellB);
    expect(audit.before.readings_unlinked).toEqual([f.readingIds[2]]);
    expect(audit.before.pci).toBe(7);
  });

  it('has the database refuse too, should any code path skip the check', async () => {
    await testDb()('plans').insert({ customer_id: f.customer, cell_id: f.cellA });
    await expect(testDb()('cells').where({ id: f.cellA }).delete()).rejects.toThrow(/foreign key/);
  });
});

describe('deleting catalogue kit', () => {
  beforeEach(truncateAll);

  it('refuses to delete the antenna customers use today (409), leaving it on their record', async () => {
    const admin = asSessionUser(await makeUser('admin'));
    const db = testDb();
    const [antenna] = await db('antennas')
      .insert({ name: 'Router stub', kind: 'stub', ports: 2, horizontal_beamwidth_deg: 360, gain_table: JSON.stringify([{ freq_mhz: 800, gain_dbi: 2 }]) })
      .returning('id');
    const [customer] = await db('customers')
      .insert({
        name: 'Test customer',
        address_label: 'Test farm',
        current_antenna_id: antenna.id,
        geom: db.raw('ST_SetSRID(ST_MakePoint(-128.5, -47.2), 4326)'),
      })
      .returning('id');
    const res = await call(deleteAntenna, { method: 'DELETE', user: admin, params: { id: String(antenna.id) } });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toContain('current antenna of 1 customer');
    expect((await db('customers').where({ id: customer.id }).first()).current_antenna_id).toBe(String(antenna.id));
    await expect(db('antennas').where({ id: antenna.id }).delete()).rejects.toThrow(/foreign key/);
  });
});
