// Whether a database holds anything but the demo scenario. Seeding and resetting wipe every table,
// so they refuse (unless --force) when this finds real data: accounts that are not demo accounts,
// data not loaded by the demo seeds, or any change recorded after the demo was loaded.
import { withKnex } from './migrate-runner';

export const DEMO_EMAIL_DOMAIN = '@demo.bearline.test';

async function hasTable(knex: import('knex').Knex, name: string): Promise<boolean> {
  return knex.schema.hasTable(name);
}

/** Reasons the database holds more than the demo scenario; empty when it may be wiped. */
export async function findNonDemoData(url: string): Promise<string[]> {
  return withKnex(url, async (knex) => {
    if (!(await hasTable(knex, 'users'))) return [];
    const reasons: string[] = [];
    const count = async (table: string) =>
      (await hasTable(knex, table)) ? Number((await knex(table).count<{ count: string }[]>('* as count').first())?.count ?? 0) : 0;

    const others = await knex('users')
      .whereRaw('lower(email) NOT LIKE ?', [`%${DEMO_EMAIL_DOMAIN}`])
      .orderBy('id')
      .select('email');
    if (others.length)
      reasons.push(
        `${others.length} account(s) that are not demo accounts (${others
          .slice(0, 3)
          .map((u) => u.email)
          .join(', ')}${others.length > 3 ? ', …' : ''})`,
      );

    const marker = (await hasTable(knex, 'demo_scenario')) ? await knex('demo_scenario').first('loaded_at') : undefined;
    const rows = (await count('users')) + (await count('customers')) + (await count('masts'));
    if (!marker) {
      if (rows > 0) reasons.push('data that was not loaded by the demo seeds (no demo scenario marker)');
      return reasons;
    }
    const changed = await knex('audit_log').where('at', '>', marker.loaded_at).count<{ count: string }[]>('* as count').first();
    const changes = Number(changed?.count ?? 0);
    if (changes > 0) reasons.push(`${changes} change(s) recorded since the demo scenario was loaded on ${(marker.loaded_at as Date).toISOString()}`);
    return reasons;
  });
}

/** Throws, listing what would be lost, unless the database holds only the demo scenario or `force`. */
export async function assertOnlyDemoData(url: string, what: string, force: boolean): Promise<void> {
  if (force) return;
  const reasons = await findNonDemoData(url);
  if (reasons.length === 0) return;
  throw new Error(
    `${what} would wipe a database that holds ${reasons.join('; ')}.\n` +
      'Nothing was changed. Take a backup first (npm run backup), then run it again with --force if you really mean it.',
  );
}
