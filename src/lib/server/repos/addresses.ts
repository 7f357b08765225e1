// The gazetteer: addresses with a position, imported from CSV and searched by the geocoder.
import type { Tx } from '../db';
import { ADDRESS, type Address, type AddressRow } from '../../schemas/addresses';
import { recordAudit } from './audit';
import { ValidationError } from '../errors';
import { escapeLike } from './masts';
import { recordColumns } from './record-sql';

export type { Address };

export interface GazetteerHit {
  label: string;
  postcode: string | null;
  lat: number;
  lon: number;
  score: number;
}

/** Above this many rows the unfiltered list reports the planner's estimate instead of counting. */
const EXACT_COUNT_BELOW = 10_000;

function encodeCursor(label: string, id: string): string {
  return Buffer.from(JSON.stringify([label, id])).toString('base64url');
}

function decodeCursor(cursor: string): [string, string] {
  try {
    const v: unknown = JSON.parse(Buffer.from(cursor, 'base64url').toString('utf8'));
    if (Array.isArray(v) && v.length === 2 && typeof v[0] === 'string' && /^\d+$/.test(String(v[1]))) return [v[0], String(v[1])];
  } catch {
    // falls through to the error below
  }
  throw new ValidationError('Not a page cursor', { after: ['Not a page cursor: use the next value of the previous page'] });
}

/**
 * A page of the gazetteer in (label, id) order, read along the (label, id) index: by offset, or by
 * keyset after a cursor (`next`, present while more rows follow), which costs the same on the last
 * page as on the first. `total` is exact for searches (counted up to 10,000 and flagged beyond) and
 * for small tables; the whole of a large gazetteer is the planner's estimate (`total_exact` false).
 */
export async function listAddresses(
  db: Tx,
  query: { q?: string; limit: number; offset: number; after?: string },
): Promise<{ items: Address[]; total: number; totalExact: boolean; next: string | null }> {
  const base = db('addresses');
  if (query.q) base.whereRaw('search_text ILIKE ?', [`%${escapeLike(query.q)}%`]);
  const page = base.clone().select(recordColumns(db, ADDRESS, 'addresses'));
  if (query.after) page.whereRaw('(label, id) > (?, ?)', decodeCursor(query.after));
  else page.offset(query.offset);
  const rows = await page.orderBy([{ column: 'label' }, { column: 'id' }]).limit(query.limit + 1);
  let total: number;
  let totalExact = true;
  const estimate = query.q ? -1 : Number((await db.raw("SELECT reltuples::bigint AS n FROM pg_class WHERE oid = 'addresses'::regclass")).rows[0]?.n ?? -1);
  if (estimate >= EXACT_COUNT_BELOW) {
    total = estimate;
    totalExact = false;
  } else {
    const { rows: counted } = await db.raw('SELECT count(*) AS n FROM (?) c', [
      base
        .clone()
        .select(db.raw('1'))
        .limit(EXACT_COUNT_BELOW + 1),
    ]);
    total = Number(counted[0].n);
    totalExact = total <= EXACT_COUNT_BELOW;
  }
  const items = rows.slice(0, query.limit).map((r: Record<string, unknown>) => ADDRESS.fromRow(r));
  const last = items[items.length - 1];
  return { items, total, totalExact, next: rows.length > query.limit && last ? encodeCursor(last.label, last.id) : null };
}

export interface ImportSummary {
  rows: number;
  inserted: number;
  updated: number;
  /** Known addresses the file repeats exactly: left as they were. */
  unchanged: number;
}

const BATCH = 1000;

/**
 * Adds the rows, or moves an address already known by the same label and postcode (one the file
 * repeats exactly is left alone and counted as unchanged). The
 * caller opens the transaction, so a failed import leaves the gazetteer as it was.
 */
export async function importAddresses(
  db: Tx,
  rows: readonly AddressRow[],
  meta: { fileName: string | null; sha256: string; bytes: number; source?: string },
  actorId: string | null,
): Promise<ImportSummary> {
  let inserted = 0;
  let written = 0;
  for (let i = 0; i < rows.length; i += BATCH) {
    const batch = rows.slice(i, i + BATCH);
    const { rows: result } = await db.raw<{ rows: { inserted: boolean }[] }>(
      `INSERT INTO addresses (label, postcode, geom, source)
       SELECT l, p, ST_SetSRID(ST_MakePoint(x, y), 4326), ?
         FROM unnest(?::text[], ?::text[], ?::float8[], ?::float8[]) AS t(l, p, x, y)
       ON CONFLICT (match_key) DO UPDATE
         SET label = EXCLUDED.label, postcode = EXCLUDED.postcode, geom = EXCLUDED.geom,
             source = EXCLUDED.source, updated_at = now()
         WHERE addresses.label IS DISTINCT FROM EXCLUDED.label
            OR addresses.postcode IS DISTINCT FROM EXCLUDED.postcode
            OR NOT ST_Equals(addresses.geom, EXCLUDED.geom)
       RETURNING (xmax = 0) AS inserted`,
      [
        meta.source ?? 'import',
        batch.map((r) => r.label),
        // node-postgres sends JS arrays as PostgreSQL arrays; nulls stay nulls.
        batch.map((r) => r.postcode) as string[],
        batch.map((r) => r.lon),
        batch.map((r) => r.lat),
      ],
    );
    inserted += result.filter((r) => r.inserted).length;
    written += result.length;
  }
  const summary = { rows: rows.length, inserted, updated: written - inserted, unchanged: rows.length - written };
  await recordAudit(db, {
    userId: actorId,
    action: 'import',
    entity: 'addresses',
    entityId: null,
    after: { file: meta.fileName, sha256: meta.sha256, bytes: meta.bytes, ...summary },
  });
  return summary;
}

export async function countAddresses(db: Tx): Promise<number> {
  const row = await db('addresses').count<{ count: string }[]>('* as count').first();
  return Number(row?.count ?? 0);
}

// Two steps, cheapest first. Words: every word typed must start a word of the label or postcode
// (the tsvector index; the last word may be unfinished, "mill fa" finds "Mill Farm"), or the
// postcode typed in full (spaces and dashes aside; its expression index). Only when that finds
// fewer than the limit, and no postcode typed in full, does trigram word similarity look for near
// misses ("Crake Lnae"): it reads far more of the index. Either way the score is the same: a
// postcode typed in full wins outright; otherwise word similarity finds the query inside a longer
// label ("mill farm" in "Mill Farm, Crake Lane, Kelvarrow KV3 2PL"), 0.45 letting one typo through
// in a short word while keeping unrelated streets out, and whole similarity breaks ties towards the
// shorter, closer label.
const WORD_SIMILARITY_THRESHOLD = 0.45;
/** Word matches ranked per query: a street found in every town ranks its first few hundred. */
const WORD_MATCH_CAP = 300;

const SCORE_SQL = `LEAST(1, CASE WHEN regexp_replace(upper(coalesce(postcode, '')), '[^A-Z0-9]', '', 'g') = regexp_replace(upper(:q), '[^A-Z0-9]', '', 'g') THEN 1
                        ELSE 0.8 * word_similarity(:q, search_text) + 0.2 * similarity(:q, search_text) END)`;
const POSTCODE_KEY_SQL = "regexp_replace(upper(coalesce(postcode, '')), '[^A-Z0-9]', '', 'g')";

type ScoredRow = GazetteerHit & { id: string; score: string | number };

/** The words of a query as a tsquery ('simple' words, the last one as a prefix), or null. */
export function wordQuery(q: string): string | null {
  const words = q.toLowerCase().match(/[\p{L}\p{N}]+/gu);
  if (!words?.length) return null;
  return words.map((w, i) => (i === words.length - 1 ? `${w}:*` : w)).join(' & ');
}

async function wordMatches(db: Tx, q: string, limit: number): Promise<ScoredRow[]> {
  const tsq = wordQuery(q);
  const postcodeKey = q.toUpperCase().replace(/[^A-Z0-9]/g, '');
  if (!tsq && !postcodeKey) return [];
  const { rows } = await db.raw<{ rows: ScoredRow[] }>(
    `WITH found AS (
       (SELECT id FROM addresses WHERE ${tsq ? "search_tsv @@ to_tsquery('simple', :tsq)" : 'false'} LIMIT :cap)
       UNION
       (SELECT id FROM addresses WHERE ${POSTCODE_KEY_SQL} = :postcodeKey LIMIT :cap))
     SELECT a.id, a.label, a.postcode, ST_Y(a.geom) AS lat, ST_X(a.geom) AS lon, ${SCORE_SQL.replace(/postcode|search_text/g, 'a.$&')} AS score
       FROM found f JOIN addresses a ON a.id = f.id
      ORDER BY score DESC, a.label, a.id
      LIMIT :limit`,
    { q, tsq: tsq ?? '', postcodeKey: postcodeKey || '-', cap: WORD_MATCH_CAP, limit },
  );
  return rows;
}

async function similarMatches(db: Tx, q: string, limit: number): Promise<ScoredRow[]> {
  const run = async (trx: Tx) => {
    await trx.raw("SELECT set_config('pg_trgm.word_similarity_threshold', ?, true)", [String(WORD_SIMILARITY_THRESHOLD)]);
    const { rows } = await trx.raw<{ rows: ScoredRow[] }>(
      `SELECT id, label, postcode, ST_Y(geom) AS lat, ST_X(geom) AS lon, ${SCORE_SQL} AS score
         FROM addresses
        WHERE :q <% search_text
           OR ${POSTCODE_KEY_SQL} = regexp_replace(upper(:q), '[^A-Z0-9]', '', 'g')
        ORDER BY score DESC, label, id
        LIMIT :limit`,
      { q, limit },
    );
    return rows;
  };
  // set_config(…, true) lasts for the transaction only, so never leaks to pooled connections.
  return 'isTransaction' in db && db.isTransaction ? run(db) : (db as import('knex').Knex).transaction(run);
}

export async function searchGazetteer(db: Tx, q: string, limit: number): Promise<GazetteerHit[]> {
  let rows = await wordMatches(db, q, limit);
  // A postcode typed in full (or a label typed exactly) scores 1: that is the answer, and near
  // misses would cost a trigram search over the whole gazetteer (seconds at a million addresses).
  const exact = rows.some((r) => Number(r.score) >= 1);
  if (rows.length < limit && !exact) {
    const seen = new Set(rows.map((r) => String(r.id)));
    const more = (await similarMatches(db, q, limit)).filter((r) => !seen.has(String(r.id)));
    rows = [...rows, ...more]
      .sort((a, b) => Number(b.score) - Number(a.score) || (a.label < b.label ? -1 : a.label > b.label ? 1 : 0) || Number(a.id) - Number(b.id))
      .slice(0, limit);
  }
  return rows.map(({ id: _id, ...r }) => ({ ...r, score: Math.round(Number(r.score) * 1000) / 1000 }));
}

/** Addresses nearest a point, closest first (KNN on the geometry index). */
export async function findNearbyAddresses(
  db: Tx,
  lat: number,
  lon: number,
  limit: number,
  radiusM: number,
): Promise<Array<GazetteerHit & { distanceM: number }>> {
  const { rows } = await db.raw<{ rows: Array<Omit<GazetteerHit, 'score'> & { distance_m: number }> }>(
    `SELECT label, postcode, lat, lon, distance_m FROM (
       SELECT label, postcode, ST_Y(geom) AS lat, ST_X(geom) AS lon,
              ST_Distance(geom::geography, ST_SetSRID(ST_MakePoint(:lon, :lat), 4326)::geography) AS distance_m
         FROM addresses
        ORDER BY geom <-> ST_SetSRID(ST_MakePoint(:lon, :lat), 4326)
        LIMIT :limit) near
      WHERE distance_m <= :radius
      ORDER BY distance_m`,
    { lat, lon, limit, radius: radiusM },
  );
  return rows.map((r) => ({ label: r.label, postcode: r.postcode, lat: r.lat, lon: r.lon, distanceM: r.distance_m, score: 0 }));
}
