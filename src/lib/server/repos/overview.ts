// Counts for the start page.
import type { Tx } from '../db';

export interface Overview {
  mastsByStatus: Record<string, number>;
  cells: number;
  operators: number;
  readings: number;
  plansByState: Record<string, number>;
}

export async function getOverview(db: Tx, withPlans: boolean): Promise<Overview> {
  const [masts, cells, operators, readings, plans] = await Promise.all([
    db('masts').select('status').count<{ status: string; count: string }[]>('* as count').groupBy('status'),
    db('cells').count<{ count: string }[]>('* as count').first(),
    db('operators').count<{ count: string }[]>('* as count').first(),
    db('readings').count<{ count: string }[]>('* as count').first(),
    withPlans ? db('plans').select('state').count<{ state: string; count: string }[]>('* as count').groupBy('state') : Promise.resolve([]),
  ]);
  return {
    mastsByStatus: Object.fromEntries(masts.map((m) => [m.status, Number(m.count)])),
    cells: Number(cells?.count ?? 0),
    operators: Number(operators?.count ?? 0),
    readings: Number(readings?.count ?? 0),
    plansByState: Object.fromEntries((plans as { state: string; count: string }[]).map((p) => [p.state, Number(p.count)])),
  };
}
