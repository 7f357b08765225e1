// Runs last: records that this database now holds the demo scenario and nothing else, so that
// `npm run seed` and `npm run db:reset` may wipe it again without --force.
import type { Knex } from 'knex';

export async function seed(knex: Knex): Promise<void> {
  await knex('demo_scenario').delete();
  await knex('demo_scenario').insert({ id: 1, loaded_at: knex.fn.now() });
}
