// Finished tiles kept in memory, gzipped, up to a byte budget (least recently used go first).
// Keys carry the data version, so a write makes every older entry unreachable; those age out.
import { createHash } from 'node:crypto';
import { promisify } from 'node:util';
import { gzip } from 'node:zlib';

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
