// Demo catalogue: customer antennas and feeder cables with generic names of our own.
// Values are common practice, not any maker's datasheet:
// - customer directional antennas (panel / log-periodic) 7–9 dBi over 700–2700 MHz with a ~40°
//   horizontal beam; a small stub or whip ~2 dBi;
// - cable attenuation per metre from REFERENCE_CABLE_LOSS in link-budget.ts (±20 %), connector
//   loss 0.1–0.2 dB per mated pair below 3 GHz (common practice).
import type { Knex } from 'knex';
import { DEFAULT_CONNECTOR_LOSS_DB, REFERENCE_CABLE_LOSS } from '../src/lib/domain/link-budget';

type Row = [freqMhz: number, value: number];

export const DEMO_ANTENNAS = [
  {
    name: 'Panel 2×2 8 dBi',
    kind: 'directional',
    ports: 2,
    horizontal_beamwidth_deg: 40,
    gain: [
      [700, 7],
      [800, 7.4],
      [900, 7.7],
      [1800, 8.4],
      [2100, 8.6],
      [2600, 8.9],
      [2700, 8.8],
    ] as Row[],
    notes: 'Cross-polarised 2-port panel for 4G MIMO. Wall or pole bracket; two feeders to the router.',
  },
  {
    // Log-periodic antennas keep their gain over a wider band; their beam is usually a little
    // wider than a panel's (our assumption, within the common-practice range above).
    name: 'Log-periodic wide-band 9 dBi',
    kind: 'directional',
    ports: 1,
    horizontal_beamwidth_deg: 55,
    gain: [
      [700, 7],
      [900, 7.8],
      [1800, 8.6],
      [2100, 8.8],
      [2600, 9],
      [3500, 8.8],
      [3800, 8.5],
    ] as Row[],
    notes: 'Single-port, 700–3800 MHz. Pair two at ±45° for MIMO.',
  },
  {
    name: 'Omni mast 4 dBi',
    kind: 'omni',
    ports: 2,
    horizontal_beamwidth_deg: 360,
    gain: [
      [700, 3.5],
      [900, 4],
      [1800, 4],
      [2600, 4.2],
      [3500, 4],
    ] as Row[],
    notes: 'For customers between two masts or where the best cell changes; no aiming.',
  },
  {
    name: 'Router stub 2 dBi',
    kind: 'stub',
    ports: 2,
    horizontal_beamwidth_deg: 360,
    gain: [
      [700, 2],
      [2700, 2],
      [3800, 2],
    ] as Row[],
    notes: "The router's own antennas, used indoors: the 'before' kit for most customers.",
  },
] as const;

const CONNECTOR_NOTE = 'Two connectors (antenna and router end) assumed.';

export const DEMO_CABLES = [
  { name: 'Feeder 5 mm standard', table: REFERENCE_CABLE_LOSS['RG-58'], notes: `Thin solid-dielectric coax: short runs only. ${CONNECTOR_NOTE}` },
  { name: 'Feeder 6 mm low-loss', table: REFERENCE_CABLE_LOSS['LL-6'], notes: `Foam dielectric, foil and braid. Runs up to about 10 m. ${CONNECTOR_NOTE}` },
  {
    name: 'Feeder 10 mm low-loss',
    table: REFERENCE_CABLE_LOSS['LL-10'],
    notes: `Foam dielectric, foil and braid; stiff, mind the bend radius. Long runs. ${CONNECTOR_NOTE}`,
  },
];

export async function seed(knex: Knex): Promise<void> {
  // Customers and plans refer to the catalogue; seed 07 loads them again.
  await knex.raw('TRUNCATE antennas, cables RESTART IDENTITY CASCADE');
  await knex('antennas').insert(
    DEMO_ANTENNAS.map((a) => ({
      name: a.name,
      kind: a.kind,
      ports: a.ports,
      horizontal_beamwidth_deg: a.horizontal_beamwidth_deg,
      gain_table: JSON.stringify(a.gain.map(([freq_mhz, gain_dbi]) => ({ freq_mhz, gain_dbi }))),
      notes: a.notes,
    })),
  );
  await knex('cables').insert(
    DEMO_CABLES.map((c) => ({
      name: c.name,
      loss_table: JSON.stringify(c.table.map((p) => ({ freq_mhz: p.freqMhz, loss_db_per_m: p.dbPerM }))),
      connector_loss_db: DEFAULT_CONNECTOR_LOSS_DB,
      connectors: 2,
      notes: c.notes,
    })),
  );
}
