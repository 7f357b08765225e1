// The measured signal map of the demo readings, computed at once so the map shows it on first
// start (the app's signal-hexes job would otherwise do it in the background shortly after).
import type { Knex } from 'knex';
import { refreshReadingHexes } from '../src/lib/server/repos/reading-hexes';

export async function seed(knex: Knex): Promise<void> {
  await refreshReadingHexes(knex);
}
