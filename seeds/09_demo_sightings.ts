// Demo sightings: three pending field reports (one close to an existing mast, a likely duplicate;
// two where the map has none) and one merged into a mast, each with photos drawn here and stored
// through the same photo pipeline and storage as an upload. Fixed UUIDs and dates: deterministic.
import type { Knex } from 'knex';
import { resolve } from 'node:path';
import sharp from 'sharp';
import { getDestination } from '../src/lib/domain/geodesy';
import { SightingInputSchema, type SightingStructureType } from '../src/lib/schemas/sightings';
import { processPhoto, storePhoto } from '../src/lib/server/photos';
import { createSighting, type NewSightingPhoto } from '../src/lib/server/repos/sightings';
import { createStorage } from '../src/lib/server/storage';
import { ROOT } from '../scripts/lib/project';

/** A tower against the sky, drawn as SVG and rendered to JPEG; `seed` varies the sky and the tower. */
async function drawMastPhoto(seed: number, kind: SightingStructureType): Promise<Uint8Array> {
  const sky = ['#9cc3e4', '#b9cfe0', '#d6dde4', '#f0c9a0'][seed % 4];
  const ground = ['#6b8f5a', '#7d8f60', '#5f7a4f'][seed % 3];
  const x = 300 + (seed % 5) * 40;
  const body =
    kind === 'monopole'
      ? `<rect x="${x - 8}" y="90" width="16" height="330" fill="#4a5560"/><rect x="${x - 30}" y="100" width="60" height="14" fill="#38424c"/>`
      : kind === 'water_tower'
        ? `<rect x="${x - 70}" y="120" width="140" height="80" rx="10" fill="#8a949c"/><rect x="${x - 50}" y="200" width="10" height="220" fill="#4a5560"/><rect x="${x + 40}" y="200" width="10" height="220" fill="#4a5560"/><rect x="${x - 14}" y="96" width="10" height="30" fill="#38424c"/>`
        : `<polygon points="${x},70 ${x - 60},420 ${x + 60},420" fill="none" stroke="#4a5560" stroke-width="7"/>` +
          Array.from({ length: 7 }, (_, i) => {
            const y = 110 + i * 45;
            const half = ((y - 70) / 350) * 60;
            return `<line x1="${x - half}" y1="${y}" x2="${x + half}" y2="${y + 45}" stroke="#4a5560" stroke-width="3"/><line x1="${x + half}" y1="${y}" x2="${x - half}" y2="${y + 45}" stroke="#4a5560" stroke-width="3"/>`;
          }).join('') +
          `<rect x="${x - 34}" y="86" width="14" height="40" fill="#dfe4e8" stroke="#38424c"/><rect x="${x + 20}" y="86" width="14" height="40" fill="#dfe4e8" stroke="#38424c"/>`;
  const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="800" height="600"><rect width="800" height="600" fill="${sky}"/><rect y="420" width="800" height="180" fill="${ground}"/>${body}<text x="20" y="580" font-family="sans-serif" font-size="22" fill="#ffffff">Bearline demo photo ${seed}</text></svg>`;
  return new Uint8Array(await sharp(Buffer.from(svg)).jpeg({ quality: 78 }).toBuffer());
}

interface DemoSighting {
  uuid: string;
  author: string;
  near: number; // index into the masts, by id
  distanceM: number;
  bearingDeg: number;
  structure: SightingStructureType;
  heightM: number;
  observedAt: string;
  notes: string;
  photos: number[];
  cells: Array<{ tech: 'lte' | 'nr'; channel: number; pci: number; rsrp: number; rsrq: number; sinr: number }>;
  merged?: boolean;
}

const SIGHTINGS: DemoSighting[] = [
  {
    uuid: '5e1d7a10-0c2b-4d8e-9f41-2a6b3c4d5e01',
    author: 'surveyor@demo.bearline.test',
    near: 2,
    distanceM: 140,
    bearingDeg: 60,
    structure: 'lattice_tower',
    heightM: 30,
    observedAt: '2026-11-27T09:40:00Z',
    notes: 'Seen from the lay-by on the ridge road; gate locked, compound fenced.',
    photos: [1, 2],
    cells: [{ tech: 'lte', channel: 6300, pci: 217, rsrp: -92, rsrq: -10.5, sinr: 9 }],
  },
  {
    uuid: '5e1d7a10-0c2b-4d8e-9f41-2a6b3c4d5e02',
    author: 'surveyor@demo.bearline.test',
    near: 9,
    distanceM: 2400,
    bearingDeg: 200,
    structure: 'monopole',
    heightM: 18,
    observedAt: '2026-11-28T14:05:00Z',
    notes: 'New pole beside the farm track, not on the map yet.',
    photos: [3],
    cells: [{ tech: 'lte', channel: 1300, pci: 88, rsrp: -101, rsrq: -12, sinr: 4 }],
  },
  {
    uuid: '5e1d7a10-0c2b-4d8e-9f41-2a6b3c4d5e03',
    author: 'contributor@demo.bearline.test',
    near: 19,
    distanceM: 3100,
    bearingDeg: 110,
    structure: 'water_tower',
    heightM: 22,
    observedAt: '2026-11-29T16:30:00Z',
    notes: 'Antennas on the railing of the old water tower.',
    photos: [4],
    cells: [],
  },
  {
    uuid: '5e1d7a10-0c2b-4d8e-9f41-2a6b3c4d5e04',
    author: 'surveyor@demo.bearline.test',
    near: 0,
    distanceM: 25,
    bearingDeg: 0,
    structure: 'lattice_tower',
    heightM: 35,
    observedAt: '2026-11-20T11:00:00Z',
    notes: 'Checked the existing mast: panels as listed.',
    photos: [5, 6],
    cells: [],
    merged: true,
  },
];

function storageFromEnv() {
  const env = process.env;
  return createStorage({
    dataDir: env.DATA_DIR ? resolve(env.DATA_DIR) : resolve(ROOT, '.data'),
    s3Endpoint: env.S3_ENDPOINT,
    s3Bucket: env.S3_BUCKET,
    s3Region: env.S3_REGION,
    s3AccessKeyId: env.S3_ACCESS_KEY_ID,
    s3SecretAccessKey: env.S3_SECRET_ACCESS_KEY,
  });
}

export async function seed(knex: Knex): Promise<void> {
  await knex.raw('TRUNCATE sightings, sighting_operators, sighting_cells, sighting_photos RESTART IDENTITY CASCADE');
  const masts: Array<{ id: string; lat: number; lon: number }> = await knex('masts')
    .orderBy('id')
    .select('id', knex.raw('ST_Y(geom) AS lat'), knex.raw('ST_X(geom) AS lon'));
  const operator: { id: string } | undefined = await knex('operators').orderBy('id').first('id');
  const reviewer: { id: string } | undefined = await knex('users').where({ email: 'reviewer@demo.bearline.test' }).first('id');
  if (masts.length < 20 || !operator || !reviewer) return;
  const storage = storageFromEnv();
  for (const s of SIGHTINGS) {
    const author: { id: string } | undefined = await knex('users').where({ email: s.author }).first('id');
    if (!author) continue;
    const mast = masts[s.near]!;
    const at = getDestination(mast, s.distanceM, s.bearingDeg);
    const input = SightingInputSchema.parse({
      client_uuid: s.uuid,
      lat: Number(at.lat.toFixed(6)),
      lon: Number(at.lon.toFixed(6)),
      position_source: 'map',
      structure_type: s.structure,
      estimated_height_m: s.heightM,
      operator_ids: [operator.id],
      cells: s.cells.map((c) => ({
        operator_id: operator.id,
        tech: c.tech,
        channel: c.channel,
        pci: c.pci,
        rsrp_dbm: c.rsrp,
        rsrq_db: c.rsrq,
        sinr_db: c.sinr,
      })),
      notes: s.notes,
      observed_at: s.observedAt,
    });
    const photos: NewSightingPhoto[] = [];
    for (const n of s.photos) photos.push(await storePhoto(storage, await processPhoto(await drawMastPhoto(n, s.structure)), `demo-${n}.jpg`));
    await knex.transaction(async (trx) => {
      const { sighting } = await createSighting(trx, input, String(author.id), photos);
      if (s.merged) {
        await trx('sightings')
          .where({ id: sighting.id })
          .update({
            status: 'merged',
            mast_id: mast.id,
            decided_by: reviewer.id,
            decided_at: new Date('2026-11-21T09:00:00Z'),
            decision_reason: 'Same mast, photos added',
          });
      }
    });
  }
}
