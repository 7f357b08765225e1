// What changed in PostgreSQL, pushed to this process: one connection LISTENs on the channel the
// triggers notify (data versions raised by writes to masts, cells, the basemap, elevation…; sessions
// or users changed). While it is connected the data versions are known in memory and the session
// cache may be trusted; when it drops, both go back to asking the database until it is back.
import pg from 'pg';

export const CHANGE_CHANNEL = 'bearline_changes';
const RETRY_MS = 2_000;

type SessionsListener = () => void;

export class ChangeFeed {
  private client: pg.Client | null = null;
  private live = false;
  private stopped = false;
  private versions = new Map<string, bigint>();
  private sessionsListeners = new Set<SessionsListener>();
  /** Raised whenever sessions may have changed unseen (a notification, or the connection dropping). */
  sessionsGeneration = 0;

  constructor(private readonly url: string) {}

  /** True while notifications are arriving: in-memory copies may be used. */
  get isLive(): boolean {
    return this.live;
  }

  /** The last version seen of `kind` (null when unknown or the feed is not live). */
  version(kind: string): string | null {
    if (!this.live) return null;
    const v = this.versions.get(kind);
    return v === undefined ? null : String(v);
  }

  /** Records a version read from the database; versions only grow, so the larger one wins. */
  observe(kind: string, version: string): void {
    const v = BigInt(version);
    const old = this.versions.get(kind);
    if (old === undefined || v > old) this.versions.set(kind, v);
  }

  onSessionsChanged(listener: SessionsListener): void {
    this.sessionsListeners.add(listener);
  }

  start(): void {
    if (this.client || this.stopped) return;
    const client = new pg.Client({ connectionString: this.url, keepAlive: true });
    this.client = client;
    client.on('notification', (msg) => this.receive(msg.payload ?? ''));
    client.on('error', (err) => this.lost(client, err));
    client.on('end', () => this.lost(client, null));
    (async () => {
      await client.connect();
      await client.query(`LISTEN ${CHANGE_CHANNEL}`);
      // Listening first, then reading: nothing written in between is missed.
      const { rows } = await client.query<{ name: string; version: string }>('SELECT name, version::text AS version FROM data_versions');
      for (const r of rows) this.observe(r.name, r.version);
      if (this.client === client) this.live = true;
    })().catch((err) => this.lost(client, err));
  }

  async stop(): Promise<void> {
    this.stopped = true;
    const client = this.client;
    this.dropLive();
    this.client = null;
    await client?.end().catch(() => undefined);
  }

  private receive(payload: string): void {
    if (payload === 'sessions') {
      this.sessionsChanged();
      return;
    }
    const [kind, version] = payload.split(' ');
    if (kind && version && /^\d+$/.test(version)) this.observe(kind, version);
  }

  private sessionsChanged(): void {
    this.sessionsGeneration += 1;
    for (const l of this.sessionsListeners) l();
  }

  private dropLive(): void {
    this.live = false;
    this.versions.clear();
    this.sessionsChanged();
  }

  private lost(client: pg.Client, err: unknown): void {
    if (this.client !== client) return;
    if (err) console.error('[bearline] change notifications lost; reading from the database until they are back:', err instanceof Error ? err.message : err);
    this.dropLive();
    this.client = null;
    client.end().catch(() => undefined);
    if (!this.stopped) setTimeout(() => this.start(), RETRY_MS).unref();
  }
}

let shared: ChangeFeed | null = null;

/** This process's feed, if started (see startChangeFeed). */
export function getChangeFeed(): ChangeFeed | null {
  return shared;
}

/** Starts listening once per process (the app server's middleware calls it). */
export function startChangeFeed(url: string | undefined): void {
  if (shared || !url) return;
  shared = new ChangeFeed(url);
  shared.start();
}
