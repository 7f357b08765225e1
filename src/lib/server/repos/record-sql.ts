// The select list of a declared record (lib/schemas/record.ts): its columns and SQL expressions.
import type { Knex } from 'knex';
import type { Tx } from '../db';
import type { Fields, RecordDeclaration } from '../../schemas/record';

export function recordColumns<F extends Fields>(db: Tx, record: RecordDeclaration<F>, alias: string): Array<string | Knex.Raw> {
  const { plain, sql } = record.columns(alias);
  return [...plain, ...sql.map((s) => db.raw(s))];
}
