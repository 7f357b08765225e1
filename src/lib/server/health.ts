import { getDb } from './db';

export interface Health {
  ok: true;
  db: string;
  postgis: string;
}

export async function checkHealth(): Promise<Health> {
  const db = getDb();
  const { rows } = await db.raw<{ rows: { version: string; postgis: string }[] }>('SELECT version() AS version, postgis_full_version() AS postgis');
  const version = rows[0].version.split(' on ')[0];
  const postgis = /POSTGIS="([^"\s]+)/.exec(rows[0].postgis)?.[1] ?? rows[0].postgis;
  return { ok: true, db: version, postgis };
}
