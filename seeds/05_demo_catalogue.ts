// Demo catalogue: customer antennas and feeder cables with generic names of our own.
// Values are common practice, not any maker's datasheet:
// - customer directional antennas (panel / log-periodic) 7–9 dBi over 700–2700 MHz with a ~40°
//   horizontal beam; a small stub or whip ~2 dBi;
// - cable attenuation per metre from REFERENCE_CABLE_LOSS in link-budget.ts (±20 %), connector
//   loss 0.1–0.2 dB per mated pair below 3 GHz (common practice).
import type { Knex } from 'knex';
import { DEFAULT_CONNECTOR_LOSS_DB, REFERENCE_CABLE_LOSS, type GainPoint } from '../src/lib/domain/link-budget';
import { ANTENNA, CABLE, type AntennaInput, type CableInput } from '../src/lib/schemas/catalogue';

/** A gain table written as [MHz, dBi] pairs. */
const gain = (rows: Array<[freqMhz: number, gainDbi: number]>): GainPoint[] => rows.map(([freqMhz, gainDbi]) => ({ freqMhz, gainDbi }));

export const DEMO_ANTENNAS: AntennaInput[] = [
  {
    name: 'Panel 2×2 8 dBi',
    kind: 'directional',
    ports: 2,
    horizontalBeamwidthDeg: 40,
    gainTable: gain([
      [700, 7],
      [800, 7.4],
      [900, 7.7],
      [1800, 8.4],
      [2100, 8.6],
      [2600, 8.9],
      [2700, 8.8],
    ]),
    notes: 'Cross-polarised 2-port panel for 4G MIMO. Wall or pole bracket; two feeders to the router.',
  },
  {
    // Log-periodic antennas keep their gain over a wider band; their beam is usually a little
    // wider than a panel's (our assumption, within the common-practice range above).
    name: 'Log-periodic wide-band 9 dBi',
    kind: 'directional',
    ports: 1,
    horizontalBeamwidthDeg: 55,
    gainTable: gain([
      [700, 7],
      [900, 7.8],
      [1800, 8.6],
      [2100, 8.8],
      [2600, 9],
      [3500, 8.8],
      [3800, 8.5],
    ]),
    notes: 'Single-port, 700–3800 MHz. Pair two at ±45° for MIMO.',
  },
  {
    name: 'Omni mast 4 dBi',
    kind: 'omni',
    ports: 2,
    horizontalBeamwidthDeg: 360,
    gainTable: gain([
      [700, 3.5],
      [900, 4],
      [1800, 4],
      [2600, 4.2],
      [3500, 4],
    ]),
    notes: 'For customers between two masts or where the best cell changes; no aiming.',
  },
  {
    name: 'Router stub 2 dBi',
    kind: 'stub',
    ports: 2,
    horizontalBeamwidthDeg: 360,
    gainTable: gain([
      [700, 2],
      [2700, 2],
      [3800, 2],
    ]),
    notes: "The router's own antennas, used indoors: the 'before' kit for most customers.",
  },
];

/** A feeder cable with a connector at the antenna and at the router end. */
const feeder = (name: string, lossTable: CableInput['lossTable'], notes: string): CableInput => ({
  name,
  lossTable,
  connectorLossDb: DEFAULT_CONNECTOR_LOSS_DB,
  connectors: 2,
  notes: `${notes} Two connectors (antenna and router end) assumed.`,
});

export const DEMO_CABLES: CableInput[] = [
  feeder('Feeder 5 mm standard', REFERENCE_CABLE_LOSS['RG-58'], 'Thin solid-dielectric coax: short runs only.'),
  feeder('Feeder 6 mm low-loss', REFERENCE_CABLE_LOSS['LL-6'], 'Foam dielectric, foil and braid. Runs up to about 10 m.'),
  feeder('Feeder 10 mm low-loss', REFERENCE_CABLE_LOSS['LL-10'], 'Foam dielectric, foil and braid; stiff, mind the bend radius. Long runs.'),
];

export async function seed(knex: Knex): Promise<void> {
  // Customers and plans refer to the catalogue; seed 07 loads them again.
  await knex.raw('TRUNCATE antennas, cables RESTART IDENTITY CASCADE');
  await knex('antennas').insert(DEMO_ANTENNAS.map((a) => ANTENNA.insertRow(a)));
  await knex('cables').insert(DEMO_CABLES.map((c) => CABLE.insertRow(c)));
}
