// Finished tiles kept in memory, gzipped, up to a byte budget (least recently used go first).
// Keys carry the data version, so a write makes every older entry unreachable; those age out.
import { createHash } from 'node:crypto';
import { promisify } from 'node:util';
import { gzip } from 'node:zlib';
import type { Tx } from './db';
import { getDataVersion, type DataKind } from './data-version';
import type { TileQuery } from './repos/tiles';

const gzipAsync = promisify(gzip);

export interface CachedTile {
  /** The tile as PostGIS made it (empty when nothing is in the tile). */
  raw: Buffer;
  /** The same, gzipped (empty when `raw` is). */
  gzipped: Buffer;
  etag: string;
}

/** Default budget per app process; TILE_CACHE_MB overrides it (0 turns the cache off). */
const DEFAULT_BUDGET_MB = 64;

export class TileCache {
  private entries = new Map<string, CachedTile>();
  private bytes = 0;

  constructor(private readonly budgetBytes: number) {}

  get(key: string): CachedTile | undefined {
    const hit = this.entries.get(key);
    if (hit) {
      this.entries.delete(key);
      this.entries.set(key, hit);
    }
    return hit;
  }

  set(key: string, tile: CachedTile): void {
    const size = tile.raw.length + tile.gzipped.length + key.length;
    if (size > this.budgetBytes) return;
    const old = this.entries.get(key);
    if (old) this.remove(key, old);
    this.entries.set(key, tile);
    this.bytes += size;
    for (const [k, v] of this.entries) {
      if (this.bytes <= this.budgetBytes) break;
      this.remove(k, v);
    }
  }

  get size(): number {
    return this.entries.size;
  }

  private remove(key: string, tile: CachedTile): void {
    this.entries.delete(key);
    this.bytes -= tile.raw.length + tile.gzipped.length + key.length;
  }
}

/** A tile ready to send: gzipped once, with an ETag from its bytes. */
export async function prepareTile(raw: Buffer): Promise<CachedTile> {
  if (raw.length === 0) return { raw, gzipped: raw, etag: '' };
  return { raw, gzipped: await gzipAsync(raw), etag: `"${createHash('sha1').update(raw).digest('base64url')}"` };
}

let shared: TileCache | null = null;

export function getTileCache(): TileCache {
  if (!shared) {
    const mb = Number(process.env.TILE_CACHE_MB ?? DEFAULT_BUDGET_MB);
    shared = new TileCache(Number.isFinite(mb) && mb >= 0 ? mb * 1024 * 1024 : DEFAULT_BUDGET_MB * 1024 * 1024);
  }
  return shared;
}

/** One layer's tile to serve from the cache or cut afresh. */
export interface TileSpec {
  /** The URL layer name (part of the cache key). */
  layer: string;
  /** The data version that a write to this layer's data raises (data_versions.name). */
  kind: DataKind;
  z: number;
  x: number;
  y: number;
  /** Anything else that changes the tile (filters, options), as a stable string; '' for none. */
  variant: string;
  /** The query that cuts the tile (see repos/tiles.ts). */
  query: (db: Tx) => TileQuery;
}

const tileKey = (spec: TileSpec, version: string) => `${spec.layer}/${version}/${spec.z}/${spec.x}/${spec.y}${spec.variant ? `?${spec.variant}` : ''}`;

/**
 * The tile from this process's cache under the current data version, or cut and cached. A hit needs
 * no database round trip while the change feed is live (data-version.ts). A cut reads the version in
 * the same statement as the tile, so the tile is filed under the version it was cut from even if a
 * write (or a lagging standby) moved the version meanwhile.
 */
export async function getCachedTile(db: Tx, spec: TileSpec): Promise<{ tile: CachedTile; hit: boolean }> {
  const cache = getTileCache();
  const version = await getDataVersion(db, spec.kind);
  const hit = cache.get(tileKey(spec, version));
  if (hit) return { tile: hit, hit: true };
  const { rows } = await db.raw<{ rows: Array<{ version: string | null; tile: Buffer | null }> }>(
    'SELECT (SELECT version::text FROM data_versions WHERE name = ?) AS version, q.tile FROM (?) q',
    [spec.kind, spec.query(db)],
  );
  const tile = await prepareTile(rows[0]?.tile ?? Buffer.alloc(0));
  cache.set(tileKey(spec, rows[0]?.version ?? '0'), tile);
  return { tile, hit: false };
}
